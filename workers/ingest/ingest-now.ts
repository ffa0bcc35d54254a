/**
 * Run one session's queued ingest job in this process (the seed, tests): claim that session's job
 * the way a worker does (FOR UPDATE SKIP LOCKED, so a running worker never takes it too), run it,
 * and close the job.
 */
import { QueryTypes, type Sequelize } from "sequelize";
import { finishJob, failJob } from "../../lib/data/jobs";
import { runIngestJob } from "./run-ingest-job";

export async function ingestNow(sequelize: Sequelize, sessionId: number, by = "in-process"): Promise<"ready" | "failed" | "no-job"> {
  const jobId = await sequelize.transaction(async (t) => {
    const rows = await sequelize.query<{ id: number }>(
      "SELECT id FROM jobs WHERE session_id = ? AND state = 'queued' ORDER BY id LIMIT 1 FOR UPDATE SKIP LOCKED",
      { replacements: [sessionId], type: QueryTypes.SELECT, transaction: t },
    );
    if (!rows[0]) return null;
    await sequelize.query(
      "UPDATE jobs SET state = 'running', attempts = attempts + 1, locked_by = ?, locked_at = UTC_TIMESTAMP(3), heartbeat_at = UTC_TIMESTAMP(3) WHERE id = ?",
      { replacements: [by, rows[0].id], type: QueryTypes.UPDATE, transaction: t },
    );
    return rows[0].id;
  });
  if (jobId === null) return "no-job";
  try {
    const outcome = await runIngestJob(sequelize, sessionId);
    if (outcome === "ready") await finishJob(sequelize, jobId);
    else await failJob(sequelize, jobId, "bad input (see the session's reason)");
    return outcome;
  } catch (e) {
    await failJob(sequelize, jobId, e instanceof Error ? e.message : String(e));
    throw e;
  }
}
