import "server-only";
/**
 * A session's track on its page: which track it is on, a track refused because the log's GPS lies
 * elsewhere (with the distance), choosing another track, and — for a session on no track — a new
 * track made from its GPS with a suggested start/finish gate (at the lap beacon when the log has
 * one, else in the middle of the longest straight). Confirming the suggestion creates the track
 * and splits the session into laps at once; the gate stays editable in the track editor.
 */
import { initModels, RideSession, Track, type TrackGates } from "@/models";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError, notFound } from "@/lib/http/http-error";
import { lapOutline } from "@/lib/geo/lap-outline";
import { longestStraightGate } from "@/lib/geo/longest-straight-gate";
import { beaconGate } from "@/lib/geo/beacon-gate";
import { pathDistances } from "@/lib/geo/path-distances";
import type { Gate } from "@/lib/geo/types";
import { haversineM } from "@/lib/geo/haversine-m";
import { loadSessionSeries } from "./session-series";
import { getSessionForViewer } from "./session-for-viewer";
import { medianPosition, trackCentre } from "./tracks";
import { heldDuplicate, type DuplicateOf } from "./imports";
import { TRACK_MATCH_MAX_M, type TrackRefusal } from "./session-analysis";
import { reanalyseSession, reanalyseTrackSessions } from "./reanalyse";
import { assertCanEditSetup } from "./setup-access";
import { trackNameSchema } from "./track-editor";

export interface GateSuggestion {
  source: "beacon" | "straight";
  gate: Gate;
  /** Straight length (straight) or beacon pulses used (beacon). */
  straightM: number | null;
  pulses: number | null;
  /** One lap of the session's GPS, [lat, lon], thinned for drawing. */
  outline: [number, number][];
  lengthM: number;
}

export interface SessionTrackPanel {
  trackId: number | null;
  trackName: string | null;
  refused: TrackRefusal | null;
  hasGps: boolean;
  /** The team's tracks, nearest first when the session has GPS (distance from its median position). */
  tracks: { id: number; name: string; distanceM: number | null }[];
  /** For a session on no track with a closed lap in its GPS. */
  suggestion: GateSuggestion | null;
}

/** A held-back duplicate upload (see registerUpload), for the session page. */
export async function getHeldDuplicate(ctx: TeamContext, sessionId: number): Promise<DuplicateOf | null> {
  initModels();
  await getSessionForViewer(ctx, sessionId);
  const row = await RideSession.findOne({ where: { id: sessionId, teamId: ctx.teamId }, attributes: ["status", "summary"] });
  return row ? heldDuplicate(row) : null;
}

async function sessionGpsAndBeacon(sessionId: number) {
  const { series } = await loadSessionSeries(getSequelize(), sessionId, ["gps_lat", "gps_lon", "lap_beacon"]);
  const lat = series.channels.gps_lat;
  const lon = series.channels.gps_lon;
  return { series, lat, lon, beacon: series.channels.lap_beacon, hasGps: !!lat && !!lon && lat.length > 0 };
}

function suggestGate(series: { timeS: ArrayLike<number> }, lat: ArrayLike<number>, lon: ArrayLike<number>, beacon: ArrayLike<number> | undefined): GateSuggestion | null {
  const lap = lapOutline(lat, lon);
  if (!lap) return null;
  const d = pathDistances(lap);
  const lengthM = d[d.length - 1];
  const step = Math.max(1, Math.ceil(lap.length / 600));
  const outline = lap.filter((_, i) => i % step === 0 || i === lap.length - 1);
  // A geometry that yields no usable gate (two points coinciding) is no suggestion, never a broken page.
  const safe = <T,>(f: () => T): T | null => {
    try {
      return f();
    } catch {
      return null;
    }
  };
  const fromBeacon = beacon ? safe(() => beaconGate(series.timeS, beacon, lat, lon)) : null;
  if (fromBeacon) return { source: "beacon", gate: fromBeacon.gate, straightM: null, pulses: fromBeacon.pulses, outline, lengthM };
  const straight = safe(() => longestStraightGate(lap));
  if (!straight) return null;
  return { source: "straight", gate: straight.gate, straightM: straight.straightM, pulses: null, outline, lengthM };
}

/** The session's track panel (engineers and owners act on it; everyone who sees the session may read it). */
export async function getSessionTrackPanel(ctx: TeamContext, sessionId: number): Promise<SessionTrackPanel> {
  initModels();
  const s = await getSessionForViewer(ctx, sessionId);
  const row = await RideSession.findOne({ where: { id: sessionId, teamId: ctx.teamId }, attributes: ["summary", "trackId", "status"] });
  const refused = ((row?.summary as { trackRefused?: TrackRefusal | null } | null)?.trackRefused ?? null) as TrackRefusal | null;
  const { series, lat, lon, beacon, hasGps } = s.status === "ready" ? await sessionGpsAndBeacon(sessionId) : { series: null, lat: undefined, lon: undefined, beacon: undefined, hasGps: false };
  const at = series && hasGps ? medianPosition(series) : null;
  const all = await Track.findAll({ where: { teamId: ctx.teamId }, order: [["name", "ASC"]] });
  const tracks = all
    .map((t) => {
      const c = trackCentre(t);
      return { id: t.id, name: t.name, distanceM: at && c ? Math.round(haversineM(at.lat, at.lon, c.lat, c.lon)) : null };
    })
    .sort((a, b) => (a.distanceM ?? Infinity) - (b.distanceM ?? Infinity) || a.name.localeCompare(b.name));
  const trackId = row?.trackId ?? null;
  const suggestion = trackId == null && series && lat && lon && hasGps ? suggestGate(series, lat, lon, beacon) : null;
  return { trackId, trackName: all.find((t) => t.id === trackId)?.name ?? null, refused: trackId == null ? refused : null, hasGps, tracks, suggestion };
}

/**
 * Put the session on another of the team's tracks (or on none), then analyse it again. A track
 * whose centre lies more than TRACK_MATCH_MAX_M from the log's positions is refused with the distance.
 */
export async function changeSessionTrack(ctx: TeamContext, sessionId: number, trackId: number | null): Promise<{ laps: number }> {
  assertCanEditSetup(ctx);
  initModels();
  const s = await RideSession.findOne({ where: { id: sessionId, teamId: ctx.teamId } });
  if (!s) throw notFound("Session");
  if (s.status !== "ready") throw new HttpError(409, "The session is not analysed yet; choose its track when it is ready.");
  let track: Track | null = null;
  if (trackId != null) {
    track = await Track.findOne({ where: { id: trackId, teamId: ctx.teamId } });
    if (!track) throw new HttpError(422, "That track is not one of your team's.", { trackId: "Choose a track from the list" });
    const { series, hasGps } = await sessionGpsAndBeacon(sessionId);
    const at = hasGps ? medianPosition(series) : null;
    const c = trackCentre(track);
    if (at && c) {
      const d = haversineM(at.lat, at.lon, c.lat, c.lon);
      if (d > TRACK_MATCH_MAX_M)
        throw new HttpError(422, `${track.name} is ${formatKm(d)} from this log's positions; a session is put only on a track within ${formatKm(TRACK_MATCH_MAX_M)} of its GPS.`, {
          trackId: `${formatKm(d)} away`,
        });
    }
  }
  await s.update({ trackId: track?.id ?? null });
  const summary = await reanalyseSession(getSequelize(), sessionId);
  return { laps: summary?.lapCount ?? 0 };
}

/** Confirm the suggested start/finish gate: a new track from the session's GPS with that gate; the session is split into laps at once. */
export async function createTrackWithSuggestedGate(ctx: TeamContext, sessionId: number, rawName: unknown): Promise<{ trackId: number; laps: number }> {
  assertCanEditSetup(ctx);
  const name = trackNameSchema.parse(rawName);
  initModels();
  const s = await RideSession.findOne({ where: { id: sessionId, teamId: ctx.teamId } });
  if (!s) throw notFound("Session");
  if (s.status !== "ready") throw new HttpError(409, "The session is not analysed yet.");
  if (s.trackId != null) throw new HttpError(409, "This session is on a track already; edit that track's gates instead.");
  const { series, lat, lon, beacon, hasGps } = await sessionGpsAndBeacon(sessionId);
  if (!hasGps || !lat || !lon) throw new HttpError(422, "This session has no GPS positions to draw a track from.");
  const lap = lapOutline(lat, lon);
  if (!lap) throw new HttpError(422, "No closed lap was found in this session's GPS: the path never comes back to where it started.");
  const suggestion = suggestGate(series, lat, lon, beacon);
  if (!suggestion) throw new HttpError(422, "No straight long enough for a start/finish gate was found; place the gate by hand in the track editor.");
  const d = pathDistances(lap);
  let cLat = 0;
  let cLon = 0;
  for (const p of lap) {
    cLat += p[0];
    cLon += p[1];
  }
  const gates: TrackGates = { startFinish: suggestion.gate, sectors: [], pitEntry: null, pitExit: null };
  const track = await Track.create({
    teamId: ctx.teamId, name, gates, corners: [], outline: lap, pitSpeedLimitKmh: null, thresholds: null,
    lengthM: d[d.length - 1] ?? null, centerLat: cLat / lap.length, centerLon: cLon / lap.length,
  });
  await s.update({ trackId: track.id });
  await reanalyseTrackSessions(getSequelize(), track.id);
  const after = await RideSession.findByPk(sessionId, { attributes: ["summary"] });
  const laps = (after?.summary as { lapCount?: number } | null)?.lapCount ?? 0;
  return { trackId: track.id, laps };
}

function formatKm(m: number): string {
  return m >= 10_000 ? `${Math.round(m / 1000).toLocaleString("en-GB")} km` : `${(m / 1000).toLocaleString("en-GB", { maximumFractionDigits: 1 })} km`;
}
