/**
 * Backup and restore round trip on the real MariaDB: an install with ingested sessions and stored
 * upload files is backed up (mariadb-dump --single-transaction + the files + a SHA-256 manifest),
 * restored into another database and another storage folder, and compared table by table with
 * CHECKSUM TABLE and file by file with SHA-256. A damaged archive and a non-empty target are
 * refused before anything is touched. The same code runs behind `npm run backup` / `npm run restore`.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import * as tar from "tar";
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import { initModels } from "@/models";
import { createBackup, restoreBackup, sha256File, type BackupManifest } from "@/workers/services/backup";
import { dropDatabase, rootSql } from "@/workers/services/mariadb";
import { createTeamWithRoles } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";
import { createSampleTrackAndBike, ingestSampleFile } from "./helpers/demo-track";
import { at } from "../fixtures/at";

let up: UploadHarness;
let work: string;
const source = () => process.env.LAPBENCH_DB_NAME!;
const target = `lapbench_restore_${process.pid}`;

function tablesOf(db: string): string[] {
  return rootSql(`SELECT TABLE_NAME FROM information_schema.TABLES WHERE TABLE_SCHEMA = '${db}' AND TABLE_TYPE = 'BASE TABLE' ORDER BY TABLE_NAME`)
    .split("\n")
    .filter(Boolean);
}

/** CHECKSUM TABLE of every table (EXTENDED: a full read of each row, not a cached live checksum). */
function checksums(db: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const line of rootSql(`CHECKSUM TABLE ${tablesOf(db).map((t) => `\`${db}\`.\`${t}\``).join(", ")} EXTENDED`).split("\n").filter(Boolean)) {
    const [name, sum] = line.split("\t");
    if (name === undefined || sum === undefined) throw new Error(`unexpected CHECKSUM line: ${line}`);
    out[name.slice(db.length + 1)] = sum;
  }
  return out;
}

async function hashes(dir: string): Promise<Record<string, string>> {
  const out: Record<string, string> = {};
  for (const e of fs.readdirSync(dir, { withFileTypes: true, recursive: true })) {
    if (!e.isFile() || e.name.endsWith(".part")) continue;
    const full = path.join(e.parentPath, e.name);
    out[path.relative(dir, full)] = await sha256File(full);
  }
  return out;
}

beforeAll(async () => {
  initModels();
  work = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-backup-test-"));
  up = await startUploadHarness();
  const team = await createTeamWithRoles("Backup team");
  const { track, bike } = await createSampleTrackAndBike(team.teamId);
  await ingestSampleFile(up, team.members.engineer.cookie, team.teamId, "three-laps-20hz.csv", { trackId: track.id, bikeId: bike.id });
  dropDatabase(target);
});

afterAll(async () => {
  await up?.close();
  dropDatabase(target);
  fs.rmSync(work, { recursive: true, force: true });
});

describe("backup → restore round trip", () => {
  let archive: string;
  let manifest: BackupManifest;

  it("the archive holds the dump and every stored file, each with its SHA-256 in the manifest", async () => {
    const r = await createBackup({ dbName: source(), uploadsDir: up.storageDir, outFile: path.join(work, "backup.tar.gz") });
    archive = r.file;
    manifest = r.manifest;
    expect(fs.statSync(archive).size).toBeGreaterThan(0);
    const stored = await hashes(up.storageDir);
    expect(Object.keys(stored).length).toBeGreaterThanOrEqual(2); // the log file and its record
    const listed = Object.fromEntries(manifest.entries.filter((e) => e.path.startsWith("uploads/")).map((e) => [e.path.slice(8), e.sha256]));
    expect(listed).toEqual(stored);
    const dump = manifest.entries.find((e) => e.path === "database.sql")!;
    expect(dump.bytes).toBeGreaterThan(1000);
    // The archive is a plain tar.gz a person can inspect with `tar tzf`.
    const names = execFileSync("tar", ["tzf", archive], { encoding: "utf8" }).split("\n");
    expect(names).toContain("manifest.json");
    expect(names).toContain("database.sql");
  });

  it("restored into another database and folder: every table's CHECKSUM and every file's SHA-256 match", async () => {
    const restoredDir = path.join(work, "restored-uploads");
    await restoreBackup({ archive, dbName: target, uploadsDir: restoredDir });
    const before = checksums(source());
    const after = checksums(target);
    expect(Object.keys(after).sort()).toEqual(tablesOf(source()).sort());
    expect(Object.keys(before).length).toBeGreaterThan(10);
    expect(after).toEqual(before);
    // Not a comparison of empty tables: the sample session's chunks and laps came across.
    const { n } = at(await getSequelize().query<{ n: number }>(`SELECT COUNT(*) AS n FROM \`${target}\`.channel_chunks`, { type: QueryTypes.SELECT }), 0);
    expect(n).toBeGreaterThan(0);
    expect(await hashes(restoredDir)).toEqual(await hashes(up.storageDir));
  });

  it("refuses to replace a database that has tables unless forced", async () => {
    await expect(restoreBackup({ archive, dbName: target, uploadsDir: path.join(work, "again") })).rejects.toThrow(/already has \d+ tables.*--force/);
    await restoreBackup({ archive, dbName: target, uploadsDir: path.join(work, "again"), force: true });
    expect(checksums(target)).toEqual(checksums(source()));
  });

  it("a damaged archive is refused with the file that does not match, and nothing is restored", async () => {
    const unpacked = path.join(work, "unpacked");
    fs.mkdirSync(unpacked);
    await tar.x({ file: archive, cwd: unpacked });
    fs.appendFileSync(path.join(unpacked, "database.sql"), "\nDROP TABLE sessions;\n");
    const damaged = path.join(work, "damaged.tar.gz");
    await tar.c({ gzip: true, file: damaged, cwd: unpacked }, fs.readdirSync(unpacked));
    const other = `lapbench_restore_damaged_${process.pid}`;
    try {
      await expect(restoreBackup({ archive: damaged, dbName: other, uploadsDir: path.join(work, "damaged-uploads") })).rejects.toThrow(/database\.sql does not match the manifest.*Nothing was restored/);
      expect(tablesOf(other)).toEqual([]);
      expect(fs.existsSync(path.join(work, "damaged-uploads"))).toBe(false);
    } finally {
      dropDatabase(other);
    }
    fs.writeFileSync(path.join(work, "not-a-backup.tar.gz"), "hello");
    await expect(restoreBackup({ archive: path.join(work, "not-a-backup.tar.gz"), dbName: other, uploadsDir: work })).rejects.toThrow(/not a readable \.tar\.gz backup/);
  });
});
