import "server-only";
/**
 * The season record: every analysed session of the team by event, with the figures a manager
 * keeps (best lap, best-three mean, conditions, setup version, findings, top speed), the best lap
 * ever per rider and bike at each track, and the progression across events at one track.
 * Everyone in the team reads it; a rider sees only the rows of sessions they rode.
 */
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { lapFigures, type RecordLap } from "@/lib/record/lap-figures";
import { bestPerPair } from "@/lib/record/best-per-pair";
import { storedLapState } from "@/lib/laps/stored-lap-state";
import { jsonColumn } from "./json-column";
import { eventProgression, type ProgressionPoint } from "@/lib/record/event-progression";

export interface SeasonFilters {
  year?: number | null;
  riderId?: number | null;
  bikeId?: number | null;
  trackId?: number | null;
}

export interface SeasonRow {
  sessionId: number;
  title: string;
  kind: string;
  startedAt: string | null;
  eventId: number | null;
  eventName: string | null;
  eventDate: string | null;
  trackId: number | null;
  trackName: string | null;
  riderId: number | null;
  riderName: string | null;
  bikeId: number | null;
  bikeName: string | null;
  conditions: string | null;
  setupVersion: number | null;
  findingsOpen: number;
  findingsAcknowledged: number;
  flyingLapCount: number;
  bestLapMs: number | null;
  bestLapNumber: number | null;
  bestThreeMeanMs: number | null;
  topSpeedMps: number | null;
  bestSectorsMs: number[] | null;
}

export interface Option {
  id: number;
  name: string;
}

export interface SeasonRecord {
  options: { years: number[]; riders: Option[]; bikes: Option[]; tracks: Option[] };
  filters: Required<{ [K in keyof SeasonFilters]: number | null }>;
  rows: SeasonRow[];
  /** Events in date order with their rows (sessions without an event come last as "No event"). */
  events: { eventId: number | null; eventName: string; eventDate: string | null; trackName: string | null; sessionIds: number[] }[];
  trackBests: { trackId: number; trackName: string; bests: SeasonRow[] }[];
  progression: { trackId: number; trackName: string; points: ProgressionPoint[] } | null;
  riderOnly: boolean;
}

/** A row as the query returns it: the shared columns of SeasonRow, with the driver's loose types where they differ. */
type RawRow = Pick<
  SeasonRow,
  "sessionId" | "kind" | "eventId" | "eventName" | "eventDate" | "trackId" | "trackName" | "riderId" | "riderName" | "bikeId" | "bikeName" | "conditions" | "setupVersion"
> & {
  title: string | null;
  startedAt: Date | string | null;
  findingsOpen: number | string;
  findingsAcknowledged: number | string;
  yr: number | null;
};

/** The SQL of every visible analysed session with its names, setup version and finding counts. */
export async function seasonBaseRows(ctx: TeamContext, where = "", params: (string | number)[] = []): Promise<RawRow[]> {
  const riderOnly = ctx.role === "rider";
  return getSequelize().query<RawRow>(
    `SELECT rs.id AS sessionId, rs.title, rs.kind, rs.started_at AS startedAt, rs.event_id AS eventId,
            e.name AS eventName, DATE_FORMAT(e.starts_on, '%Y-%m-%d') AS eventDate,
            COALESCE(rs.track_id, e.track_id) AS trackId, t.name AS trackName,
            rs.rider_id AS riderId, r.name AS riderName, rs.bike_id AS bikeId, b.name AS bikeName, rs.conditions,
            (SELECT MAX(ss.version) FROM setup_sheets ss WHERE ss.session_id = rs.id) AS setupVersion,
            (SELECT COUNT(*) FROM findings f WHERE f.session_id = rs.id AND f.acknowledged_at IS NULL) AS findingsOpen,
            (SELECT COUNT(*) FROM findings f WHERE f.session_id = rs.id AND f.acknowledged_at IS NOT NULL) AS findingsAcknowledged,
            YEAR(COALESCE(e.starts_on, rs.started_at)) AS yr
       FROM ride_sessions rs
       LEFT JOIN events e ON e.id = rs.event_id
       LEFT JOIN tracks t ON t.id = COALESCE(rs.track_id, e.track_id)
       LEFT JOIN riders r ON r.id = rs.rider_id
       LEFT JOIN bikes b ON b.id = rs.bike_id
      WHERE rs.team_id = ? AND rs.status = 'ready'
        ${riderOnly ? "AND rs.rider_id IN (SELECT id FROM riders WHERE team_id = ? AND user_id = ?)" : ""}
        ${where}
      ORDER BY COALESCE(e.starts_on, DATE(rs.started_at)) ASC, rs.started_at ASC, rs.id ASC`,
    { replacements: [ctx.teamId, ...(riderOnly ? [ctx.teamId, ctx.userId] : []), ...params], type: QueryTypes.SELECT },
  );
}

/** Laps of the given sessions, grouped by session. */
export async function lapsOfSessions(ids: number[]): Promise<Map<number, RecordLap[]>> {
  const out = new Map<number, RecordLap[]>();
  if (ids.length === 0) return out;
  const rows = await getSequelize().query<{ sessionId: number; number: number; lapTimeMs: number; isOutLap: number; isInLap: number; isInvalid: number; pitPass: number; topSpeedMps: number | null; sectorTimesMs: unknown; stats: unknown }>(
    `SELECT session_id AS sessionId, number, lap_time_ms AS lapTimeMs, is_out_lap AS isOutLap, is_in_lap AS isInLap, is_invalid AS isInvalid,
            pit_pass AS pitPass, top_speed_mps AS topSpeedMps, sector_times_ms AS sectorTimesMs, stats
       FROM laps WHERE session_id IN (${ids.map(() => "?").join(",")}) ORDER BY session_id, number`,
    { replacements: ids, type: QueryTypes.SELECT },
  );
  for (const r of rows) {
    const sectors = typeof r.sectorTimesMs === "string" ? (JSON.parse(r.sectorTimesMs) as number[] | null) : (r.sectorTimesMs as number[] | null);
    const list = out.get(r.sessionId) ?? [];
    const state = storedLapState(jsonColumn<{ complete?: boolean; suspect?: boolean }>(r.stats), !!r.isOutLap, !!r.isInLap);
    list.push({ number: r.number, lapTimeMs: r.lapTimeMs, isOutLap: !!r.isOutLap, isInLap: !!r.isInLap, isInvalid: !!r.isInvalid, pitPass: !!r.pitPass, topSpeedMps: r.topSpeedMps, sectorTimesMs: sectors, ...state });
    out.set(r.sessionId, list);
  }
  return out;
}

export function toSeasonRow(r: RawRow, laps: RecordLap[]): SeasonRow {
  const f = lapFigures(laps);
  const started = r.startedAt == null ? null : r.startedAt instanceof Date ? r.startedAt.toISOString() : new Date(r.startedAt).toISOString();
  return {
    sessionId: r.sessionId,
    title: r.title ?? `Session ${r.sessionId}`,
    kind: r.kind,
    startedAt: started,
    eventId: r.eventId,
    eventName: r.eventName,
    eventDate: r.eventDate,
    trackId: r.trackId,
    trackName: r.trackName,
    riderId: r.riderId,
    riderName: r.riderName,
    bikeId: r.bikeId,
    bikeName: r.bikeName,
    conditions: r.conditions,
    setupVersion: r.setupVersion == null ? null : Number(r.setupVersion),
    findingsOpen: Number(r.findingsOpen),
    findingsAcknowledged: Number(r.findingsAcknowledged),
    flyingLapCount: f.flyingLapCount,
    bestLapMs: f.bestLapMs,
    bestLapNumber: f.bestLapNumber,
    bestThreeMeanMs: f.bestThreeMeanMs,
    topSpeedMps: f.topSpeedMps,
    bestSectorsMs: f.bestSectorsMs,
  };
}

function options(rows: RawRow[], id: "riderId" | "bikeId" | "trackId", name: "riderName" | "bikeName" | "trackName"): Option[] {
  const m = new Map<number, string>();
  for (const r of rows) if (r[id] != null) m.set(r[id]!, r[name] ?? `#${r[id]}`);
  return [...m].map(([i, n]) => ({ id: i, name: n })).sort((a, b) => a.name.localeCompare(b.name));
}

export async function getSeasonRecord(ctx: TeamContext, filters: SeasonFilters = {}): Promise<SeasonRecord> {
  const all = await seasonBaseRows(ctx);
  const f = { year: filters.year ?? null, riderId: filters.riderId ?? null, bikeId: filters.bikeId ?? null, trackId: filters.trackId ?? null };
  const picked = all.filter((r) => (f.year == null || r.yr === f.year) && (f.riderId == null || r.riderId === f.riderId) && (f.bikeId == null || r.bikeId === f.bikeId) && (f.trackId == null || r.trackId === f.trackId));
  const laps = await lapsOfSessions(picked.map((r) => r.sessionId));
  const rows = picked.map((r) => toSeasonRow(r, laps.get(r.sessionId) ?? []));

  const events: SeasonRecord["events"] = [];
  for (const r of rows) {
    let e = events.find((x) => x.eventId === r.eventId);
    if (!e) events.push((e = { eventId: r.eventId, eventName: r.eventName ?? "No event", eventDate: r.eventDate, trackName: r.trackName, sessionIds: [] }));
    e.sessionIds.push(r.sessionId);
  }
  events.sort((a, b) => (a.eventId == null ? 1 : 0) - (b.eventId == null ? 1 : 0) || (a.eventDate ?? "").localeCompare(b.eventDate ?? ""));

  const trackIds = [...new Set(rows.map((r) => r.trackId).filter((x): x is number => x != null))];
  const trackBests = trackIds.map((id) => {
    const at = rows.filter((r) => r.trackId === id);
    return { trackId: id, trackName: at[0].trackName ?? `Track ${id}`, bests: bestPerPair(at) };
  });

  // The chart follows the chosen track, else the track with the most events in the selection.
  let chartTrack = f.trackId;
  if (chartTrack == null && trackIds.length) {
    const eventsAt = (id: number) => new Set(rows.filter((r) => r.trackId === id && r.eventId != null).map((r) => r.eventId)).size;
    chartTrack = [...trackIds].sort((a, b) => eventsAt(b) - eventsAt(a))[0];
  }
  const progression = chartTrack == null ? null : { trackId: chartTrack, trackName: trackBests.find((t) => t.trackId === chartTrack)?.trackName ?? "", points: eventProgression(rows.filter((r) => r.trackId === chartTrack)) };

  const years = [...new Set(all.map((r) => r.yr).filter((y): y is number => y != null))].sort((a, b) => b - a);
  return {
    options: { years, riders: options(all, "riderId", "riderName"), bikes: options(all, "bikeId", "bikeName"), tracks: options(all, "trackId", "trackName") },
    filters: f,
    rows,
    events,
    trackBests,
    progression,
    riderOnly: ctx.role === "rider",
  };
}
