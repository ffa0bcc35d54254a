import type { Lap } from "./types";

/** A flying lap longer than this × the session's median flying lap is suspect (Lapbench default). */
export const SUSPECT_LAP_FACTOR = 1.5;

/**
 * Laps that are likely two laps merged: a GPS gap at the line (or a missed beacon) hides one
 * crossing, and the next "flying" lap runs twice as long. Any complete lap (not out, in or pit)
 * longer than 1.5 × the median of those laps is marked `suspect` and so kept out of the best lap
 * and best sectors. Needs at least two such laps to have a median. Returns the laps marked.
 */
export function markSuspectLaps(laps: Lap[], factor = SUSPECT_LAP_FACTOR): Lap[] {
  const candidates = laps.filter((l) => l.complete && !l.outLap && !l.inLap && !l.pitPass);
  if (candidates.length < 2) return [];
  const times = candidates.map((l) => l.lapTimeMs).sort((a, b) => a - b);
  const k = times.length;
  const median = k % 2 ? times[k >> 1]! : 0.5 * (times[(k >> 1) - 1]! + times[k >> 1]!);
  const marked: Lap[] = [];
  for (const l of candidates) {
    if (l.lapTimeMs > factor * median) {
      l.suspect = true;
      marked.push(l);
    }
  }
  return marked;
}
