import { isFlyingLap, type Lap } from "./types";

export interface BestSector {
  /** 0-based sector index. */
  sector: number;
  timeMs: number;
  /** Lap.number the best time came from (the first such lap on a tie). */
  lapNumber: number;
}

export interface BestSectorLap {
  /** Sum of the best sectors, ms. */
  timeMs: number;
  sectors: BestSector[];
}

/**
 * Best-sector lap: the sum of the session's best time in each sector, over flying laps only
 * (complete, not out/in/pit-pass/invalid), with the lap each best came from. Null when there is
 * no flying lap or some sector has no time on any flying lap.
 */
export function bestSectorLap(laps: readonly Lap[]): BestSectorLap | null {
  const flying = laps.filter(isFlyingLap);
  const firstLap = flying[0];
  if (!firstLap) return null;
  const count = firstLap.sectorTimesMs.length;
  const sectors: BestSector[] = [];
  let timeMs = 0;
  for (let s = 0; s < count; s++) {
    let best: BestSector | null = null;
    for (const lap of flying) {
      const t = lap.sectorTimesMs[s];
      if (t != null && (best === null || t < best.timeMs)) best = { sector: s, timeMs: t, lapNumber: lap.number };
    }
    if (!best) return null;
    sectors.push(best);
    timeMs += best.timeMs;
  }
  return { timeMs, sectors };
}
