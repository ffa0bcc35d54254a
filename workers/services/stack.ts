/**
 * Brings up everything Lapbench runs on, for `npm start` and for the end-to-end tests:
 * MariaDB (installed and started when missing), migrations, the local upload and mail fakes,
 * the demo seed, the ingest worker and the Next.js server. Each child is killed on stop.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { config } from "../../lib/config";
import { startMariadb, ensureDatabase } from "./mariadb";
import { QueryTypes } from "sequelize";
import { createSequelize } from "../../models/db";
import { migrateUp } from "../../models/migrate";
import { loadOrCreateSecretFile, resolveAuthSecret } from "../../lib/security/auth-secret";

export const FAKE_UPLOAD_APP_ID = "lapbench-local";
/** Where the per-install upload API key is kept (in the git-ignored data folder). */
export const UPLOAD_KEY_FILE = "upload-api-key";
/** Loaded into the web server: believe X-Forwarded-For only from TRUSTED_PROXY (see the file). */
export const PEER_ADDRESS_PRELOAD = path.join(config.root, "workers", "services", "peer-address-preload.mjs");

export interface StackOptions {
  dbName: string;
  appPort: number;
  mailPort: number;
  uploadPort: number;
  dataDir: string;
  build: boolean;
  dev?: boolean;
  /** Seed the invented demo team: always (`--demo`, tests), or only into an empty database. */
  seed: boolean | "if-empty";
  worker: boolean;
  quiet?: boolean;
  /** Added to every child's environment (e.g. test-only settings). */
  extraEnv?: Record<string, string>;
}

export interface RunningStack {
  env: NodeJS.ProcessEnv;
  appUrl: string;
  /** The demo team was seeded by this start. */
  seeded: boolean;
  stop(): Promise<void>;
}

/**
 * UPLOADTHING_TOKEN from the environment when set; otherwise one made from an API key generated
 * on first start and kept in the data folder (a key known from the code would let anyone sign
 * upload callbacks).
 */
export function uploadToken(dataDir: string, env: NodeJS.ProcessEnv = process.env): string {
  if (env.UPLOADTHING_TOKEN) return env.UPLOADTHING_TOKEN;
  const apiKey = loadOrCreateSecretFile(dataDir, UPLOAD_KEY_FILE, () => `sk_${randomBytes(32).toString("hex")}`);
  return Buffer.from(JSON.stringify({ apiKey, appId: FAKE_UPLOAD_APP_ID, regions: ["local"] })).toString("base64");
}

export function stackEnv(o: StackOptions): NodeJS.ProcessEnv {
  const appUrl = `http://localhost:${o.appPort}`;
  return {
    ...process.env,
    NEXT_TELEMETRY_DISABLED: "1",
    LAPBENCH_ROOT: config.root,
    LAPBENCH_DATA_DIR: o.dataDir,
    LAPBENCH_DB_NAME: o.dbName,
    PORT: String(o.appPort),
    BETTER_AUTH_URL: process.env.BETTER_AUTH_URL ?? appUrl,
    // From the environment, or generated once per install and kept in the data folder.
    BETTER_AUTH_SECRET: resolveAuthSecret(process.env, o.dataDir),
    HOST: config.host,
    LAPBENCH_APP_URL: appUrl,
    LAPBENCH_SMTP_PORT: String(o.mailPort),
    LAPBENCH_UPLOAD_PORT: String(o.uploadPort),
    // The captured-mail page: only with the local mail service (and only to this machine).
    LAPBENCH_MAIL_PAGE: config.smtp.host === "127.0.0.1" || config.smtp.host === "localhost" ? "1" : "0",
    UPLOADTHING_TOKEN: uploadToken(o.dataDir),
    UPLOADTHING_INGEST_URL: `http://127.0.0.1:${o.uploadPort}`,
    UPLOADTHING_API_URL: `http://127.0.0.1:${o.uploadPort}`,
    UPLOADTHING_CALLBACK_URL: `${appUrl}/api/uploadthing`,
    UPLOADTHING_IS_DEV: "false",
    ...o.extraEnv,
  };
}

export function waitForPort(port: number, timeoutMs: number, child?: ChildProcess): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  return new Promise((resolve, reject) => {
    const attempt = () => {
      if (child && child.exitCode !== null) return reject(new Error(`process exited (${child.exitCode}) before port ${port} opened`));
      const sock = net.connect({ host: "127.0.0.1", port });
      sock.once("connect", () => {
        sock.destroy();
        resolve();
      });
      sock.once("error", () => {
        sock.destroy();
        if (Date.now() > deadline) reject(new Error(`nothing listens on port ${port} after ${timeoutMs} ms`));
        else setTimeout(attempt, 250);
      });
    };
    attempt();
  });
}

export async function waitForHttp(url: string, timeoutMs: number, child?: ChildProcess): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child && child.exitCode !== null) throw new Error(`server exited (${child.exitCode}) before ${url} answered`);
    try {
      const r = await fetch(url, { redirect: "manual" });
      if (r.status < 500) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`${url} did not answer within ${timeoutMs} ms`);
}

// `node --import tsx script.ts` keeps one process per service (the tsx CLI would add a wrapper
// process), so stopping a service by its PID stops it.
const tsxArgs = (script: string) => ["--import", "tsx", script];
const nextCli = () => path.join(config.root, "node_modules", "next", "dist", "bin", "next");

function spawnLogged(name: string, args: string[], env: NodeJS.ProcessEnv, logDir: string, quiet: boolean): ChildProcess {
  fs.mkdirSync(logDir, { recursive: true });
  const logFile = fs.openSync(path.join(logDir, `${name}.log`), "a");
  const child = spawn(process.execPath, args, {
    cwd: config.root,
    env,
    stdio: ["ignore", quiet ? logFile : "pipe", quiet ? logFile : "pipe"],
  });
  if (!quiet) {
    const prefix = (chunk: Buffer) =>
      chunk
        .toString()
        .split("\n")
        .filter(Boolean)
        .map((l) => `[${name}] ${l}\n`)
        .join("");
    child.stdout?.on("data", (c: Buffer) => {
      process.stdout.write(prefix(c));
      fs.writeSync(logFile, c);
    });
    child.stderr?.on("data", (c: Buffer) => {
      process.stderr.write(prefix(c));
      fs.writeSync(logFile, c);
    });
  }
  return child;
}

export async function startStack(o: StackOptions): Promise<RunningStack> {
  const say = (m: string) => !o.quiet && console.log(`[lapbench] ${m}`);
  const env = stackEnv(o);
  const logDir = path.join(o.dataDir, "logs");
  const children: ChildProcess[] = [];
  const stop = async () => {
    for (const c of children.reverse()) if (c.exitCode === null) c.kill("SIGTERM");
    await Promise.all(
      children.map(
        (c) =>
          new Promise<void>((r) => {
            if (c.exitCode !== null) return r();
            const t = setTimeout(() => {
              c.kill("SIGKILL");
              r();
            }, 5000);
            c.once("exit", () => {
              clearTimeout(t);
              r();
            });
          }),
      ),
    );
  };

  try {
    say("starting MariaDB");
    await startMariadb();
    ensureDatabase(o.dbName);
    const s = createSequelize(o.dbName);
    say("migrating");
    await migrateUp(s, { quiet: true });
    // Demo sign-ins (with a published password) only when asked for, or into a fresh install.
    let seed = o.seed === true;
    if (o.seed === "if-empty") {
      const [row] = await s.query<{ n: number }>("SELECT COUNT(*) AS n FROM user", { type: QueryTypes.SELECT });
      seed = Number(row?.n ?? 0) === 0;
    }
    await s.close();

    say(`starting the mail fake on 127.0.0.1:${o.mailPort} and the upload fake on 127.0.0.1:${o.uploadPort}`);
    const mail = spawnLogged("mail-fake", tsxArgs("workers/services/mail-fake.ts"), env, logDir, !!o.quiet);
    const upload = spawnLogged("upload-fake", tsxArgs("workers/services/upload-fake.ts"), env, logDir, !!o.quiet);
    children.push(mail, upload);
    await Promise.all([waitForPort(o.mailPort, 30_000, mail), waitForPort(o.uploadPort, 30_000, upload)]);

    if (seed) {
      say("seeding the demo team");
      const r = spawnSync(process.execPath, tsxArgs("workers/seed.ts"), { cwd: config.root, env, stdio: o.quiet ? "pipe" : "inherit" });
      if (r.status !== 0) throw new Error(`seeding failed: ${r.stderr?.toString() ?? ""}`);
    }

    if (o.build && !o.dev) {
      say("building the web app (next build)");
      const r = spawnSync(process.execPath, [nextCli(), "build"], { cwd: config.root, env: { ...env, NODE_ENV: "production" }, stdio: o.quiet ? "pipe" : "inherit" });
      if (r.status !== 0) throw new Error(`next build failed:\n${r.stdout?.toString() ?? ""}\n${r.stderr?.toString() ?? ""}`);
    }

    if (o.worker && fs.existsSync(path.join(config.root, "workers", "ingest-worker.ts"))) {
      children.push(spawnLogged("worker", tsxArgs("workers/ingest-worker.ts"), env, logDir, !!o.quiet));
    }

    say(`starting the web app on http://localhost:${o.appPort} (listening on ${env.HOST})`);
    const web = spawnLogged(
      "web",
      o.dev
        ? [nextCli(), "dev", "-p", String(o.appPort), "-H", String(env.HOST)]
        : ["--import", PEER_ADDRESS_PRELOAD, nextCli(), "start", "-p", String(o.appPort), "-H", String(env.HOST)],
      {
        ...env,
        NODE_ENV: o.dev ? "development" : "production",
        // `next dev` serves from a forked child that inherits NODE_OPTIONS, not our argv.
        ...(o.dev ? { NODE_OPTIONS: `${env.NODE_OPTIONS ?? ""} --import ${pathToFileURL(PEER_ADDRESS_PRELOAD).href}`.trim() } : {}),
      },
      logDir,
      !!o.quiet,
    );
    children.push(web);
    await waitForHttp(`http://localhost:${o.appPort}/sign-in`, o.dev ? 180_000 : 60_000, web);
    return { env, appUrl: `http://localhost:${o.appPort}`, seeded: seed, stop };
  } catch (e) {
    await stop();
    throw e;
  }
}
