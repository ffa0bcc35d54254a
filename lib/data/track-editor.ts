import "server-only";
/**
 * Tracks for the gate editor: list, create (optionally from a session's GPS), read with an
 * outline to draw on, save gates/corners/pit limit and re-run the analysis of the track's
 * sessions. Plain objects out; team and role checks inside.
 */
import { isTimeZone } from "@/lib/ingest/zoned-time";
import { Op, QueryTypes } from "sequelize";
import { z } from "zod";
import { initModels, RideSession, Track, type TrackGates, type TrackCorner } from "@/models";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError, notFound } from "@/lib/http/http-error";
import { gateFromPoints } from "@/lib/geo/gate-from-points";
import { lapOutline } from "@/lib/geo/lap-outline";
import { thinFixes } from "@/lib/geo/thin-fixes";
import { pathDistances } from "@/lib/geo/path-distances";
import { loadSessionSeries } from "./session-series";
import { sessionVisibility, sessionVisibilitySql } from "./sessions";
import { assertCanEditSetup } from "./setup-access";
import { jsonColumn } from "./json-column";
import { reanalyseTrackSessions } from "./reanalyse";

// ---- input schemas (shared with the server actions and the tests) ---------------------------

const gatePointSchema = z.object({
  lat: z.number({ message: "Latitude must be a number" }).min(-90, "Latitude is between −90 and 90").max(90, "Latitude is between −90 and 90"),
  lon: z.number({ message: "Longitude must be a number" }).min(-180, "Longitude is between −180 and 180").max(180, "Longitude is between −180 and 180"),
});

export const gateSchema = z.object({ a: gatePointSchema, b: gatePointSchema }).superRefine((g, ctx) => {
  try {
    gateFromPoints(g.a, g.b);
  } catch (e) {
    ctx.addIssue({ code: "custom", message: `This gate is not usable: ${(e as Error).message}.` });
  }
});

export const trackGatesSchema = z
  .object({
    startFinish: gateSchema.nullable(),
    sectors: z.array(gateSchema).max(20, "At most 20 sector gates"),
    pitEntry: gateSchema.nullable(),
    pitExit: gateSchema.nullable(),
  })
  .superRefine((g, ctx) => {
    if (g.sectors.length > 0 && !g.startFinish)
      ctx.addIssue({ code: "custom", path: ["startFinish"], message: "Sectors are timed from the start/finish gate: place it before sector gates." });
    if (!!g.pitEntry !== !!g.pitExit)
      ctx.addIssue({ code: "custom", path: [g.pitEntry ? "pitExit" : "pitEntry"], message: "Pit passes need both gates: place the pit entry and the pit exit, or neither." });
  });

export const trackNameSchema = z.string({ message: "Name the track" }).trim().min(2, "Name the track (at least 2 characters)").max(120, "Keep the name under 120 characters");

export const cornerSchema = z.object({
  name: z.string().trim().min(1, "Name the corner").max(60, "Keep corner names under 60 characters"),
  distanceM: z.number({ message: "Distance must be a number of metres" }).min(0, "Distance along the lap cannot be negative").max(20_000, "Distance along the lap is at most 20 000 m"),
});

export const trackSaveSchema = z
  .object({
    name: trackNameSchema,
    gates: trackGatesSchema,
    corners: z.array(cornerSchema).max(60, "At most 60 corners"),
    pitSpeedLimitKmh: z
      .number({ message: "Pit-lane speed limit must be a number of km/h" })
      .min(5, "Pit-lane speed limit must be at least 5 km/h")
      .max(150, "Pit-lane speed limit must be at most 150 km/h")
      .nullable(),
    /** IANA time zone of the circuit ("Europe/Madrid"): start times written without a zone are read in it. */
    timeZone: z
      .string()
      .trim()
      .max(64)
      .refine((z) => z === "" || isTimeZone(z), { message: "Time zone must be an IANA name such as Europe/Madrid" })
      .transform((z) => (z === "" ? null : z))
      .nullable()
      .optional(),
    /** Take the outline from this session's GPS and keep it on the track. */
    outlineSessionId: z.number().int().positive().nullable().optional(),
  })
  .superRefine((t, ctx) => {
    const seen = new Map<string, number>();
    t.corners.forEach((c, i) => {
      const k = c.name.toLowerCase();
      if (seen.has(k)) ctx.addIssue({ code: "custom", path: ["corners", i, "name"], message: `"${c.name}" is already the name of corner ${seen.get(k)! + 1}` });
      else seen.set(k, i);
    });
  });
export type TrackSaveInput = z.infer<typeof trackSaveSchema>;

export const trackCreateSchema = z.object({
  name: trackNameSchema,
  sessionId: z.number().int().positive().nullable(),
});
export type TrackCreateInput = z.infer<typeof trackCreateSchema>;

// ---- plain shapes out --------------------------------------------------------------------------

export interface TrackListItem {
  id: number;
  name: string;
  lengthM: number | null;
  hasStartFinish: boolean;
  sectorCount: number;
  cornerCount: number;
  pitSpeedLimitKmh: number | null;
  sessionCount: number;
}

export interface SessionPick {
  id: number;
  title: string;
  startedAt: string | null;
}

export interface TrackEditorData {
  id: number;
  name: string;
  lengthM: number | null;
  gates: TrackGates;
  corners: TrackCorner[];
  pitSpeedLimitKmh: number | null;
  timeZone: string | null;
  /** One lap, [lat, lon] in travel order; empty when nothing is recorded yet. */
  outline: [number, number][];
  outlineSource: "track" | "session" | "none";
  /** The chosen session's whole trace (pit lane included), thinned; null when none is chosen. */
  trace: [number, number][] | null;
  sessionId: number | null;
  /** Ready sessions on this track the caller may see, to draw the outline from. */
  sessions: SessionPick[];
}

const EMPTY_GATES: TrackGates = { startFinish: null, sectors: [], pitEntry: null, pitExit: null };

function gatesOf(t: Track): TrackGates {
  const g = jsonColumn<Partial<TrackGates>>(t.gates) ?? EMPTY_GATES;
  return { startFinish: g.startFinish ?? null, sectors: g.sectors ?? [], pitEntry: g.pitEntry ?? null, pitExit: g.pitExit ?? null };
}

async function ownTrack(ctx: TeamContext, id: number): Promise<Track> {
  initModels();
  const row = await Track.findOne({ where: { id, teamId: ctx.teamId } });
  if (!row) throw notFound("Track");
  return row;
}

export async function listTracks(ctx: TeamContext): Promise<TrackListItem[]> {
  initModels();
  const rows = await Track.findAll({ where: { teamId: ctx.teamId }, order: [["name", "ASC"]] });
  // Counts only the sessions the caller may see (a rider: their own and those shared with riders).
  const visible = sessionVisibilitySql(ctx, "s");
  const counts = rows.length
    ? await getSequelize().query<{ trackId: number; n: number }>(
        `SELECT s.track_id AS trackId, COUNT(*) AS n FROM ride_sessions s WHERE ${visible.sql} AND s.track_id IN (?) GROUP BY s.track_id`,
        { replacements: [...visible.replacements, rows.map((r) => r.id)], type: QueryTypes.SELECT },
      )
    : [];
  return rows.map((t) => {
    const g = gatesOf(t);
    return {
      id: t.id,
      name: t.name,
      lengthM: t.lengthM,
      hasStartFinish: !!g.startFinish,
      sectorCount: g.sectors.length,
      cornerCount: jsonColumn<TrackCorner[]>(t.corners)?.length ?? 0,
      pitSpeedLimitKmh: t.pitSpeedLimitKmh,
      sessionCount: Number(counts.find((c) => c.trackId === t.id)?.n ?? 0),
    };
  });
}

/** Ready sessions with GPS and no track yet: the ones a new track can be made from. */
export async function listSessionsWithoutTrack(ctx: TeamContext): Promise<SessionPick[]> {
  return sessionsWithGps(ctx, { trackId: null });
}

async function sessionsWithGps(ctx: TeamContext, where: { trackId: number | null }): Promise<SessionPick[]> {
  initModels();
  const rows = await RideSession.findAll({
    where: { ...(await sessionVisibility(ctx)), status: "ready", trackId: where.trackId === null ? { [Op.is]: null } : where.trackId },
    order: [["startedAt", "DESC"], ["id", "DESC"]],
    limit: 200,
  });
  if (rows.length === 0) return [];
  const withGps = await getSequelize().query<{ sessionId: number }>(
    "SELECT DISTINCT session_id AS sessionId FROM channels WHERE role = 'gps_lat' AND sample_count > 0 AND session_id IN (?)",
    { replacements: [rows.map((r) => r.id)], type: QueryTypes.SELECT },
  );
  const ok = new Set(withGps.map((r) => Number(r.sessionId)));
  return rows.filter((r) => ok.has(r.id)).map((r) => ({ id: r.id, title: r.title ?? `Session ${r.id}`, startedAt: r.startedAt?.toISOString() ?? null }));
}

async function sessionGps(sessionId: number): Promise<{ lat: ArrayLike<number>; lon: ArrayLike<number> }> {
  const { series } = await loadSessionSeries(getSequelize(), sessionId, ["gps_lat", "gps_lon"]);
  const lat = series.channels.gps_lat;
  const lon = series.channels.gps_lon;
  if (!lat || !lon || lat.length === 0) throw new HttpError(422, "This session has no GPS positions to draw a track from.");
  return { lat, lon };
}

/** Thin to ~4 m and cap the point count, so the page stays light even for an hour of 25 Hz fixes. */
function thinTrace(lat: ArrayLike<number>, lon: ArrayLike<number>): [number, number][] {
  return thinFixes(lat, lon, 4, 8000);
}

export async function getTrackEditor(ctx: TeamContext, id: number, sessionId?: number | null): Promise<TrackEditorData> {
  const t = await ownTrack(ctx, id);
  const sessions = await sessionsWithGps(ctx, { trackId: t.id });
  let outline: [number, number][] = jsonColumn<[number, number][]>(t.outline) ?? [];
  let outlineSource: TrackEditorData["outlineSource"] = outline.length > 1 ? "track" : "none";
  let trace: [number, number][] | null = null;
  // A chosen session, or the latest one when the track has no outline of its own yet.
  const chosen = sessionId ? sessions.find((s) => s.id === sessionId) : outlineSource === "none" ? sessions[0] : undefined;
  if (sessionId && !chosen) throw notFound("Session on this track");
  if (chosen) {
    const gps = await sessionGps(chosen.id);
    trace = thinTrace(gps.lat, gps.lon);
    if (outlineSource === "none" || sessionId) {
      const lap = lapOutline(gps.lat, gps.lon);
      if (lap) {
        outline = lap;
        outlineSource = "session";
      }
    }
  }
  return {
    id: t.id,
    name: t.name,
    lengthM: t.lengthM,
    gates: gatesOf(t),
    corners: jsonColumn<TrackCorner[]>(t.corners) ?? [],
    pitSpeedLimitKmh: t.pitSpeedLimitKmh,
    timeZone: t.timeZone ?? null,
    outline,
    outlineSource,
    trace,
    sessionId: chosen?.id ?? null,
    sessions,
  };
}

function outlineFacts(outline: [number, number][]) {
  const d = pathDistances(outline);
  let lat = 0;
  let lon = 0;
  for (const p of outline) {
    lat += p[0];
    lon += p[1];
  }
  return { lengthM: d[d.length - 1] ?? null, centerLat: lat / outline.length, centerLon: lon / outline.length };
}

async function outlineFromSession(ctx: TeamContext, sessionId: number, trackId: number | null): Promise<[number, number][]> {
  initModels();
  const s = await RideSession.findOne({ where: { ...(await sessionVisibility(ctx)), id: sessionId } });
  if (!s) throw notFound("Session");
  if (s.status !== "ready") throw new HttpError(422, `"${s.title ?? `Session ${s.id}`}" is not analysed yet (status: ${s.status}); wait until it is ready.`, { sessionId: "Pick a session that is ready" });
  if (trackId === null && s.trackId !== null) throw new HttpError(409, "This session already belongs to a track.", { sessionId: "Pick a session without a track" });
  if (trackId !== null && s.trackId !== trackId) throw notFound("Session on this track");
  const gps = await sessionGps(s.id);
  const lap = lapOutline(gps.lat, gps.lon);
  if (!lap) throw new HttpError(422, "No closed lap was found in this session's GPS: the path never comes back to where it started.", { sessionId: "This session has no complete lap" });
  return lap;
}

/** A new track, empty or with one lap of a session's GPS as its outline (the session joins it). */
export async function createTrack(ctx: TeamContext, raw: unknown): Promise<{ id: number }> {
  assertCanEditSetup(ctx);
  const input = trackCreateSchema.parse(raw);
  initModels();
  const outline = input.sessionId ? await outlineFromSession(ctx, input.sessionId, null) : null;
  const facts = outline ? outlineFacts(outline) : { lengthM: null, centerLat: null, centerLon: null };
  const t = await Track.create({
    teamId: ctx.teamId, name: input.name, gates: EMPTY_GATES, corners: [], outline, pitSpeedLimitKmh: null, thresholds: null, ...facts,
  });
  if (input.sessionId) await RideSession.update({ trackId: t.id }, { where: { id: input.sessionId, teamId: ctx.teamId } });
  return { id: t.id };
}

export interface SaveTrackResult {
  /** Sessions analysed again with the new gates. */
  reanalysed: number;
}

/** Save gates, corners, pit limit and name; then the track's sessions are analysed again. */
export async function saveTrack(ctx: TeamContext, id: number, raw: unknown): Promise<SaveTrackResult> {
  assertCanEditSetup(ctx);
  const t = await ownTrack(ctx, id);
  const input = trackSaveSchema.parse(raw);
  const outline = input.outlineSessionId ? await outlineFromSession(ctx, input.outlineSessionId, t.id) : jsonColumn<[number, number][]>(t.outline);
  const facts = outline && outline.length > 1 ? outlineFacts(outline) : { lengthM: t.lengthM, centerLat: t.centerLat, centerLon: t.centerLon };
  if (facts.lengthM) {
    // Allow a little over the outline's length: corners are named on a lap that the GPS draws a few metres short or long.
    const limit = facts.lengthM + 50;
    const bad = input.corners.findIndex((c) => c.distanceM > limit);
    if (bad >= 0)
      throw new HttpError(422, "A corner lies beyond the end of the lap.", {
        [`corners.${bad}.distanceM`]: `The lap is ${Math.round(facts.lengthM)} m long; ${input.corners[bad].name} is at ${Math.round(input.corners[bad].distanceM)} m`,
      });
  }
  const corners = [...input.corners].sort((a, b) => a.distanceM - b.distanceM);
  await t.update({ name: input.name, gates: input.gates, corners, pitSpeedLimitKmh: input.pitSpeedLimitKmh, ...(input.timeZone !== undefined ? { timeZone: input.timeZone } : {}), outline: outline ?? null, ...facts });
  const { sessionIds } = await reanalyseTrackSessions(getSequelize(), t.id);
  return { reanalysed: sessionIds.length };
}
