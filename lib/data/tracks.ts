/**
 * Tracks on the server side: the model's gates in the shape lib/laps takes, the track a session
 * was ridden on (nearest of the team's tracks), and creating a track from a full description.
 * Tracks belong to a team; nothing here reads another team's tracks.
 */
import type { Sequelize, Transaction } from "sequelize";
import { initModels, Track, type TrackCorner, type TrackGates as ModelTrackGates } from "@/models";
import type { SeriesLike } from "@/lib/laps/types";
import { haversineM } from "@/lib/geo/haversine-m";

/** How far a session's median position may lie from a track's centre for the track to be guessed, m. */
export const GUESS_TRACK_MAX_M = 5000;

// Stored gates → lap-detection gates: one definition, shared with ingest and the page analyses.
export { trackGatesForAnalysis } from "@/lib/laps/track-gates-for-analysis";

/** Median latitude and longitude of the session's GPS fixes (about 2 000 fixes, evenly spread, are plenty). */
export function medianPosition(series: SeriesLike): { lat: number; lon: number } | null {
  const lat = series.channels.gps_lat;
  const lon = series.channels.gps_lon;
  if (!lat || !lon) return null;
  const n = series.timeS.length;
  const stride = Math.max(1, Math.floor(n / 2000));
  const las = new Float64Array(Math.ceil(n / stride));
  const los = new Float64Array(las.length);
  let m = 0;
  for (let i = 0; i < n; i += stride) {
    // Fixes sit between NaNs on a fast clock: take the first fix in each stride.
    for (let k = i; k < n && k < i + stride; k++) {
      if (Number.isFinite(lat[k]) && Number.isFinite(lon[k])) {
        las[m] = lat[k];
        los[m++] = lon[k];
        break;
      }
    }
  }
  if (m === 0) return null;
  const med = (xs: Float64Array) => {
    const s = xs.subarray(0, m).sort();
    const h = m >> 1;
    return m % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
  };
  return { lat: med(las), lon: med(los) };
}

/** Where a track is: its stored centre, else the middle of its start/finish gate, else its outline's mean. */
export function trackCentre(track: Pick<Track, "centerLat" | "centerLon" | "gates" | "outline">): { lat: number; lon: number } | null {
  if (track.centerLat != null && track.centerLon != null) return { lat: track.centerLat, lon: track.centerLon };
  const sf = track.gates?.startFinish;
  if (sf) return { lat: (sf.a.lat + sf.b.lat) / 2, lon: (sf.a.lon + sf.b.lon) / 2 };
  const o = track.outline;
  if (o?.length) return { lat: o.reduce((s, p) => s + p[0], 0) / o.length, lon: o.reduce((s, p) => s + p[1], 0) / o.length };
  return null;
}

/** The team's track nearest to the session's median GPS position, within GUESS_TRACK_MAX_M; else null. */
export async function guessTrack(
  sequelize: Sequelize,
  teamId: string,
  series: SeriesLike,
  opts: { transaction?: Transaction; maxDistanceM?: number } = {},
): Promise<Track | null> {
  initModels(sequelize);
  const at = medianPosition(series);
  if (!at) return null;
  const tracks = await Track.findAll({ where: { teamId }, transaction: opts.transaction });
  let best: Track | null = null;
  let bestM = opts.maxDistanceM ?? GUESS_TRACK_MAX_M;
  for (const t of tracks) {
    const c = trackCentre(t);
    if (!c) continue;
    const d = haversineM(at.lat, at.lon, c.lat, c.lon);
    if (d <= bestM) {
      best = t;
      bestM = d;
    }
  }
  return best;
}

export interface TrackInput {
  name: string;
  gates: ModelTrackGates;
  corners: TrackCorner[];
  /** [lat, lon] pairs along the centreline. */
  outline: [number, number][];
  lengthM: number | null;
  pitSpeedLimitKmh: number | null;
  thresholds?: Record<string, number> | null;
}

/** The team's track of this name, created from the description when it does not exist yet. */
export async function ensureTrack(sequelize: Sequelize, teamId: string, input: TrackInput): Promise<{ track: Track; created: boolean }> {
  initModels(sequelize);
  const found = await Track.findOne({ where: { teamId, name: input.name } });
  if (found) return { track: found, created: false };
  const o = input.outline;
  const centre = o.length
    ? { lat: (Math.min(...o.map((p) => p[0])) + Math.max(...o.map((p) => p[0]))) / 2, lon: (Math.min(...o.map((p) => p[1])) + Math.max(...o.map((p) => p[1]))) / 2 }
    : null;
  const track = await Track.create({
    teamId,
    name: input.name,
    centerLat: centre?.lat ?? null,
    centerLon: centre?.lon ?? null,
    lengthM: input.lengthM,
    gates: input.gates,
    corners: input.corners,
    outline: input.outline,
    pitSpeedLimitKmh: input.pitSpeedLimitKmh,
    thresholds: input.thresholds ?? null,
  });
  return { track, created: true };
}
