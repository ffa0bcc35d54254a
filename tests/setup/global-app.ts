/**
 * End-to-end tests: a whole Lapbench of this run's own — MariaDB database, mail and upload fakes
 * on their own ports, the demo seed, a production build served by `next start` — and Debian's
 * Chromium (installed with apt-get when missing). Torn down at the end.
 */
import type { TestProject } from "vitest/node";
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { startStack, type RunningStack } from "../../workers/services/stack";
import { dropDatabase, startMariadb } from "../../workers/services/mariadb";

function ensureChromium(): string {
  const bin = "/usr/bin/chromium";
  if (!fs.existsSync(bin)) {
    console.log("[e2e] installing Debian's chromium with apt-get…");
    const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
    try {
      execFileSync("apt-get", ["install", "-y", "-q", "chromium"], { stdio: "inherit", env });
    } catch {
      execFileSync("apt-get", ["update", "-q"], { stdio: "inherit", env });
      execFileSync("apt-get", ["install", "-y", "-q", "chromium"], { stdio: "inherit", env });
    }
  }
  return bin;
}

let stack: RunningStack | undefined;

export default async function setup(project: TestProject) {
  const chromium = ensureChromium();
  const root = path.resolve(__dirname, "../..");
  const dataDir = path.join(root, ".data", `e2e-${process.pid}`);
  const dbName = `lapbench_e2e_${process.pid}`;
  // A fresh checkout has no server running yet: start it before dropping a leftover database.
  await startMariadb();
  dropDatabase(dbName);
  // The browser tests sign in many times a minute from 127.0.0.1; the limit itself is tested in
  // tests/integration/auth-flow.test.ts.
  stack = await startStack({
    extraEnv: { LAPBENCH_SIGNIN_RATE_MAX: "10000" },
    dbName,
    appPort: Number(process.env.LAPBENCH_E2E_PORT ?? 3210),
    mailPort: Number(process.env.LAPBENCH_E2E_MAIL_PORT ?? 2626),
    uploadPort: Number(process.env.LAPBENCH_E2E_UPLOAD_PORT ?? 4210),
    dataDir,
    build: process.env.LAPBENCH_E2E_SKIP_BUILD !== "1",
    seed: true,
    worker: true,
    quiet: true,
  });
  project.provide("appUrl", stack.appUrl);
  project.provide("chromium", chromium);
  project.provide("e2eDataDir", dataDir);
  project.provide("e2eDbName", dbName);
  return async () => {
    await stack?.stop();
    dropDatabase(dbName);
    fs.rmSync(dataDir, { recursive: true, force: true });
  };
}

declare module "vitest" {
  export interface ProvidedContext {
    appUrl: string;
    chromium: string;
    e2eDataDir: string;
    e2eDbName: string;
  }
}
