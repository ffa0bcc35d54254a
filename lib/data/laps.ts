import "server-only";
/** A session's laps as plain objects, for the lap table, the exports and Compare. */
import { Op } from "sequelize";
import { initModels, Lap as LapModel, RideSession, Rider } from "@/models";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import type { Lap } from "@/lib/laps/types";
import { sessionVisibility } from "./sessions";

export interface LapRow {
  sessionId: number;
  number: number;
  startTimeS: number;
  endTimeS: number;
  lapTimeMs: number;
  distanceM: number | null;
  sectorTimesMs: (number | null)[];
  topSpeedMs: number | null;
  outLap: boolean;
  inLap: boolean;
  pitPass: boolean;
  invalid: boolean;
  complete: boolean;
}

export interface VisibleSession {
  id: number;
  title: string;
  riderName: string | null;
  startedAt: string | null;
  createdAt: string;
  trackId: number | null;
  status: string;
}

/** JSON columns come back as text from some MariaDB versions. */
function jsonValue<T>(v: unknown): T | null {
  if (v == null) return null;
  if (typeof v === "string") {
    try {
      return JSON.parse(v) as T;
    } catch {
      return null;
    }
  }
  return v as T;
}

function toRow(l: LapModel): LapRow {
  const stats = jsonValue<{ complete?: boolean }>(l.stats);
  const outLap = Boolean(l.isOutLap);
  const inLap = Boolean(l.isInLap);
  return {
    sessionId: l.sessionId,
    number: l.number,
    startTimeS: l.startTimeS,
    endTimeS: l.endTimeS,
    lapTimeMs: l.lapTimeMs,
    distanceM: l.distanceM,
    sectorTimesMs: jsonValue<(number | null)[]>(l.sectorTimesMs) ?? [],
    topSpeedMs: l.topSpeedMs,
    outLap,
    inLap,
    pitPass: Boolean(l.pitPass),
    invalid: Boolean(l.isInvalid),
    // Laps are stored without a "complete" column: only the out-lap and the in-lap can be cut
    // off by the log's ends, unless the analysis says otherwise in stats.
    complete: stats?.complete ?? (!outLap && !inLap),
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
  };
}

/** Sessions of the caller's team they may see, by id; missing ids are simply absent. */
export async function visibleSessions(ctx: TeamContext, ids: readonly number[]): Promise<Map<number, VisibleSession>> {
  initModels();
  const out = new Map<number, VisibleSession>();
  if (ids.length === 0) return out;
  const rows = await RideSession.findAll({ where: { ...(await sessionVisibility(ctx)), id: { [Op.in]: [...new Set(ids)] } } });
  const riderIds = [...new Set(rows.map((r) => r.riderId).filter((x): x is number => x != null))];
  const riders = riderIds.length ? await Rider.findAll({ where: { id: { [Op.in]: riderIds } } }) : [];
  for (const r of rows) {
    out.set(r.id, {
      id: r.id,
      title: r.title ?? `Session ${r.id}`,
      riderName: riders.find((x) => x.id === r.riderId)?.name ?? null,
      startedAt: r.startedAt?.toISOString() ?? null,
      createdAt: r.createdAt.toISOString(),
      trackId: r.trackId,
      status: r.status,
    });
  }
  return out;
}

/** One visible session and its laps in lap order; 404 when the caller may not see the session. */
export async function listSessionLaps(ctx: TeamContext, sessionId: number): Promise<{ session: VisibleSession; laps: LapRow[] }> {
  const session = (await visibleSessions(ctx, [sessionId])).get(sessionId);
  if (!session) throw new HttpError(404, "Session was not found in your team.");
  const rows = await LapModel.findAll({ where: { sessionId }, order: [["number", "ASC"]] });
  return { session, laps: rows.map(toRow) };
}

/** Laps by session id and number, only from sessions the caller may see. */
export async function findLaps(ctx: TeamContext, wanted: readonly { sessionId: number; lap: number }[]): Promise<{ sessions: Map<number, VisibleSession>; laps: Map<string, LapRow> }> {
  const sessions = await visibleSessions(ctx, wanted.map((w) => w.sessionId));
  const laps = new Map<string, LapRow>();
  const allowed = wanted.filter((w) => sessions.has(w.sessionId));
  if (allowed.length) {
    const rows = await LapModel.findAll({ where: { [Op.or]: allowed.map((w) => ({ sessionId: w.sessionId, number: w.lap })) } });
    for (const r of rows) laps.set(`${r.sessionId}:${r.number}`, toRow(r));
  }
  return { sessions, laps };
}
