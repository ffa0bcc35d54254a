/**
 * `npm run bench:ingest` — how long a completed upload takes to become a ready session, beside the
 * raw baseline measured in the same run, and the worker's peak memory.
 *
 *   (a) baseline: papaparse streaming the file from disk into typed arrays, nothing else
 *       (tests/bench/baseline-parse.ts, its own process);
 *   (b) full path: the file already in the local upload fake's store → registerUpload (+ confirmMapping
 *       the first time; later files reuse the Import profile) → a real worker process
 *       (`node --import tsx workers/ingest-worker.ts`) claims the job, parses, writes, analyses →
 *       status "ready". Timed from the enqueue to "ready"; the worker's peak RSS is its VmHWM.
 *   With LAPBENCH_CSV_THREADS=n the worker reads a CSV's rows on n worker threads
 *   (workers/ingest/csv-thread-pool.ts); default 0, the job's own thread.
 *   stages: parse / write / analysis (laps, findings) / page analyses (slip, suspension, braking,
 *   gears; computed and stored at ingest) timed separately (tests/bench/stage-breakdown.ts).
 *
 * Every figure is the median of --runs runs (default 3), interleaved a, b, stages per run so the
 * noise of the shared 2-core machine hits them alike. Loopback only; a scratch database
 * lapbench_bench_<pid> is created and dropped. Prints PASS/MISS against the targets; never fails on them.
 *
 * Options: --sizes 50,200 (MB)  --runs 3  --dir <folder for the generated logs; kept and reused>
 *          --cpu-prof <folder: the worker writes a .cpuprofile per run>
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { QueryTypes, type Sequelize } from "sequelize";
import { startMariadb, ensureDatabase, dropDatabase } from "../../workers/services/mariadb";
import { startUploadFake, type UploadFake } from "../../workers/services/upload-fake";
import { createSequelize } from "../../models/db";
import { migrateUp } from "../../models/migrate";
import { initModels, RideSession } from "../../models";
import { registerUpload, confirmMapping } from "../../lib/data/imports";
import type { Mapping } from "../../lib/ingest/mapping";
import { median, procStatusMb } from "./proc-memory";

const ROOT = path.resolve(__dirname, "../..");
const TARGET_RATIO = 1.0;
const TARGET_PEAK_RSS_MB = 300;
/** "Not growing with file size": the large file's peak within 15% of the small file's. */
const RSS_GROWTH_TOLERANCE = 1.15;
const TEAM_ID = "bench-team";
const USER_ID = "bench-user";
/** The worker's claim poll; the default 400 ms would add up to 0.4 s of idle wait to (b). */
const WORKER_POLL_MS = 50;

function arg(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

const sizesMb = (arg("--sizes") ?? "50,200").split(",").map(Number);
const runs = Number(arg("--runs") ?? 3);
const cpuProfDir = arg("--cpu-prof");

interface RunFigures {
  baselineS: number;
  baselinePeakMb: number;
  fullS: number;
  uploadToReadyS: number;
  workerPeakMb: number;
  workerIdleMb: number;
  /** The worker's own "job N ready in X ms" (claim → finishJob), and its stages. */
  workerJobS: number;
  jobOpenS: number;
  jobParseWriteS: number;
  jobWriteTailS: number;
  jobAnalysisS: number;
  jobPagesS: number;
  jobCommitS: number;
  parseS: number;
  writeS: number;
  analyseS: number;
  pagesS: number;
  pagesComputeS: number;
  pagesKb: number;
  pageParts: number;
  laps: number;
  findings: number;
  parsePeakMb: number;
}

function nodeChild(script: string, args: string[], env: Record<string, string> = {}): { stdout: string } {
  const r = spawnSync(process.execPath, ["--import", "tsx", script, ...args], { cwd: ROOT, env: { ...process.env, ...env }, encoding: "utf8", maxBuffer: 16 << 20 });
  if (r.status !== 0) throw new Error(`${script} failed (${r.status}):\n${r.stderr}`);
  return { stdout: r.stdout };
}

function lastJson<T>(stdout: string): T {
  const line = stdout.trim().split("\n").filter((l) => l.startsWith("{")).pop();
  if (!line) throw new Error(`no JSON result in:\n${stdout}`);
  return JSON.parse(line) as T;
}

function generate(dir: string, mb: number): string {
  const file = path.join(dir, `lapbench-bench-${mb}MB.csv`);
  if (!fs.existsSync(file)) {
    const r = spawnSync(process.execPath, ["--import", "tsx", "sample-logs/generate.ts", "--big", String(mb), "--file", file], { cwd: ROOT, stdio: "inherit" });
    if (r.status !== 0) throw new Error(`the sample-log generator failed for ${mb} MB`);
  }
  return file;
}

/** Put the file in the fake's store as a finished upload would (data file + metadata sidecar). */
function storeUpload(storageDir: string, key: string, file: string): number {
  const dest = path.join(storageDir, key);
  try {
    fs.linkSync(file, dest); // same file system: no 200 MB copy
  } catch {
    fs.copyFileSync(file, dest);
  }
  const size = fs.statSync(file).size;
  const meta = { key, name: path.basename(file), size, type: "text/csv", customId: null, fileHash: "", uploadedAt: Date.now() };
  fs.writeFileSync(`${dest}.json`, JSON.stringify(meta));
  return size;
}

function startWorker(dbName: string): ChildProcess & { output: string } {
  const prof = cpuProfDir ? ["--cpu-prof", "--cpu-prof-dir", cpuProfDir] : [];
  const child = spawn(process.execPath, [...prof, "--import", "tsx", "workers/ingest-worker.ts"], {
    cwd: ROOT,
    env: { ...process.env, LAPBENCH_DB_NAME: dbName, LAPBENCH_WORKER_POLL_MS: String(WORKER_POLL_MS) },
    stdio: ["ignore", "pipe", "pipe"],
  }) as ChildProcess & { output: string };
  child.output = "";
  child.stdout!.on("data", (d: Buffer) => (child.output += d.toString()));
  child.stderr!.on("data", (d: Buffer) => (child.output += d.toString()));
  return child;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function stopWorker(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null) return;
  const exited = new Promise((r) => child.once("exit", r));
  child.kill("SIGTERM");
  await exited;
}

async function fullPath(sequelize: Sequelize, fake: UploadFake, storageDir: string, dbName: string, file: string, key: string) {
  const size = storeUpload(storageDir, key, file);
  const worker = startWorker(dbName);
  try {
    for (let i = 0; !/\] ready/.test(worker.output); i++) {
      if (worker.exitCode !== null || i > 1200) throw new Error(`the worker did not start:\n${worker.output}`);
      await sleep(50);
    }
    const workerIdleMb = procStatusMb(worker.pid!, "VmRSS");
    const tUpload = performance.now();
    const { sessionId } = await registerUpload(sequelize, { teamId: TEAM_ID, userId: USER_ID, file: { key, name: path.basename(file), size, ufsUrl: `${fake.url}/f/${key}` } });
    const s = await RideSession.findByPk(sessionId);
    if (s?.status === "mapping") await confirmMapping(sequelize, TEAM_ID, sessionId, s.mapping as Mapping, "Bench logger");
    else if (s?.status !== "queued") throw new Error(`session ${sessionId} is ${s?.status}: ${s?.statusReason}`);
    // Both calls return right after enqueueJob, their last statement.
    const tEnqueue = performance.now();
    for (;;) {
      const [row] = await sequelize.query<{ status: string; status_reason: string | null }>("SELECT status, status_reason FROM ride_sessions WHERE id = ?", {
        replacements: [sessionId],
        type: QueryTypes.SELECT,
      });
      if (row.status === "ready") break;
      if (row.status === "failed") throw new Error(`session ${sessionId} failed: ${row.status_reason}`);
      if (worker.exitCode !== null) throw new Error(`the worker exited:\n${worker.output}`);
      if (performance.now() - tEnqueue > 15 * 60_000) throw new Error("no ready session within 15 minutes");
      await sleep(25);
    }
    const tReady = performance.now();
    const workerPeakMb = procStatusMb(worker.pid!, "VmHWM");
    const [{ n }] = await sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM channels WHERE session_id = ?", { replacements: [sessionId], type: QueryTypes.SELECT });
    for (let i = 0; i < 40 && !/ready in \d+ ms/.test(worker.output); i++) await sleep(25);
    const jobMs = Number(/ready in (\d+) ms/.exec(worker.output)?.[1] ?? NaN);
    // The worker's own stage times: "ready in N ms (open a, parseWrite b, writeTail c, analysis d, pages e, commit f ms)".
    const stageMs = (name: string) => Number(new RegExp(`ready in \\d+ ms \\([^)]*\\b${name} (\\d+)`).exec(worker.output)?.[1] ?? NaN);
    return {
      sessionId, channels: Number(n), fullS: (tReady - tEnqueue) / 1000, uploadToReadyS: (tReady - tUpload) / 1000, workerPeakMb, workerIdleMb, workerJobS: jobMs / 1000,
      jobOpenS: stageMs("open") / 1000, jobParseWriteS: stageMs("parseWrite") / 1000, jobWriteTailS: stageMs("writeTail") / 1000, jobAnalysisS: stageMs("analysis") / 1000, jobPagesS: stageMs("pages") / 1000, jobCommitS: stageMs("commit") / 1000,
    };
  } finally {
    await stopWorker(worker);
  }
}

const f = (x: number, d = 2) => (Number.isFinite(x) ? x.toFixed(d) : "—");
const pass = (ok: boolean) => (ok ? "PASS" : "MISS");

function printTable(head: string[], rows: string[][]): void {
  const w = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) => "| " + cells.map((c, i) => (i === 0 ? c.padEnd(w[i]) : c.padStart(w[i]))).join(" | ") + " |";
  console.log(line(head));
  console.log("| " + w.map((n, i) => (i === 0 ? "-".repeat(n) : "-".repeat(n - 1) + ":")).join(" | ") + " |");
  for (const r of rows) console.log(line(r));
}

async function main(): Promise<void> {
  const keepDir = arg("--dir") ?? process.env.LAPBENCH_BENCH_DIR;
  const dataDir = keepDir ?? fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-bench-"));
  fs.mkdirSync(dataDir, { recursive: true });
  const storageDir = fs.mkdtempSync(path.join(dataDir, "store-"));
  if (cpuProfDir) fs.mkdirSync(cpuProfDir, { recursive: true });
  const dbName = `lapbench_bench_${process.pid}`;

  console.log(`Lapbench ingest benchmark — node ${process.version}, ${os.cpus().length} cores, ${(os.totalmem() / 2 ** 30).toFixed(0)} GiB; medians of ${runs} runs`);
  // The worker inherits the setting: 0 (default) reads every CSV row on the job's own thread.
  console.log(`CSV reader threads in the worker (LAPBENCH_CSV_THREADS): ${Number(process.env.LAPBENCH_CSV_THREADS || 0)}; load average ${os.loadavg().map((x) => x.toFixed(2)).join(", ")}`);
  await startMariadb();
  dropDatabase(dbName);
  ensureDatabase(dbName);
  const sequelize = createSequelize(dbName, { pool: 4 });
  let fake: UploadFake | undefined;
  try {
    await migrateUp(sequelize, { quiet: true });
    initModels(sequelize);
    fake = await startUploadFake({ port: 0, storageDir, apiKey: "sk_lapbench_bench_local" });

    const results: { mb: number; bytes: number; rows: number; channels: number; runs: RunFigures[] }[] = [];
    for (const mb of sizesMb) {
      const file = generate(dataDir, mb);
      const bytes = fs.statSync(file).size;
      const res = { mb, bytes, rows: 0, channels: 0, runs: [] as RunFigures[] };
      results.push(res);
      for (let run = 1; run <= runs; run++) {
        const a = lastJson<{ seconds: number; rows: number; channels: number; peakRssMb: number }>(nodeChild("tests/bench/baseline-parse.ts", [file]).stdout);
        const b = await fullPath(sequelize, fake, storageDir, dbName, file, `bench_${mb}_${run}_${process.pid}`);
        const st = lastJson<{ parseS: number; writeS: number; analyseS: number; pagesS: number; pagesComputeS: number; pagesKb: number; pageParts: number; laps: number; findings: number; parsePeakRssMb: number }>(
          nodeChild("tests/bench/stage-breakdown.ts", [file, String(b.sessionId)], { LAPBENCH_DB_NAME: dbName }).stdout,
        );
        // Keep the scratch database small: 200 MB logs leave ~160 MB of chunks per session.
        await sequelize.query("DELETE FROM ride_sessions WHERE id = ?", { replacements: [b.sessionId], type: QueryTypes.DELETE });
        res.rows = a.rows;
        res.channels = b.channels;
        const r: RunFigures = {
          baselineS: a.seconds, baselinePeakMb: a.peakRssMb, fullS: b.fullS, uploadToReadyS: b.uploadToReadyS, workerPeakMb: b.workerPeakMb, workerIdleMb: b.workerIdleMb, workerJobS: b.workerJobS,
          jobOpenS: b.jobOpenS, jobParseWriteS: b.jobParseWriteS, jobWriteTailS: b.jobWriteTailS, jobAnalysisS: b.jobAnalysisS, jobPagesS: b.jobPagesS, jobCommitS: b.jobCommitS,
          parseS: st.parseS, writeS: st.writeS, analyseS: st.analyseS, pagesS: st.pagesS, pagesComputeS: st.pagesComputeS, pagesKb: st.pagesKb, pageParts: st.pageParts, laps: st.laps, findings: st.findings, parsePeakMb: st.parsePeakRssMb,
        };
        res.runs.push(r);
        console.log(
          `  ${mb} MB run ${run}/${runs}: (a) ${f(r.baselineS)} s  (b) ${f(r.fullS)} s  b/a ${f(r.fullS / r.baselineS)}  worker peak ${f(r.workerPeakMb, 0)} MiB` +
            `  | parse ${f(r.parseS)} s, write ${f(r.writeS)} s, analysis ${f(r.analyseS, 3)} s, pages ${f(r.pagesS, 3)} s` +
            `  | worker: open ${f(r.jobOpenS)}, parse+write ${f(r.jobParseWriteS)}, write tail ${f(r.jobWriteTailS)}, analysis ${f(r.jobAnalysisS)}, pages ${f(r.jobPagesS)}, commit ${f(r.jobCommitS)} s`,
        );
      }
    }

    const m = (xs: RunFigures[], k: keyof RunFigures) => median(xs.map((x) => x[k]));
    console.log(`\nIngest: upload complete → session ready (medians of ${runs}; MB = 10^6 bytes, RSS in MiB)\n`);
    printTable(
      ["file", "rows", "(a) baseline s", "(a) MB/s", "(b) full path s", "(b) MB/s", "b/a", `b/a ≤ ${TARGET_RATIO}`, "worker peak RSS", `≤ ${TARGET_PEAK_RSS_MB} MiB`, "baseline peak RSS"],
      results.map((r) => {
        const a = m(r.runs, "baselineS");
        const b = m(r.runs, "fullS");
        const peak = m(r.runs, "workerPeakMb");
        return [
          `${(r.bytes / 1e6).toFixed(1)} MB`, String(r.rows), f(a), f(r.bytes / 1e6 / a, 1), f(b), f(r.bytes / 1e6 / b, 1), f(b / a), pass(b / a <= TARGET_RATIO),
          `${f(peak, 0)} MiB`, pass(peak <= TARGET_PEAK_RSS_MB), `${f(m(r.runs, "baselinePeakMb"), 0)} MiB`,
        ];
      }),
    );
    if (results.length >= 2) {
      const first = results[0];
      const last = results[results.length - 1];
      const p0 = m(first.runs, "workerPeakMb");
      const p1 = m(last.runs, "workerPeakMb");
      console.log(
        `\nWorker peak RSS vs file size: ${f(p0, 0)} MiB at ${(first.bytes / 1e6).toFixed(0)} MB → ${f(p1, 0)} MiB at ${(last.bytes / 1e6).toFixed(0)} MB ` +
          `(×${f(p1 / p0)} for ×${f(last.bytes / first.bytes, 1)} the bytes): ${pass(p1 <= p0 * RSS_GROWTH_TOLERANCE)} against "not growing" (≤ ×${RSS_GROWTH_TOLERANCE})`,
      );
    }

    console.log(`\nStages inside the worker's job (same library calls, file from disk, write rolled back; medians of ${runs})\n`);
    printTable(
      ["file", "parse s", "parse / (a)", "write s", "write MB/s", "analysis s", "pages s", "pages compute s", "pages stored", "laps", "findings", "parse-only peak RSS", "worker idle RSS", "worker's job s", "upload→ready s"],
      results.map((r) => {
        const a = m(r.runs, "baselineS");
        const parse = m(r.runs, "parseS");
        const write = m(r.runs, "writeS");
        // Stored bytes: Float64 time plus the channels (Float32, or Float64 for latitude/longitude).
        const storedMb = (r.rows * (8 + 4 * (r.channels - 1) + 8)) / 1e6;
        return [
          `${(r.bytes / 1e6).toFixed(1)} MB`, f(parse), f(parse / a), f(write), f(storedMb / write, 0), f(m(r.runs, "analyseS"), 3), f(m(r.runs, "pagesS"), 3), f(m(r.runs, "pagesComputeS"), 3),
          `${f(m(r.runs, "pagesKb"), 0)} kB in ${f(m(r.runs, "pageParts"), 0)} rows`, f(m(r.runs, "laps"), 0), f(m(r.runs, "findings"), 0),
          `${f(m(r.runs, "parsePeakMb"), 0)} MiB`, `${f(m(r.runs, "workerIdleMb"), 0)} MiB`, f(m(r.runs, "workerJobS")), f(m(r.runs, "uploadToReadyS")),
        ];
      }),
    );
    console.log(`\nThe worker's own stages in (b) (its log line; medians of ${runs}): the CSV is parsed and its chunks written at the same time\n`);
    printTable(
      ["file", "open file s", "parse + write s", "parse+write / (a)", "write tail s", "analysis s", "pages s", "commit s", "worker's job s"],
      results.map((r) => [
        `${(r.bytes / 1e6).toFixed(1)} MB`, f(m(r.runs, "jobOpenS")), f(m(r.runs, "jobParseWriteS")), f(m(r.runs, "jobParseWriteS") / m(r.runs, "baselineS")), f(m(r.runs, "jobWriteTailS")),
        f(m(r.runs, "jobAnalysisS")), f(m(r.runs, "jobPagesS")), f(m(r.runs, "jobCommitS")), f(m(r.runs, "workerJobS")),
      ]),
    );
    console.log(
      `\n(b) runs from the job's enqueue to status "ready" (the worker polls every ${WORKER_POLL_MS} ms); upload→ready adds registerUpload's sniff of the first bytes.` +
        `\nThe stage rows roll their transaction back, so the commit of the chunks is in (b) and the worker's job time only.`,
    );
  } finally {
    await fake?.close();
    await sequelize.close();
    dropDatabase(dbName);
    fs.rmSync(storageDir, { recursive: true, force: true });
    if (!keepDir) fs.rmSync(dataDir, { recursive: true, force: true });
  }
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
