/**
 * The figures a season record keeps of one session: the best lap, the mean of the best three
 * flying laps and the top speed. Flying laps are those of isFlyingLap, the rule the session pages
 * use: complete timed laps that are neither out-lap, in-lap, pit-lane pass, invalid nor suspect —
 * the usual reading of a timing sheet (common practice).
 */
import { isFlyingLap } from "../laps/types";
import { storedLapState } from "../laps/stored-lap-state";

export interface RecordLap {
  number: number;
  lapTimeMs: number;
  isOutLap: boolean;
  isInLap: boolean;
  isInvalid: boolean;
  pitPass: boolean;
  topSpeedMps: number | null;
  sectorTimesMs?: number[] | null;
  /** From the row's stats (storedLapState); absent on rows written before they were kept. */
  complete?: boolean;
  suspect?: boolean;
}

export interface LapFigures {
  flyingLapCount: number;
  bestLapMs: number | null;
  bestLapNumber: number | null;
  /** Mean of the three quickest flying laps; null with fewer than three. */
  bestThreeMeanMs: number | null;
  /** Highest lap top speed over every lap of the session (m/s); null when none was recorded. */
  topSpeedMps: number | null;
  /** Quickest time of each sector over the flying laps (ms), when the track has sector gates. */
  bestSectorsMs: number[] | null;
}

export function lapFigures(laps: readonly RecordLap[]): LapFigures {
  const flying = laps.filter((l) => {
    const { complete, suspect } = storedLapState(l, l.isOutLap, l.isInLap);
    const flyingLap = isFlyingLap({ complete, suspect, outLap: l.isOutLap, inLap: l.isInLap, pitPass: l.pitPass, invalid: l.isInvalid });
    return flyingLap && Number.isFinite(l.lapTimeMs) && l.lapTimeMs > 0;
  });
  const sorted = [...flying].sort((a, b) => a.lapTimeMs - b.lapTimeMs || a.number - b.number);
  let top: number | null = null;
  for (const l of laps) if (l.topSpeedMps != null && Number.isFinite(l.topSpeedMps) && (top === null || l.topSpeedMps > top)) top = l.topSpeedMps;
  const best = sorted[0] ?? null;
  return {
    flyingLapCount: flying.length,
    bestLapMs: best?.lapTimeMs ?? null,
    bestLapNumber: best?.number ?? null,
    bestThreeMeanMs: sorted.length >= 3 ? (sorted[0]!.lapTimeMs + sorted[1]!.lapTimeMs + sorted[2]!.lapTimeMs) / 3 : null,
    topSpeedMps: top,
    bestSectorsMs: bestSectors(flying),
  };
}

function bestSectors(flying: readonly RecordLap[]): number[] | null {
  let out: number[] | null = null;
  for (const l of flying) {
    const s = l.sectorTimesMs;
    if (!s || s.length === 0) continue;
    out ??= s.map(() => Infinity);
    for (let i = 0; i < Math.min(out.length, s.length); i++) if (Number.isFinite(s[i]!) && s[i]! > 0 && s[i]! < out[i]!) out[i] = s[i]!;
  }
  return out && out.every(Number.isFinite) ? out : null;
}
