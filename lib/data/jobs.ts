/**
 * The ingest queue in MariaDB. Workers claim with SELECT … FOR UPDATE SKIP LOCKED, so two workers
 * never take the same job; a job whose worker stopped sending heartbeats (killed, machine lost) is
 * put back in the queue until it has used its attempts.
 */
import { QueryTypes, type Sequelize } from "sequelize";

export const HEARTBEAT_STALE_S = 60;

export interface ClaimedJob {
  id: number;
  kind: string;
  sessionId: number | null;
  attempts: number;
  maxAttempts: number;
  payload: unknown;
}

export async function enqueueJob(sequelize: Sequelize, sessionId: number, kind = "ingest", payload: unknown = null): Promise<number> {
  const [id] = await sequelize.query("INSERT INTO jobs (kind, session_id, state, payload) VALUES (?, ?, 'queued', ?)", {
    replacements: [kind, sessionId, payload == null ? null : JSON.stringify(payload)],
    type: QueryTypes.INSERT,
  });
  return Number(id);
}

/** Claim the oldest runnable job, or (with `sessionId`) that session's job only. */
export async function claimJob(sequelize: Sequelize, workerId: string, opts: { sessionId?: number } = {}): Promise<ClaimedJob | null> {
  return sequelize.transaction(async (t) => {
    const rows = await sequelize.query<{ id: number; kind: string; session_id: number | null; attempts: number; max_attempts: number; payload: string | null }>(
      `SELECT id, kind, session_id, attempts, max_attempts, payload FROM jobs
        WHERE state = 'queued' AND run_after <= UTC_TIMESTAMP(3)${opts.sessionId != null ? " AND session_id = ?" : ""}
        ORDER BY id LIMIT 1 FOR UPDATE SKIP LOCKED`,
      { type: QueryTypes.SELECT, transaction: t, replacements: opts.sessionId != null ? [opts.sessionId] : [] },
    );
    const r = rows[0];
    if (!r) return null;
    await sequelize.query(
      "UPDATE jobs SET state = 'running', attempts = attempts + 1, locked_by = ?, locked_at = UTC_TIMESTAMP(3), heartbeat_at = UTC_TIMESTAMP(3) WHERE id = ?",
      { replacements: [workerId, r.id], transaction: t, type: QueryTypes.UPDATE },
    );
    let payload: unknown = r.payload;
    if (typeof payload === "string") payload = JSON.parse(payload);
    return { id: r.id, kind: r.kind, sessionId: r.session_id, attempts: r.attempts + 1, maxAttempts: r.max_attempts, payload };
  });
}

export async function heartbeat(sequelize: Sequelize, jobId: number, workerId: string): Promise<void> {
  await sequelize.query("UPDATE jobs SET heartbeat_at = UTC_TIMESTAMP(3) WHERE id = ? AND locked_by = ?", {
    replacements: [jobId, workerId],
    type: QueryTypes.UPDATE,
  });
}

export async function finishJob(sequelize: Sequelize, jobId: number): Promise<void> {
  await sequelize.query("UPDATE jobs SET state = 'done', locked_by = NULL, error = NULL WHERE id = ?", { replacements: [jobId], type: QueryTypes.UPDATE });
}

/** A job that cannot succeed (bad input): no retry. */
export async function failJob(sequelize: Sequelize, jobId: number, error: string): Promise<void> {
  await sequelize.query("UPDATE jobs SET state = 'failed', locked_by = NULL, error = ? WHERE id = ?", { replacements: [error, jobId], type: QueryTypes.UPDATE });
}

/** A job that may succeed later (a lost connection, a restart): back to the queue with a delay, or failed when out of attempts. */
export async function retryJob(sequelize: Sequelize, job: { id: number; attempts: number; maxAttempts: number }, error: string): Promise<"retry" | "failed"> {
  if (job.attempts >= job.maxAttempts) {
    await failJob(sequelize, job.id, error);
    return "failed";
  }
  const delayS = Math.min(60, 2 ** job.attempts);
  await sequelize.query(
    "UPDATE jobs SET state = 'queued', locked_by = NULL, error = ?, run_after = UTC_TIMESTAMP(3) + INTERVAL ? SECOND WHERE id = ?",
    { replacements: [error, delayS, job.id], type: QueryTypes.UPDATE },
  );
  return "retry";
}

/**
 * Put back jobs whose worker stopped sending heartbeats. Returns the ids requeued and the session
 * ids whose jobs ran out of attempts (the caller marks those sessions failed).
 */
export async function recoverStaleJobs(sequelize: Sequelize, staleS = HEARTBEAT_STALE_S): Promise<{ requeued: number[]; exhausted: { jobId: number; sessionId: number | null }[] }> {
  return sequelize.transaction(async (t) => {
    const rows = await sequelize.query<{ id: number; session_id: number | null; attempts: number; max_attempts: number }>(
      `SELECT id, session_id, attempts, max_attempts FROM jobs
        WHERE state = 'running' AND heartbeat_at < UTC_TIMESTAMP(3) - INTERVAL ? SECOND FOR UPDATE SKIP LOCKED`,
      { replacements: [staleS], type: QueryTypes.SELECT, transaction: t },
    );
    const requeued: number[] = [];
    const exhausted: { jobId: number; sessionId: number | null }[] = [];
    for (const r of rows) {
      if (r.attempts >= r.max_attempts) {
        await sequelize.query("UPDATE jobs SET state = 'failed', locked_by = NULL, error = 'The worker stopped during every attempt.' WHERE id = ?", { replacements: [r.id], transaction: t, type: QueryTypes.UPDATE });
        exhausted.push({ jobId: r.id, sessionId: r.session_id });
      } else {
        await sequelize.query("UPDATE jobs SET state = 'queued', locked_by = NULL, error = 'The worker stopped; retrying.' WHERE id = ?", { replacements: [r.id], transaction: t, type: QueryTypes.UPDATE });
        requeued.push(r.id);
      }
    }
    return { requeued, exhausted };
  });
}
