// Loaded with `node --import` into the web server process: see peer-address.mjs.
import { install } from "./peer-address.mjs";

install();
