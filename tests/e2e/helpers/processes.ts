/**
 * Real Lapbench processes of a test's own, beside the e2e stack: a throwaway MariaDB server (own
 * port and data folder, so killing it touches nobody else), the local upload and mail services,
 * `next start` from the e2e build and ingest workers — each started as `node …` so its PID is the
 * process itself. Plus the SDK upload path and an HTTP sign-in, as a browser would do them.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes, randomUUID } from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { QueryTypes, type Sequelize } from "sequelize";
import { genUploader } from "uploadthing/client";
import { startMariadb, ensureDatabase, dropDatabase, mariadbPaths, pingMariadb, stopMariadb, type MariadbPaths } from "../../../workers/services/mariadb";
import { stackEnv, waitForHttp, waitForPort } from "../../../workers/services/stack";
import { createSequelize } from "../../../models/db";
import { migrateUp } from "../../../models/migrate";
import { createAuth } from "../../../lib/auth/create-auth";
import type { AppLogFileRouter } from "../../../lib/uploads/log-file-router";
import { FetchBackedXhr } from "../../integration/helpers/upload-harness";
import { at } from "../../fixtures/at";

export const ROOT = path.resolve(__dirname, "../../..");
export const PASSWORD = "process-test-password-1";

/** A port nothing listens on right now (the OS picks it). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
  });
}

export async function waitFor(cond: () => Promise<boolean> | boolean, timeoutMs: number, what: string): Promise<void> {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    if (await cond()) return;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
}

export interface OwnMariadb {
  port: number;
  paths: MariadbPaths;
  dataRoot: string;
  /** kill -9 of this server's own PID (read from its pid file). */
  kill9(): Promise<void>;
  restart(): Promise<void>;
  close(): Promise<void>;
}

/** A MariaDB server of the test's own, in `.data/<label>-<pid>/`, on a free port. */
export async function startOwnMariadb(label: string): Promise<OwnMariadb> {
  const port = await freePort();
  const dataRoot = path.join(ROOT, ".data", `${label}-${process.pid}`);
  const paths = mariadbPaths(dataRoot);
  await startMariadb({ port, dataRoot });
  return {
    port,
    paths,
    dataRoot,
    async kill9() {
      const pid = Number(fs.readFileSync(paths.pidFile, "utf8").trim());
      if (!Number.isInteger(pid) || pid <= 1) throw new Error(`no pid in ${paths.pidFile}`);
      process.kill(pid, "SIGKILL");
      await waitFor(() => !isAlive(pid), 10_000, `MariaDB ${pid} to die`);
    },
    async restart() {
      await startMariadb({ port, dataRoot });
    },
    async close() {
      if (pingMariadb(paths)) stopMariadb(paths);
      fs.rmSync(dataRoot, { recursive: true, force: true });
    },
  };
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** Create and migrate a database on a server (the worktree's when `db` is omitted). */
export async function createMigratedDatabase(name: string, db?: OwnMariadb): Promise<Sequelize> {
  const paths = db?.paths ?? mariadbPaths();
  dropDatabase(name, paths);
  ensureDatabase(name, paths);
  const s = createSequelize(name, { pool: 5, port: db?.port });
  await migrateUp(s, { quiet: true });
  return s;
}

export type Proc = ChildProcess & { output: string[]; name: string };

export interface ProcEnvOptions {
  dbName: string;
  dbPort?: number;
  appPort: number;
  uploadPort: number;
  mailPort: number;
  dataDir: string;
  secret: string;
  extra?: Record<string, string>;
}

/** The environment every process of one deployment shares (same database, upload service, secret). */
export function procEnv(o: ProcEnvOptions): NodeJS.ProcessEnv {
  const env = stackEnv({ dbName: o.dbName, appPort: o.appPort, mailPort: o.mailPort, uploadPort: o.uploadPort, dataDir: o.dataDir, build: false, seed: false, worker: false });
  return {
    ...env,
    ...(o.dbPort ? { LAPBENCH_DB_PORT: String(o.dbPort) } : {}),
    BETTER_AUTH_SECRET: o.secret,
    LAPBENCH_SIGNIN_RATE_MAX: "10000",
    LAPBENCH_WORKER_POLL_MS: "100",
    ...o.extra,
  };
}

export const newSecret = () => randomBytes(32).toString("hex");

const nextCli = path.join(ROOT, "node_modules", "next", "dist", "bin", "next");

export function spawnProc(name: string, kind: "web" | "worker" | "upload-fake" | "mail-fake", env: NodeJS.ProcessEnv): Proc {
  const args =
    kind === "web"
      ? [nextCli, "start", "-p", String(env.PORT)]
      : ["--import", "tsx", kind === "worker" ? "workers/ingest-worker.ts" : `workers/services/${kind}.ts`];
  const child = spawn(process.execPath, args, { cwd: ROOT, env: kind === "web" ? { ...env, NODE_ENV: "production" } : env, stdio: ["ignore", "pipe", "pipe"] }) as Proc;
  child.name = name;
  child.output = [];
  const keep = (d: Buffer) => {
    child.output.push(d.toString());
    if (process.env.LAPBENCH_TEST_VERBOSE) process.stdout.write(`[${name}] ${d}`);
  };
  child.stdout!.on("data", keep);
  child.stderr!.on("data", keep);
  return child;
}

export async function startWeb(name: string, env: NodeJS.ProcessEnv): Promise<Proc> {
  const p = spawnProc(name, "web", env);
  await waitForHttp(`http://localhost:${env.PORT}/sign-in`, 90_000, p).catch((e) => {
    throw new Error(`${e instanceof Error ? e.message : e}\n${p.output.join("").slice(-3000)}`);
  });
  return p;
}

export async function startService(kind: "upload-fake" | "mail-fake", env: NodeJS.ProcessEnv): Promise<Proc> {
  const p = spawnProc(kind, kind, env);
  await waitForPort(Number(kind === "upload-fake" ? env.LAPBENCH_UPLOAD_PORT : env.LAPBENCH_SMTP_PORT), 30_000, p);
  return p;
}

export async function stopProc(p: Proc | undefined, signal: NodeJS.Signals = "SIGTERM"): Promise<void> {
  if (!p || p.exitCode !== null || p.signalCode !== null) return;
  const exited = new Promise((r) => p.once("exit", r));
  p.kill(signal);
  const t = setTimeout(() => p.kill("SIGKILL"), 8000);
  await exited;
  clearTimeout(t);
}

export interface Member {
  role: "owner" | "engineer" | "rider" | "viewer";
  email: string;
  userId: string;
}

/** A team with one member per role, made through better-auth on `s`, addresses marked verified. */
export async function createTeam(s: Sequelize, name: string): Promise<{ teamId: string; members: Record<Member["role"], Member> }> {
  const auth = createAuth(s);
  const members = {} as Record<Member["role"], Member>;
  for (const role of ["owner", "engineer", "rider", "viewer"] as const) {
    const email = `${role}-${randomUUID().slice(0, 8)}@example.com`;
    const r = await auth.api.signUpEmail({ body: { email, password: PASSWORD, name: `${role} ${name}` } });
    members[role] = { role, email, userId: r.user.id };
  }
  await s.query("UPDATE `user` SET `emailVerified` = 1", { type: QueryTypes.UPDATE });
  const team = await auth.api.createOrganization({ body: { name, slug: `t-${randomUUID().slice(0, 12)}`, userId: members.owner.userId } });
  if (!team) throw new Error("team not created");
  for (const role of ["engineer", "rider", "viewer"] as const) await auth.api.addMember({ body: { userId: members[role].userId, role, organizationId: team.id } });
  return { teamId: team.id, members };
}

/** Sign in over HTTP as the browser's form does; returns the Cookie header value. */
export async function signInHttp(appUrl: string, email: string, password = PASSWORD): Promise<string> {
  const res = await fetch(`${appUrl}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: appUrl },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in of ${email} at ${appUrl}: ${res.status} ${await res.text()}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
}

/** One file through the uploadthing SDK's client, as the browser sends it, to a running app. */
export async function uploadViaSdk(appUrl: string, cookie: string, file: File): Promise<{ sessionId: number }> {
  (globalThis as Record<string, unknown>).XMLHttpRequest = FetchBackedXhr;
  const client = genUploader<AppLogFileRouter>({ url: `${appUrl}/api/uploadthing`, package: "lapbench-process-test", fetch: (...a) => globalThis.fetch(...a) });
  const res = at(await client.uploadFiles("logFile", { files: [file], headers: { cookie } }), 0);
  return res.serverData as { sessionId: number };
}

/** A small logger export: 100 Hz, speed a known function of time, brake pressure in bar. */
export function exportCsv(rows: number, seed = 0): string {
  const lines = ["# logger: process test", `Time [s],Front wheel speed [km/h],Front brake [bar],Engine speed [rpm]`];
  for (let i = 0; i < rows; i++) {
    const t = i / 100;
    const v = 100 + 50 * Math.sin(t + seed);
    lines.push(`${t.toFixed(2)},${v.toFixed(3)},${(i % 300 < 40 ? 8.5 : 0).toFixed(1)},${Math.round(6000 + 40 * v)}`);
  }
  return lines.join("\n") + "\n";
}
