/**
 * What the Drive slip, Suspension use, Gears and Rider brief computations start from: a
 * session's samples, its laps, bike and track, reshaped once (laps' distances, best lap,
 * corners). Pure: the page's data function builds it from the stored chunks and rows, ingest
 * from the parsed samples and the rows it has just written — the same function both ways, so the
 * stored results equal what a page would compute.
 */
import { createHash } from "node:crypto";
import type { ChannelRole, SessionSeries } from "@/lib/channels/roles";
import type { Lap, SeriesLike, TrackGates } from "@/lib/laps/types";
import { isFlyingLap } from "@/lib/laps/types";
import { detectLaps } from "@/lib/laps/detect-laps";
import { distanceChannel, type DistanceChannel } from "@/lib/laps/distance-channel";
import { lowerBound } from "@/lib/laps/lower-bound";
import { findCorners } from "@/lib/braking/find-corners";
import { checkWheelSensor } from "@/lib/laps/live-wheel-speed";

export interface LapInfo {
  number: number;
  lapTimeMs: number;
  flying: boolean;
  best: boolean;
  startTimeS: number;
  endTimeS: number;
}

export interface BikeInfo {
  id: number;
  name: string;
  wheelCircRearMm: number | null;
  wheelCircFrontMm?: number | null;
  primaryRatio: number | null;
  gearboxRatios: number[] | null;
  sprocketFront: number | null;
  sprocketRear: number | null;
  forkStrokeMm: number | null;
  shockStrokeMm: number | null;
  /** Rear tyre crown radius. */
  tyreCrownRadiusMm: number | null;
  tyreCrownRadiusFrontMm?: number | null;
  thresholds: Record<string, number>;
}

/** The session's rows as the analysis reads them (no samples): what the stored results depend on. */
export interface AnalysisInputs {
  sessionId: number;
  title: string;
  /** The stored laps, in number order. */
  laps: Lap[];
  /** The track's gates, used only when no laps are stored. */
  gates: TrackGates | null;
  bike: BikeInfo | null;
  trackThresholds: Record<string, number>;
  /** The track's named corners (null or empty: found on the best lap). */
  namedCorners: { name: string; distanceM: number }[] | null;
}

export interface AnalysisBase {
  sessionId: number;
  title: string;
  series: SessionSeries;
  laps: Lap[];
  lapInfo: LapInfo[];
  dist: DistanceChannel;
  bestLap: Lap | null;
  bike: BikeInfo | null;
  trackThresholds: Record<string, number>;
  /** Corners: the track's named corners, else found on the best lap's speed trace. */
  corners: { name: string; distanceM: number }[];
  cornerSource: "track" | "found" | "none";
}

/** Distance and laps always need the wheel speed and GPS (loadAnalysisBase reads them for every page). */
export const BASE_ROLES: readonly ChannelRole[] = ["speed_front", "gps_speed", "gps_lat", "gps_lon"];

/** The channels each page reads, as its data function asks for them. */
export const PAGE_ROLES = {
  slip: ["speed_front", "speed_rear", "throttle", "lean_angle"],
  suspension: ["fork_travel", "shock_travel", "lean_angle"],
  gears: ["gear", "engine_rpm", "speed_rear", "throttle"],
  brief: ["speed_front", "gps_speed", "brake_front", "gps_lat", "gps_lon"],
} as const satisfies Record<string, readonly ChannelRole[]>;

/** The roles a page's series holds: its own and BASE_ROLES. */
export function pageRoles(roles: readonly ChannelRole[]): ChannelRole[] {
  return [...new Set<ChannelRole>([...roles, ...BASE_ROLES])];
}

/**
 * A series cut to the channels a page reads. The page functions fall back from one channel to
 * another (ground speed: front wheel, GPS, rear wheel), so a precomputed result must see exactly
 * the channels the page would have loaded.
 */
export function seriesView(series: SeriesLike, roles: readonly ChannelRole[]): SessionSeries {
  const channels: Record<string, SeriesLike["channels"][keyof SeriesLike["channels"]]> = {};
  for (const r of pageRoles(roles)) {
    const c = series.channels[r as keyof SeriesLike["channels"]];
    if (c) channels[r] = c;
  }
  return { timeS: series.timeS, channels: channels as SessionSeries["channels"] };
}

/** Sample index range [from, to) of a lap on the master clock. */
export function lapRange(timeS: Float64Array, lap: { startTimeS: number; endTimeS: number }): [number, number] {
  return [lowerBound(timeS, lap.startTimeS), lowerBound(timeS, lap.endTimeS)];
}

/** Distance from the lap's start for samples [from, to). */
export function lapDistance(base: Pick<AnalysisBase, "dist">, lapIdx: number, from: number, to: number): Float64Array {
  const off = base.dist.lapStartDistanceM[lapIdx]!;
  const out = new Float64Array(to - from);
  for (let i = from; i < to; i++) out[i - from] = base.dist.distanceM[i]! - off;
  return out;
}

/** Ground speed for the pages: front wheel, GPS, rear wheel — skipping a wheel sensor that reads nothing while the bike moves. */
export function groundSpeed(series: SeriesLike) {
  const c = series.channels;
  if (c.speed_front && !checkWheelSensor(series, "speed_front")?.dead) return c.speed_front;
  return c.gps_speed ?? (c.speed_rear && !checkWheelSensor(series, "speed_rear")?.dead ? c.speed_rear : undefined);
}

/** The best flying lap (shortest time; the first of equals). */
export function bestLapOf(laps: readonly Lap[]): Lap | null {
  let bestLap: Lap | null = null;
  for (const l of laps) if (isFlyingLap(l) && (!bestLap || l.lapTimeMs < bestLap.lapTimeMs)) bestLap = l;
  return bestLap;
}

export function lapInfoOf(laps: readonly Lap[], bestLap: Lap | null): LapInfo[] {
  return laps.map((l) => ({ number: l.number, lapTimeMs: l.lapTimeMs, flying: isFlyingLap(l), best: l === bestLap, startTimeS: l.startTimeS, endTimeS: l.endTimeS }));
}

/**
 * `shared`: a base built from the same inputs on another view of the same samples, whose laps and
 * distance are taken over instead of computed again (detectLaps and distanceChannel read only
 * BASE_ROLES, which every view holds; ingest builds four views of a session).
 */
export function buildAnalysisBase(inputs: AnalysisInputs, series: SessionSeries, shared?: AnalysisBase): AnalysisBase {
  let laps = inputs.laps;
  // Laps are stored at ingest; a session read before that (or with no track then) gets them
  // from the track's gates here, without storing.
  if (shared) laps = shared.laps;
  else if (laps.length === 0 && inputs.gates) laps = detectLaps(series, inputs.gates);
  const dist = shared ? shared.dist : distanceChannel(series, laps);
  const bestLap = bestLapOf(laps);
  const lapInfo = lapInfoOf(laps, bestLap);

  let corners: { name: string; distanceM: number }[] = [];
  let cornerSource: AnalysisBase["cornerSource"] = "none";
  const named = inputs.namedCorners;
  if (named && named.length) {
    corners = named.filter((c) => Number.isFinite(c.distanceM)).map((c) => ({ name: c.name, distanceM: c.distanceM }));
    cornerSource = "track";
  } else if (bestLap) {
    const v = groundSpeed(series);
    if (v) {
      const idx = laps.indexOf(bestLap);
      const [from, to] = lapRange(series.timeS, bestLap);
      corners = findCorners(v.subarray(from, to), lapDistance({ dist }, idx, from, to)).map((c) => ({ name: c.name, distanceM: c.distanceM }));
      cornerSource = corners.length ? "found" : "none";
    }
  }
  return { sessionId: inputs.sessionId, title: inputs.title, series, laps, lapInfo, dist, bestLap, bike: inputs.bike, trackThresholds: inputs.trackThresholds, corners, cornerSource };
}

/**
 * Bump when a page computation changes what it returns: every stored part then reads as stale
 * and is recomputed on request until the session is analysed again.
 */
export const STORED_ANALYSIS_VERSION = 3;

/**
 * A hash of everything besides the samples that the page results depend on: the laps (a lap
 * marked invalid changes the best lap, hence the corners and the brief), the bike's settings
 * (targets, strokes, ratios), the track's thresholds, corners and gates. The title is not in it:
 * the pages take it from the session row as it is now.
 */
export function analysisBasis(inputs: AnalysisInputs): string {
  const { laps, gates, bike, trackThresholds, namedCorners } = inputs;
  const text = JSON.stringify({ v: STORED_ANALYSIS_VERSION, laps, gates: laps.length ? null : gates, bike, trackThresholds, namedCorners });
  return createHash("sha1").update(text).digest("hex");
}
