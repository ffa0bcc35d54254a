/**
 * `npm start`: install what is missing, start MariaDB and the local fakes, migrate, seed the
 * invented demo team, build and serve Lapbench on http://localhost:3000.
 * `npm run dev` does the same with `next dev` and no build.
 * The demo team (sign-ins with a published password) is seeded only with `npm start -- --demo`
 * or into an empty database.
 */
import path from "node:path";
import { config } from "../lib/config";
import { startStack } from "./services/stack";
import { DEMO_PASSWORD, DEMO_USERS } from "./demo-accounts";

async function main() {
  const dev = process.argv.includes("--dev");
  const stack = await startStack({
    dbName: config.db.name,
    appPort: config.appPort,
    mailPort: config.smtp.port,
    uploadPort: config.uploadFake.port,
    dataDir: config.dataDir,
    build: !process.argv.includes("--no-build"),
    dev,
    seed: process.argv.includes("--demo") ? true : "if-empty",
    worker: true,
  });
  const demo = stack.seeded
    ? ["Demo sign-ins (invented team; password for all: " + DEMO_PASSWORD + ")", ...DEMO_USERS.map((u) => `  ${u.role.padEnd(9)} ${u.email.padEnd(34)} ${u.name}`)]
    : ["Demo team not seeded by this start (the database already has accounts); `npm start -- --demo` seeds it."];
  const lines = [
    "",
    `Lapbench is up: ${stack.appUrl}   (listening on ${stack.env.HOST}; set HOST to change)`,
    "",
    ...demo,
    "",
    ...(stack.env.LAPBENCH_MAIL_PAGE === "1" ? [`Captured e-mails (confirmations, invitations, resets; this machine only): ${stack.appUrl}/dev/mail`] : []),
    `Logs: ${path.join(config.dataDir, "logs")}   Stop: Ctrl+C (MariaDB keeps running; 'npm run stop' stops it)`,
    "",
  ];
  console.log(lines.join("\n"));
  const shutdown = async () => {
    await stack.stop();
    process.exit(0);
  };
  process.on("SIGINT", shutdown);
  process.on("SIGTERM", shutdown);
}

main().catch((e) => {
  console.error(`[lapbench] could not start: ${e instanceof Error ? e.message : String(e)}`);
  process.exit(1);
});
