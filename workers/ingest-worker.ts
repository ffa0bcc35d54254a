/**
 * The ingest worker process (`npm run worker`; `npm start` starts one). Claims jobs from MariaDB
 * with SELECT … FOR UPDATE SKIP LOCKED, sends heartbeats while it works, requeues jobs of workers
 * that died, and retries a bounded number of times on errors that may pass.
 */
import os from "node:os";
import { getSequelize } from "../models/db";
import { initModels, RideSession } from "../models";
import { claimJob, finishJob, failJob, heartbeat, recoverStaleJobs, retryJob, HEARTBEAT_STALE_S } from "../lib/data/jobs";
import { runIngestJob, type IngestTimings } from "./ingest/run-ingest-job";
import { sharedCsvThreadPool } from "./ingest/csv-thread-pool";

const workerId = `${os.hostname()}:${process.pid}`;
/**
 * How long an idle worker waits between claims. A claim is one short indexed transaction on
 * loopback (well under a millisecond of server time), so 100 ms costs nothing measurable and keeps
 * the wait between "upload complete" and the start of the job short.
 */
const POLL_MS = Number(process.env.LAPBENCH_WORKER_POLL_MS ?? 100);
const STALE_S = Number(process.env.LAPBENCH_WORKER_STALE_S ?? HEARTBEAT_STALE_S);
let stopping = false;

function log(msg: string) {
  console.log(`[worker ${workerId}] ${msg}`);
}

async function recover(sequelize = getSequelize()) {
  const { requeued, exhausted } = await recoverStaleJobs(sequelize, STALE_S);
  if (requeued.length) log(`requeued jobs of stopped workers: ${requeued.join(", ")}`);
  for (const x of exhausted) {
    if (x.sessionId) await RideSession.update({ status: "failed", statusReason: "Reading this file stopped unexpectedly on every attempt. Try a re-import; if it fails again, the file may be too large." }, { where: { id: x.sessionId } });
  }
}

/**
 * Run `write` until it succeeds or `RECORD_TRY_S` pass (connection errors while MariaDB restarts),
 * with a growing pause between tries. Gives up with null: the job then stays "running" without
 * heartbeats, and recoverStaleJobs (any worker's) puts it back in the queue.
 */
const RECORD_TRY_S = Number(process.env.LAPBENCH_WORKER_RECORD_TRY_S ?? 120);
async function untilDatabaseAnswers<T>(what: string, write: () => Promise<T>): Promise<T | null> {
  const end = Date.now() + RECORD_TRY_S * 1000;
  let pauseMs = 250;
  for (;;) {
    try {
      return await write();
    } catch (e) {
      if (Date.now() + pauseMs > end || stopping) {
        log(`${what} failed: ${e instanceof Error ? e.message : String(e)}`);
        return null;
      }
      await new Promise((r) => setTimeout(r, pauseMs));
      pauseMs = Math.min(5000, pauseMs * 2);
    }
  }
}

async function loop() {
  const sequelize = getSequelize();
  initModels(sequelize);
  // The CSV reader threads load their code now, not in the first large job.
  await sharedCsvThreadPool()?.warm();
  log("ready");
  let lastRecover = 0;
  while (!stopping) {
    if (Date.now() - lastRecover > Math.min(30_000, STALE_S * 500)) {
      lastRecover = Date.now();
      await recover(sequelize).catch((e) => log(`recovery failed: ${e}`));
    }
    const job = await claimJob(sequelize, workerId).catch((e) => {
      log(`claim failed: ${e}`);
      return null;
    });
    if (!job) {
      await new Promise((r) => setTimeout(r, POLL_MS));
      continue;
    }
    log(`job ${job.id} (session ${job.sessionId}, attempt ${job.attempts}/${job.maxAttempts})`);
    const beat = setInterval(() => void heartbeat(sequelize, job.id, workerId).catch(() => {}), Math.max(1000, (STALE_S * 1000) / 4));
    const t0 = Date.now();
    try {
      if (job.kind !== "ingest" || job.sessionId == null) throw new Error(`unknown job kind ${job.kind}`);
      const timings: IngestTimings = {};
      const outcome = await runIngestJob(sequelize, job.sessionId, { timings });
      if (outcome === "ready") await finishJob(sequelize, job.id);
      else await failJob(sequelize, job.id, "bad input (see the session's reason)");
      const stages = Object.entries(timings).map(([k, v]) => `${k.replace(/Ms$/, "")} ${Math.round(v)}`);
      log(`job ${job.id} ${outcome} in ${Date.now() - t0} ms${stages.length ? ` (${stages.join(", ")} ms)` : ""}`);
    } catch (e) {
      const msg = e instanceof Error ? e.message : String(e);
      log(`job ${job.id} error: ${msg}`);
      // The error may be the database itself going away (restart, crash): keep trying to record the
      // retry while it comes back, instead of letting the worker die with the job marked running.
      // The session first, while the job is still ours (running, locked by this worker): once the
      // job is back in the queue another worker may take it, and a late status write here would
      // overwrite that worker's.
      const last = job.attempts >= job.maxAttempts;
      const recorded = await untilDatabaseAnswers(`recording the retry of job ${job.id}`, async () => {
        if (job.sessionId)
          await RideSession.update(
            last ? { status: "failed", statusReason: `Reading this file failed after ${job.attempts} attempts: ${msg}` } : { status: "queued", progress: 0 },
            { where: { id: job.sessionId } },
          );
        return retryJob(sequelize, job, msg);
      });
      log(`job ${job.id} ${recorded ?? "left running; the stale-job recovery will requeue it"}`);
    } finally {
      clearInterval(beat);
    }
  }
  await sequelize.close();
  log("stopped");
}

process.on("SIGTERM", () => (stopping = true));
process.on("SIGINT", () => (stopping = true));
loop().catch((e) => {
  console.error(e);
  process.exit(1);
});
