import "server-only";
import { jsonColumn } from "./json-column";
import { storedLapState } from "@/lib/laps/stored-lap-state";
/** A session's laps as plain objects, for the lap table, the exports and Compare. */
// Raw SELECTs rather than model instances: Compare asks for laps on every chart request, and
// these rows only ever become plain objects.
import { QueryTypes, type Sequelize } from "sequelize";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import type { Lap } from "@/lib/laps/types";
import { sessionVisibilitySql } from "./sessions";

export interface LapRow {
  sessionId: number;
  number: number;
  startTimeS: number;
  endTimeS: number;
  lapTimeMs: number;
  distanceM: number | null;
  sectorTimesMs: (number | null)[];
  topSpeedMps: number | null;
  outLap: boolean;
  inLap: boolean;
  pitPass: boolean;
  invalid: boolean;
  complete: boolean;
  /** Much longer than the session's other laps: likely two merged by a missed crossing. */
  suspect: boolean;
}

export interface VisibleSession {
  id: number;
  title: string;
  riderName: string | null;
  startedAt: string | null;
  createdAt: string;
  trackId: number | null;
  status: string;
  /** Raised each time the session's laps are computed (caches of per-lap results key on it). */
  analysisVersion: number;
}


/** A `laps` row as SELECTed by LAP_COLUMNS (TINYINT(1) flags arrive as 0/1). */
interface LapDbRow {
  sessionId: number;
  number: number;
  startTimeS: number;
  endTimeS: number;
  lapTimeMs: number;
  distanceM: number | null;
  sectorTimesMs: unknown;
  topSpeedMps: number | null;
  isOutLap: number | boolean;
  isInLap: number | boolean;
  isInvalid: number | boolean;
  pitPass: number | boolean;
  stats: unknown;
}

const LAP_COLUMNS = `l.session_id AS sessionId, l.number AS number, l.start_time_s AS startTimeS, l.end_time_s AS endTimeS,
  l.lap_time_ms AS lapTimeMs, l.distance_m AS distanceM, l.sector_times_ms AS sectorTimesMs, l.top_speed_mps AS topSpeedMps,
  l.is_out_lap AS isOutLap, l.is_in_lap AS isInLap, l.is_invalid AS isInvalid, l.pit_pass AS pitPass, l.stats AS stats`;

function toRow(l: LapDbRow): LapRow {
  const outLap = Boolean(l.isOutLap);
  const inLap = Boolean(l.isInLap);
  const { complete, suspect } = storedLapState(jsonColumn<{ complete?: boolean; suspect?: boolean }>(l.stats), outLap, inLap);
  return {
    sessionId: l.sessionId,
    number: l.number,
    startTimeS: l.startTimeS,
    endTimeS: l.endTimeS,
    lapTimeMs: l.lapTimeMs,
    distanceM: l.distanceM,
    sectorTimesMs: jsonColumn<(number | null)[]>(l.sectorTimesMs) ?? [],
    topSpeedMps: l.topSpeedMps,
    outLap,
    inLap,
    pitPass: Boolean(l.pitPass),
    invalid: Boolean(l.isInvalid),
    complete,
    suspect,
  };
}

/** The shape lib/laps and lib/export take. */
export function toLibLap(r: LapRow): Lap {
  return {
    number: r.number,
    startTimeS: r.startTimeS,
    endTimeS: r.endTimeS,
    lapTimeMs: r.lapTimeMs,
    sectorTimesMs: r.sectorTimesMs,
    outLap: r.outLap,
    inLap: r.inLap,
    pitPass: r.pitPass,
    complete: r.complete,
    invalid: r.invalid,
    suspect: r.suspect,
  };
}

/** ride_sessions columns (alias s, riders alias r) as VisibleSession wants them. */
const SESSION_COLUMNS = `s.id AS id, s.title AS title, r.name AS riderName, s.started_at AS startedAt, s.created_at AS createdAt,
  s.track_id AS trackId, s.status AS status, s.analysis_version AS analysisVersion`;

interface SessionDbRow {
  id: number;
  title: string | null;
  riderName: string | null;
  startedAt: Date | null;
  createdAt: Date;
  trackId: number | null;
  status: string;
  analysisVersion: number | null;
}

function toVisibleSession(r: SessionDbRow): VisibleSession {
  return {
    id: r.id,
    title: r.title ?? `Session ${r.id}`,
    riderName: r.riderName ?? null,
    startedAt: r.startedAt?.toISOString() ?? null,
    createdAt: r.createdAt.toISOString(),
    trackId: r.trackId,
    status: r.status,
    analysisVersion: Number(r.analysisVersion ?? 0),
  };
}

/**
 * The caller's visible sessions among `ids` (rider name joined, the rider rule as a subquery),
 * each joined to the laps `lapCondition` picks (none: one row with NULL lap columns). One round trip.
 */
async function querySessions<R>(sequelize: Sequelize, ctx: TeamContext, ids: readonly number[], lap: { columns: string; condition: string; replacements: number[] } | null) {
  const visible = sessionVisibilitySql(ctx, "s");
  return sequelize.query<SessionDbRow & R>(
    `SELECT ${SESSION_COLUMNS}${lap ? `, ${lap.columns}` : ""}
       FROM ride_sessions s LEFT JOIN riders r ON r.id = s.rider_id
       ${lap ? `LEFT JOIN laps l ON l.session_id = s.id AND (${lap.condition})` : ""}
      WHERE ${visible.sql} AND s.id IN (${ids.map(() => "?").join(",")})
      ORDER BY s.id`,
    { replacements: [...(lap?.replacements ?? []), ...visible.replacements, ...ids], type: QueryTypes.SELECT },
  );
}

/** Sessions of the caller's team they may see, by id; missing ids are simply absent. */
export async function visibleSessions(ctx: TeamContext, ids: readonly number[], sequelize: Sequelize = getSequelize()): Promise<Map<number, VisibleSession>> {
  const out = new Map<number, VisibleSession>();
  const unique = [...new Set(ids)];
  if (unique.length === 0) return out;
  for (const r of await querySessions(sequelize, ctx, unique, null)) out.set(r.id, toVisibleSession(r));
  return out;
}

/** One visible session and its laps in lap order; 404 when the caller may not see the session. */
export async function listSessionLaps(ctx: TeamContext, sessionId: number): Promise<{ session: VisibleSession; laps: LapRow[] }> {
  const sequelize = getSequelize();
  // Both at once; the laps are only returned once the session is known to be visible.
  const [sessions, rows] = await Promise.all([
    visibleSessions(ctx, [sessionId], sequelize),
    sequelize.query<LapDbRow>(`SELECT ${LAP_COLUMNS} FROM laps l WHERE l.session_id = ? ORDER BY l.number ASC`, { replacements: [sessionId], type: QueryTypes.SELECT }),
  ]);
  const session = sessions.get(sessionId);
  if (!session) throw new HttpError(404, "Session was not found in your team.");
  return { session, laps: rows.map(toRow) };
}

/** Laps by session id and number, only from sessions the caller may see. */
export async function findLaps(ctx: TeamContext, wanted: readonly { sessionId: number; lap: number }[]): Promise<{ sessions: Map<number, VisibleSession>; laps: Map<string, LapRow> }> {
  const sessions = new Map<number, VisibleSession>();
  const laps = new Map<string, LapRow>();
  if (wanted.length === 0) return { sessions, laps };
  // Laps are joined only to sessions that pass the visibility rule, so no other lap is read.
  const rows = await querySessions<{ [K in keyof LapDbRow]: LapDbRow[K] | null }>(getSequelize(), ctx, [...new Set(wanted.map((w) => w.sessionId))], {
    columns: LAP_COLUMNS,
    condition: wanted.map(() => "(l.session_id = ? AND l.number = ?)").join(" OR "),
    replacements: wanted.flatMap((w) => [w.sessionId, w.lap]),
  });
  for (const r of rows) {
    if (!sessions.has(r.id)) sessions.set(r.id, toVisibleSession(r));
    if (r.sessionId != null) laps.set(`${r.sessionId}:${r.number}`, toRow(r as LapDbRow));
  }
  return { sessions, laps };
}
