/**
 * Backup and restore of one Lapbench install: the database as a consistent `mariadb-dump
 * --single-transaction` (one snapshot, no table locks, the app keeps running) plus every stored
 * upload file, in one .tar.gz with a manifest of SHA-256 hashes. Restore checks every hash before
 * it touches anything, then loads the dump into the database and puts the files back.
 *
 * The dump is taken before the files are listed, so every file a dumped row points at is in the
 * archive (a file uploaded in between is extra, which is harmless).
 */
import { spawn } from "node:child_process";
import { createHash } from "node:crypto";
import fs from "node:fs";
import fsp from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import * as tar from "tar";
import { adminArgs, bin, ensureDatabase, mariadbPaths, rootSql, type MariadbPaths } from "./mariadb";

export const BACKUP_FORMAT = "lapbench-backup";
export const BACKUP_VERSION = 1;
const DUMP = "database.sql";
const FILES = "uploads";

export interface ManifestEntry {
  path: string;
  bytes: number;
  sha256: string;
}

export interface BackupManifest {
  format: typeof BACKUP_FORMAT;
  version: number;
  createdAt: string;
  database: string;
  server: string;
  entries: ManifestEntry[];
}

export interface BackupOptions {
  dbName: string;
  /** The upload service's storage folder. */
  uploadsDir: string;
  /** The archive to write (`.tar.gz`). */
  outFile: string;
  mariadb?: MariadbPaths;
}

export interface RestoreOptions {
  archive: string;
  dbName: string;
  uploadsDir: string;
  /** Replace a database that already has tables (otherwise restore refuses). */
  force?: boolean;
  mariadb?: MariadbPaths;
}

export class BackupError extends Error {}

export async function sha256File(file: string): Promise<string> {
  const h = createHash("sha256");
  for await (const chunk of fs.createReadStream(file)) h.update(chunk as Buffer);
  return h.digest("hex");
}

/** Run a MariaDB client program with stdin/stdout bound to files; rejects with its stderr. */
function runTool(name: string, args: string[], io: { stdoutFile?: string; stdinFile?: string }): Promise<void> {
  return new Promise((resolve, reject) => {
    const stdout = io.stdoutFile ? fs.openSync(io.stdoutFile, "w") : "ignore";
    const stdin = io.stdinFile ? fs.openSync(io.stdinFile, "r") : "ignore";
    const child = spawn(bin(name), args, { stdio: [stdin, stdout, "pipe"] });
    let err = "";
    child.stderr!.on("data", (d: Buffer) => (err += d.toString()));
    child.once("error", reject);
    child.once("exit", (code) => {
      if (typeof stdout === "number") fs.closeSync(stdout);
      if (typeof stdin === "number") fs.closeSync(stdin);
      if (code === 0) resolve();
      else reject(new BackupError(`${name} failed (exit ${code}): ${err.trim().slice(0, 2000)}`));
    });
  });
}

/** Stored upload files, relative to `dir`: skips uploads still being received (`.part`). */
async function listFiles(dir: string): Promise<string[]> {
  if (!fs.existsSync(dir)) return [];
  const out: string[] = [];
  for (const e of await fsp.readdir(dir, { withFileTypes: true, recursive: true })) {
    if (!e.isFile() || e.name.endsWith(".part")) continue;
    out.push(path.relative(dir, path.join(e.parentPath, e.name)));
  }
  return out.sort();
}

function assertDbName(name: string) {
  if (!/^[A-Za-z0-9_]+$/.test(name)) throw new BackupError(`unsafe database name: ${name}`);
}

export async function createBackup(o: BackupOptions): Promise<{ file: string; manifest: BackupManifest }> {
  assertDbName(o.dbName);
  const p = o.mariadb ?? mariadbPaths();
  const stage = await fsp.mkdtemp(path.join(os.tmpdir(), "lapbench-backup-"));
  try {
    await runTool(
      "mariadb-dump",
      adminArgs(p, "--single-transaction", "--quick", "--hex-blob", "--routines", "--triggers", "--default-character-set=utf8mb4", "--tz-utc", o.dbName),
      { stdoutFile: path.join(stage, DUMP) },
    );
    const files = await listFiles(o.uploadsDir);
    await fsp.mkdir(path.join(stage, FILES), { recursive: true });
    for (const rel of files) {
      const to = path.join(stage, FILES, rel);
      await fsp.mkdir(path.dirname(to), { recursive: true });
      // A hard link when the folders share a file system (no copy of large logs), a copy otherwise.
      await fsp.link(path.join(o.uploadsDir, rel), to).catch(() => fsp.copyFile(path.join(o.uploadsDir, rel), to));
    }
    const entries: ManifestEntry[] = [];
    for (const rel of [DUMP, ...files.map((f) => path.posix.join(FILES, f.split(path.sep).join("/")))]) {
      const full = path.join(stage, rel);
      entries.push({ path: rel, bytes: (await fsp.stat(full)).size, sha256: await sha256File(full) });
    }
    const manifest: BackupManifest = {
      format: BACKUP_FORMAT,
      version: BACKUP_VERSION,
      createdAt: new Date().toISOString(),
      database: o.dbName,
      server: rootSql("SELECT VERSION()", p).trim(),
      entries,
    };
    await fsp.writeFile(path.join(stage, "manifest.json"), JSON.stringify(manifest, null, 2) + "\n");
    await fsp.mkdir(path.dirname(path.resolve(o.outFile)), { recursive: true });
    await tar.c({ gzip: true, file: o.outFile, cwd: stage, portable: true }, ["manifest.json", DUMP, FILES]);
    return { file: path.resolve(o.outFile), manifest };
  } finally {
    await fsp.rm(stage, { recursive: true, force: true });
  }
}

/** Unpack and check an archive: the manifest, and every listed file's size and SHA-256. */
async function unpackChecked(archive: string, stage: string): Promise<BackupManifest> {
  if (!fs.existsSync(archive)) throw new BackupError(`No backup archive at ${archive}.`);
  try {
    // tar refuses absolute paths and ".." in entries by default (preservePaths: false).
    await tar.x({ file: archive, cwd: stage, strict: true });
  } catch (e) {
    throw new BackupError(`${archive} is not a readable .tar.gz backup: ${e instanceof Error ? e.message : String(e)}`);
  }
  const manifestFile = path.join(stage, "manifest.json");
  if (!fs.existsSync(manifestFile)) throw new BackupError(`${archive} has no manifest.json: not a Lapbench backup.`);
  const manifest = JSON.parse(await fsp.readFile(manifestFile, "utf8")) as BackupManifest;
  if (manifest.format !== BACKUP_FORMAT || manifest.version !== BACKUP_VERSION)
    throw new BackupError(`${archive} is not a Lapbench backup of version ${BACKUP_VERSION} (format "${manifest.format}", version ${manifest.version}).`);
  if (!manifest.entries.some((e) => e.path === DUMP)) throw new BackupError(`${archive} holds no database dump.`);
  for (const e of manifest.entries) {
    const full = path.join(stage, e.path);
    if (!path.resolve(full).startsWith(path.resolve(stage) + path.sep)) throw new BackupError(`The manifest names a path outside the archive: ${e.path}`);
    if (!fs.existsSync(full)) throw new BackupError(`${e.path} is listed in the manifest but missing from the archive.`);
    const bytes = (await fsp.stat(full)).size;
    const sha = await sha256File(full);
    if (bytes !== e.bytes || sha !== e.sha256)
      throw new BackupError(`${e.path} does not match the manifest (expected ${e.bytes} bytes, sha256 ${e.sha256}; found ${bytes} bytes, sha256 ${sha}): the archive is damaged. Nothing was restored.`);
  }
  return manifest;
}

export async function restoreBackup(o: RestoreOptions): Promise<BackupManifest> {
  assertDbName(o.dbName);
  const p = o.mariadb ?? mariadbPaths();
  const stage = await fsp.mkdtemp(path.join(os.tmpdir(), "lapbench-restore-"));
  try {
    const manifest = await unpackChecked(path.resolve(o.archive), stage);
    const tables = Number(rootSql(`SELECT COUNT(*) FROM information_schema.TABLES WHERE TABLE_SCHEMA = '${o.dbName}'`, p).trim());
    if (tables > 0 && !o.force)
      throw new BackupError(`The database ${o.dbName} already has ${tables} tables. Restore replaces it: run again with --force, or restore into another database (LAPBENCH_DB_NAME).`);
    rootSql(`DROP DATABASE IF EXISTS \`${o.dbName}\``, p);
    ensureDatabase(o.dbName, p);
    await runTool("mariadb", adminArgs(p, "--default-character-set=utf8mb4", o.dbName), { stdinFile: path.join(stage, DUMP) });
    for (const e of manifest.entries) {
      if (!e.path.startsWith(`${FILES}/`)) continue;
      const to = path.join(o.uploadsDir, e.path.slice(FILES.length + 1));
      await fsp.mkdir(path.dirname(to), { recursive: true });
      await fsp.copyFile(path.join(stage, e.path), to);
    }
    return manifest;
  } finally {
    await fsp.rm(stage, { recursive: true, force: true });
  }
}
