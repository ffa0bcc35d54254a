/** `npm run stop`: shut down the project's private MariaDB server. */
import { stopMariadb } from "./services/mariadb";

console.log(stopMariadb() ? "[mariadb] stopped" : "[mariadb] was not running");
