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

async function loop() {
  const sequelize = getSequelize();
  initModels(sequelize);
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
      const r = await retryJob(sequelize, job, msg);
      log(`job ${job.id} error (${r}): ${msg}`);
      if (r === "failed" && job.sessionId)
        await RideSession.update({ status: "failed", statusReason: `Reading this file failed after ${job.attempts} attempts: ${msg}` }, { where: { id: job.sessionId } });
      else if (job.sessionId) await RideSession.update({ status: "queued", progress: 0 }, { where: { id: job.sessionId } });
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
