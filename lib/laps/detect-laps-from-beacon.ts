import { defaultMinLapTimeS } from "./default-min-lap-time";
import { dropDoubleCounts } from "./drop-double-counts";
import { splitIntoLaps } from "./split-into-laps";
import type { Lap, NumericArray } from "./types";

export interface DetectLapsFromBeaconOptions {
  /** A sample above this is "beacon seen". Default 0.5 (beacon channels log 0/1). */
  threshold?: number;
  /** Shortest believable lap, s; default as detectLaps (40 % of the median interval, ≥ 10 s). */
  minLapTimeS?: number;
}

/**
 * Laps from a lap_beacon channel instead of GPS: each rising edge (a sample above the threshold
 * after one at or below it) is a line crossing, timed at the first sample above the threshold, so
 * the resolution is one sample period of the channel (10 ms at 100 Hz). NaN samples are skipped.
 * Out-lap before the first edge and in-lap after the last, as detectLaps; a beacon carries no
 * sectors or pit information, so each lap has one sector (the whole lap, null when partial).
 */
export function detectLapsFromBeacon(
  timeS: Float64Array,
  beacon: NumericArray,
  options: DetectLapsFromBeaconOptions = {},
): Lap[] {
  const threshold = options.threshold ?? 0.5;
  const edges: number[] = [];
  let prev = NaN;
  let first = NaN;
  let last = NaN;
  for (let i = 0; i < timeS.length; i++) {
    const v = beacon[i]!;
    if (!Number.isFinite(v)) continue;
    if (Number.isNaN(first)) first = timeS[i]!;
    last = timeS[i]!;
    if (Number.isFinite(prev) && prev <= threshold && v > threshold) edges.push(timeS[i]!);
    prev = v;
  }
  if (edges.length === 0) return [];
  const minLapTimeS = options.minLapTimeS ?? defaultMinLapTimeS(edges);
  const laps = splitIntoLaps(dropDoubleCounts(edges, minLapTimeS), first, last, 1);
  for (const lap of laps) lap.sectorTimesMs[0] = lap.complete ? lap.lapTimeMs : null;
  return laps;
}
