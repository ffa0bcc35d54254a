/**
 * Run one session's queued ingest job in this process (the seed, tests): claim that session's job
 * the way a worker does (FOR UPDATE SKIP LOCKED, so a running worker never takes it too), run it,
 * and close the job.
 */
import type { Sequelize } from "sequelize";
import { claimJob, finishJob, failJob } from "../../lib/data/jobs";
import { runIngestJob, type IngestJobOptions } from "./run-ingest-job";

export async function ingestNow(sequelize: Sequelize, sessionId: number, by = "in-process", opts: IngestJobOptions = {}): Promise<"ready" | "failed" | "no-job"> {
  const job = await claimJob(sequelize, by, { sessionId });
  if (!job) return "no-job";
  const jobId = job.id;
  try {
    const outcome = await runIngestJob(sequelize, sessionId, opts);
    if (outcome === "ready") await finishJob(sequelize, jobId);
    else await failJob(sequelize, jobId, "bad input (see the session's reason)");
    return outcome;
  } catch (e) {
    await failJob(sequelize, jobId, e instanceof Error ? e.message : String(e));
    throw e;
  }
}
