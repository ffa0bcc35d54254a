import "server-only";
/**
 * Findings as plain objects, with the role rules: a finding is read through its
 * session's visibility, and only roles holding finding:acknowledge may acknowledge one.
 */
import { Op, QueryTypes } from "sequelize";
import { initModels, Finding, RideSession } from "@/models";
import { roleCan, type TeamContext } from "@/lib/auth/guard";
import { HttpError, forbidden } from "@/lib/http/http-error";
import { sessionVisibility } from "./sessions";
import { getSessionForViewer } from "./session-for-viewer";
import { sessionOutline, type Outline } from "./session-outline";

export interface FindingView {
  id: number;
  sessionId: number;
  kind: string;
  severity: "info" | "warning" | "critical";
  lapNumber: number | null;
  startTimeS: number | null;
  endTimeS: number | null;
  distanceM: number | null;
  lat: number | null;
  lon: number | null;
  measuredValue: number | null;
  thresholdValue: number | null;
  unit: string | null;
  message: string;
  acknowledgedBy: string | null;
  acknowledgedByName: string | null;
  acknowledgedAt: string | null;
  note: string | null;
}

function toView(f: Finding, names: Map<string, string>): FindingView {
  return {
    id: f.id,
    sessionId: f.sessionId,
    kind: f.kind,
    severity: f.severity,
    lapNumber: f.lapNumber,
    startTimeS: f.startTimeS,
    endTimeS: f.endTimeS,
    distanceM: f.distanceM,
    lat: f.lat,
    lon: f.lon,
    measuredValue: f.measuredValue,
    thresholdValue: f.thresholdValue,
    unit: f.unit,
    message: f.message,
    acknowledgedBy: f.acknowledgedBy,
    acknowledgedByName: f.acknowledgedBy ? (names.get(f.acknowledgedBy) ?? null) : null,
    acknowledgedAt: f.acknowledgedAt ? f.acknowledgedAt.toISOString() : null,
    note: f.note,
  };
}

async function userNames(ids: string[]): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  const unique = [...new Set(ids)];
  if (unique.length === 0) return out;
  const sequelize = initModels();
  const rows = await sequelize.query<{ id: string; name: string }>(`SELECT id, name FROM user WHERE id IN (${unique.map(() => "?").join(",")})`, {
    replacements: unique,
    type: QueryTypes.SELECT,
  });
  for (const r of rows) out.set(r.id, r.name);
  return out;
}

export interface SessionFindingsData {
  findings: FindingView[];
  outline: Outline | null;
}

/** A session's findings in time order, with the outline to place them on. 404 if not visible. */
export async function listSessionFindings(ctx: TeamContext, sessionId: number): Promise<SessionFindingsData> {
  const session = await getSessionForViewer(ctx, sessionId);
  const rows = await Finding.findAll({ where: { teamId: ctx.teamId, sessionId }, order: [["startTimeS", "ASC"], ["id", "ASC"]] });
  const names = await userNames(rows.map((r) => r.acknowledgedBy).filter((x): x is string => !!x));
  const outline = await sessionOutline(initModels(), session.id, session.trackId);
  return { findings: rows.map((r) => toView(r, names)), outline };
}

/**
 * Acknowledge a finding with a note. 403 for roles without finding:acknowledge, 404 when the
 * finding is not in the caller's team (another team's ids are not confirmed to exist).
 */
export async function acknowledgeFinding(ctx: TeamContext, findingId: number, note: string): Promise<FindingView> {
  if (!roleCan(ctx.role, { finding: ["acknowledge"] })) throw forbidden();
  initModels();
  const row = await Finding.findOne({ where: { id: findingId, teamId: ctx.teamId } });
  if (!row) throw new HttpError(404, "Finding was not found in your team.");
  await row.update({ acknowledgedBy: ctx.userId, acknowledgedAt: new Date(), note: note.trim() || null });
  return toView(row, new Map([[ctx.userId, ctx.userName]]));
}

export interface FindingToReview extends FindingView {
  sessionTitle: string;
}

/** Unacknowledged findings of the team's most recent sessions the caller may see, worst first. */
export async function listFindingsToReview(ctx: TeamContext, opts: { sessions?: number; limit?: number } = {}): Promise<FindingToReview[]> {
  initModels();
  const sessions = await RideSession.findAll({
    where: { ...(await sessionVisibility(ctx)), status: "ready" },
    order: [["createdAt", "DESC"]],
    limit: opts.sessions ?? 10,
    attributes: ["id", "title"],
  });
  if (sessions.length === 0) return [];
  const title = new Map(sessions.map((s) => [s.id, s.title ?? `Session ${s.id}`]));
  const rows = await Finding.findAll({
    where: { teamId: ctx.teamId, sessionId: { [Op.in]: sessions.map((s) => s.id) }, acknowledgedAt: null },
    order: [["sessionId", "DESC"], ["startTimeS", "ASC"]],
  });
  const rank = { critical: 0, warning: 1, info: 2 } as const;
  return rows
    .map((r) => ({ ...toView(r, new Map()), sessionTitle: title.get(r.sessionId) ?? `Session ${r.sessionId}` }))
    .sort((a, b) => rank[a.severity] - rank[b.severity] || b.sessionId - a.sessionId || (a.startTimeS ?? 0) - (b.startTimeS ?? 0))
    .slice(0, opts.limit ?? 12);
}
