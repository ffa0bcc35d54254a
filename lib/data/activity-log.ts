import "server-only";
/**
 * The team's activity log: who changed what and when (setup saves, threshold and track changes,
 * role changes, acknowledgements, deletions, engine moves). Writing an entry never fails the change
 * it records: a failed write is logged to the server console only. Owners and engineers read the
 * team's log; everyone who may see a session reads that session's entries.
 */
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { forbidden } from "@/lib/http/http-error";
import { getSessionForViewer } from "./session-for-viewer";
import { userNames } from "./setup-sheets";

export interface ActivityInput {
  action: string;
  subjectType: string;
  subjectId?: string | number | null;
  sessionId?: number | null;
  summary: string;
}

export interface ActivityEntry {
  id: number;
  action: string;
  subjectType: string;
  subjectId: string | null;
  sessionId: number | null;
  summary: string;
  actorName: string | null;
  createdAt: string;
}

/** Record one entry; `ctx` names the team and who acted. Never throws. */
export async function recordActivity(ctx: Pick<TeamContext, "teamId" | "userId">, a: ActivityInput): Promise<void> {
  try {
    await getSequelize().query("INSERT INTO activity_log (team_id, actor_id, action, subject_type, subject_id, session_id, summary) VALUES (?, ?, ?, ?, ?, ?, ?)", {
      replacements: [ctx.teamId, ctx.userId, a.action.slice(0, 60), a.subjectType.slice(0, 40), a.subjectId == null ? null : String(a.subjectId).slice(0, 64), a.sessionId ?? null, a.summary.slice(0, 1000)],
      type: QueryTypes.INSERT,
    });
  } catch (e) {
    console.error(`[activity] could not record ${a.action}: ${e instanceof Error ? e.message : String(e)}`);
  }
}

interface Row {
  id: number;
  action: string;
  subjectType: string;
  subjectId: string | null;
  sessionId: number | null;
  summary: string;
  actorId: string | null;
  createdAt: Date;
}

async function toEntries(rows: Row[]): Promise<ActivityEntry[]> {
  const names = await userNames(rows.map((r) => r.actorId));
  return rows.map((r) => ({ id: r.id, action: r.action, subjectType: r.subjectType, subjectId: r.subjectId, sessionId: r.sessionId, summary: r.summary, actorName: r.actorId ? (names.get(r.actorId) ?? null) : null, createdAt: new Date(r.createdAt).toISOString() }));
}

const COLS = "id, action, subject_type AS subjectType, subject_id AS subjectId, session_id AS sessionId, summary, actor_id AS actorId, created_at AS createdAt";

/** The team's log, newest first: owners and engineers only. */
export async function listTeamActivity(ctx: TeamContext, limit = 200): Promise<ActivityEntry[]> {
  if (ctx.role !== "owner" && ctx.role !== "engineer") throw forbidden("The team's activity log is for the owner and engineers.");
  const rows = await getSequelize().query<Row>(`SELECT ${COLS} FROM activity_log WHERE team_id = ? ORDER BY created_at DESC, id DESC LIMIT ?`, { replacements: [ctx.teamId, limit], type: QueryTypes.SELECT });
  return toEntries(rows);
}

/** One session's entries, for everyone who may see the session (404 otherwise). */
export async function listSessionActivity(ctx: TeamContext, sessionId: number): Promise<ActivityEntry[]> {
  const s = await getSessionForViewer(ctx, sessionId);
  const rows = await getSequelize().query<Row>(`SELECT ${COLS} FROM activity_log WHERE team_id = ? AND session_id = ? ORDER BY created_at DESC, id DESC LIMIT 200`, { replacements: [ctx.teamId, s.id], type: QueryTypes.SELECT });
  return toEntries(rows);
}
