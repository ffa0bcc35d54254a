import type { Gate } from "@/lib/geo/types";
import type { TrackGates } from "./types";

/**
 * Average lap speed no circuit lap reaches, m/s (324 km/h; the fastest circuit laps average well
 * under 260 km/h — common practice). Track length over this is a lap time no real lap beats, so a
 * start/finish crossing sooner than that is a double count.
 */
export const MAX_LAP_AVERAGE_MPS = 90;

interface StoredGate {
  a?: { lat?: unknown; lon?: unknown } | null;
  b?: { lat?: unknown; lon?: unknown } | null;
}
interface StoredGates {
  startFinish?: StoredGate | null;
  sectors?: (StoredGate | null)[] | null;
  pitEntry?: StoredGate | null;
  pitExit?: StoredGate | null;
}

/** A JSON column as it arrives: parsed already, or text (some MariaDB versions), or null. */
function parsed<T>(v: unknown): T | null {
  if (v == null) return null;
  if (typeof v !== "string") return v as T;
  try {
    return JSON.parse(v) as T;
  } catch {
    return null;
  }
}

const finite = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);

function gateOf(g: StoredGate | null | undefined): Gate | undefined {
  if (!g?.a || !g.b) return undefined;
  const { a, b } = g;
  return finite(a.lat) && finite(a.lon) && finite(b.lat) && finite(b.lon) ? { a: { lat: a.lat, lon: a.lon }, b: { lat: b.lat, lon: b.lon } } : undefined;
}

/**
 * The one way a track's stored gates become the TrackGates that lap detection takes — at ingest,
 * at re-analysis and in the page analyses' fallback for a session without stored laps, so all
 * three find the same laps. Null without a usable start/finish gate; gates with a missing or
 * non-finite end are dropped. Minimum lap time: the track's `minLapTimeS` threshold when set,
 * else its length at MAX_LAP_AVERAGE_MPS, else left to detectLaps (40 % of the median crossing
 * interval).
 */
export function trackGatesForAnalysis(track: { gates: unknown; lengthM: number | null; thresholds: unknown }): TrackGates | null {
  const g = parsed<StoredGates>(track.gates);
  const startFinish = gateOf(g?.startFinish);
  if (!g || !startFinish) return null;
  const sectors = (g.sectors ?? []).map(gateOf).filter((x): x is Gate => x !== undefined);
  const set = parsed<{ minLapTimeS?: unknown }>(track.thresholds)?.minLapTimeS;
  const minLapTimeS = finite(set) && set > 0 ? set : track.lengthM && track.lengthM > 0 ? track.lengthM / MAX_LAP_AVERAGE_MPS : undefined;
  return { startFinish, sectors, pitEntry: gateOf(g.pitEntry), pitExit: gateOf(g.pitExit), ...(minLapTimeS ? { minLapTimeS } : {}) };
}
