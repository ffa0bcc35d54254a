/**
 * A private MariaDB server for Lapbench: Debian's mariadb-server, installed with apt-get when
 * missing, data folder inside the project (.data/mariadb, git-ignored), listening on 127.0.0.1 on
 * its own port and socket. Idempotent: a running server is reused; stale pid/socket files and a
 * killed server are recovered by a normal start (InnoDB crash recovery).
 */
import { execFileSync, spawn, spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { config } from "../../lib/config";

export interface MariadbPaths {
  dataDir: string;
  runDir: string;
  socket: string;
  pidFile: string;
  logFile: string;
}

export function mariadbPaths(dataRoot = config.dataDir): MariadbPaths {
  const runDir = path.join(dataRoot, "mariadb-run");
  return {
    dataDir: path.join(dataRoot, "mariadb"),
    runDir,
    socket: path.join(runDir, "mysqld.sock"),
    pidFile: path.join(runDir, "mysqld.pid"),
    logFile: path.join(runDir, "mysqld.log"),
  };
}

function which(cmd: string): string | null {
  const r = spawnSync("sh", ["-c", `command -v ${cmd}`], { encoding: "utf8" });
  return r.status === 0 ? r.stdout.trim() : null;
}

function log(msg: string) {
  process.stdout.write(`[mariadb] ${msg}\n`);
}

/** Install Debian's MariaDB when the server binary is missing. */
export function ensureMariadbInstalled(): void {
  if (which("mariadbd") || fs.existsSync("/usr/sbin/mariadbd")) return;
  log("mariadb-server not found: installing Debian's packages with apt-get (needs root)…");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const run = (args: string[]) => execFileSync("apt-get", args, { stdio: "inherit", env });
  try {
    run(["install", "-y", "-q", "mariadb-server", "mariadb-client"]);
  } catch {
    run(["update", "-q"]);
    run(["install", "-y", "-q", "mariadb-server", "mariadb-client"]);
  }
}

/** Path of a MariaDB program (mariadbd, mariadb, mariadb-dump…), found on PATH or in /usr/(s)bin. */
export function bin(name: string): string {
  const found = which(name);
  if (found) return found;
  for (const dir of ["/usr/sbin", "/usr/bin"]) if (fs.existsSync(path.join(dir, name))) return path.join(dir, name);
  throw new Error(`${name} not found after installing mariadb-server`);
}

/** Arguments that connect a MariaDB client program as root over the private socket. */
export function adminArgs(p: MariadbPaths, ...rest: string[]): string[] {
  return ["--no-defaults", `--socket=${p.socket}`, "-uroot", ...rest];
}

export function pingMariadb(p: MariadbPaths = mariadbPaths()): boolean {
  if (!fs.existsSync(p.socket)) return false;
  const r = spawnSync(bin("mariadb-admin"), adminArgs(p, "ping", "--connect-timeout=2"), { encoding: "utf8" });
  return r.status === 0 && /alive/.test(r.stdout);
}

function sleep(ms: number) {
  return new Promise((r) => setTimeout(r, ms));
}

/** Ensure the server is installed, initialised and running; returns when it answers ping. */
export async function startMariadb(opts: { port?: number; dataRoot?: string } = {}): Promise<MariadbPaths> {
  const port = opts.port ?? config.db.port;
  const p = mariadbPaths(opts.dataRoot);
  ensureMariadbInstalled();
  fs.mkdirSync(p.runDir, { recursive: true });
  if (pingMariadb(p)) return p;

  if (!fs.existsSync(path.join(p.dataDir, "mysql"))) {
    log(`initialising a data folder in ${p.dataDir}`);
    fs.rmSync(p.dataDir, { recursive: true, force: true });
    fs.mkdirSync(p.dataDir, { recursive: true });
    execFileSync(
      bin("mariadb-install-db"),
      [
        "--no-defaults",
        "--user=root",
        `--datadir=${p.dataDir}`,
        "--auth-root-authentication-method=normal",
        "--skip-test-db",
        "--skip-name-resolve",
      ],
      { stdio: ["ignore", "ignore", "inherit"] },
    );
  }

  // A pid file left by a killed server is harmless to mariadbd, but a stale socket would make
  // our ping look at a dead file: remove both when nothing answers.
  for (const f of [p.socket, p.pidFile]) fs.rmSync(f, { force: true });

  log(`starting on 127.0.0.1:${port}`);
  const child = spawn(
    bin("mariadbd"),
    [
      "--no-defaults",
      `--datadir=${p.dataDir}`,
      `--socket=${p.socket}`,
      `--pid-file=${p.pidFile}`,
      `--port=${port}`,
      "--bind-address=127.0.0.1",
      "--user=root",
      "--skip-name-resolve",
      `--log-error=${p.logFile}`,
      "--character-set-server=utf8mb4",
      "--collation-server=utf8mb4_unicode_ci",
      "--default-time-zone=+00:00",
      "--max-allowed-packet=64M",
      "--innodb-buffer-pool-size=256M",
      "--max-connections=300",
    ],
    { detached: true, stdio: "ignore" },
  );
  child.unref();

  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (pingMariadb(p)) return p;
    if (child.exitCode !== null) break;
    await sleep(200);
  }
  const tail = fs.existsSync(p.logFile) ? fs.readFileSync(p.logFile, "utf8").split("\n").slice(-20).join("\n") : "";
  throw new Error(`MariaDB did not start (see ${p.logFile}):\n${tail}`);
}

/** Run SQL as root over the private socket. */
export function rootSql(sql: string, p: MariadbPaths = mariadbPaths()): string {
  return execFileSync(bin("mariadb"), [...adminArgs(p), "--batch", "--skip-column-names", "-e", sql], {
    encoding: "utf8",
  });
}

function quoteIdent(name: string): string {
  if (!/^[A-Za-z0-9_]+$/.test(name)) throw new Error(`unsafe database name: ${name}`);
  return `\`${name}\``;
}

function quoteString(s: string): string {
  return `'${s.replace(/\\/g, "\\\\").replace(/'/g, "\\'")}'`;
}

/** Create the database and the app user (idempotent). */
export function ensureDatabase(name: string, p: MariadbPaths = mariadbPaths()): void {
  const { user, password } = config.db;
  rootSql(
    [
      `CREATE DATABASE IF NOT EXISTS ${quoteIdent(name)} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
      `CREATE USER IF NOT EXISTS ${quoteString(user)}@'127.0.0.1' IDENTIFIED BY ${quoteString(password)}`,
      `CREATE USER IF NOT EXISTS ${quoteString(user)}@'localhost' IDENTIFIED BY ${quoteString(password)}`,
      // The app user may create and drop lapbench* databases (tests make their own).
      `GRANT ALL PRIVILEGES ON \`lapbench%\`.* TO ${quoteString(user)}@'127.0.0.1'`,
      `GRANT ALL PRIVILEGES ON \`lapbench%\`.* TO ${quoteString(user)}@'localhost'`,
    ].join(";\n"),
    p,
  );
}

export function dropDatabase(name: string, p: MariadbPaths = mariadbPaths()): void {
  rootSql(`DROP DATABASE IF EXISTS ${quoteIdent(name)}`, p);
}

export function stopMariadb(p: MariadbPaths = mariadbPaths()): boolean {
  if (!pingMariadb(p)) return false;
  execFileSync(bin("mariadb-admin"), adminArgs(p, "shutdown"), { stdio: "inherit" });
  return true;
}
