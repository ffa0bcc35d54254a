import { defaultMinLapTimeS } from "./default-min-lap-time";
import { dropDoubleCounts } from "./drop-double-counts";
import { extractFixes } from "./extract-fixes";
import { findGateCrossings, type FindGateCrossingsOptions } from "./find-gate-crossings";
import { lowerBound } from "./lower-bound";
import { splitIntoLaps } from "./split-into-laps";
import type { Lap, SeriesLike, TrackGates } from "./types";

export interface DetectLapsOptions {
  /** Overrides track.minLapTimeS and the automatic minimum (defaultMinLapTimeS). */
  minLapTimeS?: number;
  /** Passed to findGateCrossings (dropout gap). */
  maxGapS?: FindGateCrossingsOptions["maxGapS"];
}

/**
 * Laps of a session from its GPS fixes (gps_lat/gps_lon channels) and the track's gates.
 *
 * - Lap boundaries are forward crossings of the start/finish gate, interpolated between fixes
 *   (findGateCrossings); a crossing sooner than the minimum lap time after the previous one is a
 *   double count and ignored. Minimum: options.minLapTimeS, else track.minLapTimeS, else 40 % of
 *   the median crossing interval (at least 10 s).
 * - The stretch before the first crossing is an out-lap, after the last an in-lap (both partial).
 * - Pit gates (forward crossings): a lap in which the bike leaves the pit lane before any pit
 *   entry is an out-lap; one in which it enters and does not leave again is an in-lap; one that
 *   enters and leaves again is a pit pass.
 * - Sector boundaries: the first forward crossing of each sector gate, in order, inside the lap.
 */
export function detectLaps(series: SeriesLike, track: TrackGates, options: DetectLapsOptions = {}): Lap[] {
  const fixes = extractFixes(series);
  const n = fixes.timeS.length;
  if (n < 2) return [];
  const opts: FindGateCrossingsOptions = { direction: "forward", maxGapS: options.maxGapS };
  const times = (gate: TrackGates["startFinish"] | undefined): Float64Array => {
    if (!gate) return new Float64Array(0);
    const c = findGateCrossings(fixes, gate, opts);
    return Float64Array.from(c, (x) => x.timeS);
  };

  const raw = times(track.startFinish);
  const minLapTimeS = options.minLapTimeS ?? track.minLapTimeS ?? defaultMinLapTimeS(raw);
  const lineTimesS = dropDoubleCounts(raw, minLapTimeS);
  const sectorCount = track.sectors.length + 1;
  const laps = splitIntoLaps(lineTimesS, fixes.timeS[0]!, fixes.timeS[n - 1]!, sectorCount);
  if (laps.length === 0) return laps;

  const sectorGateTimes = track.sectors.map((g) => times(g));
  const pitEntryS = times(track.pitEntry);
  const pitExitS = times(track.pitExit);

  const onLine = new Set(lineTimesS);
  for (const lap of laps) {
    markPitFlags(lap, pitEntryS, pitExitS);
    fillSectors(lap, sectorGateTimes, onLine.has(lap.startTimeS), onLine.has(lap.endTimeS));
  }
  return laps;
}

/** Walks the pit-gate crossings inside (start, end] of a lap in time order. */
function markPitFlags(lap: Lap, pitEntryS: Float64Array, pitExitS: Float64Array): void {
  let i = lowerBound(pitEntryS, lap.startTimeS);
  let j = lowerBound(pitExitS, lap.startTimeS);
  let inPitLane = false;
  let sawEvent = false;
  for (;;) {
    const te = i < pitEntryS.length && pitEntryS[i]! <= lap.endTimeS ? pitEntryS[i]! : Infinity;
    const tx = j < pitExitS.length && pitExitS[j]! <= lap.endTimeS ? pitExitS[j]! : Infinity;
    if (te === Infinity && tx === Infinity) break;
    if (te <= tx) {
      inPitLane = true;
      i++;
    } else {
      if (inPitLane) lap.pitPass = true;
      else if (!sawEvent) lap.outLap = true; // left the pit lane before entering it in this lap
      inPitLane = false;
      j++;
    }
    sawEvent = true;
  }
  if (inPitLane) lap.inLap = true;
}

/**
 * Sector boundaries: lap start, then the first crossing of sector gate k after boundary k, then
 * the lap end. Times become ms from the lap start, rounded once each, so sectors sum to the lap.
 * A partial lap has no known start (out-lap) or end (in-lap) on the line: that sector stays null.
 */
function fillSectors(lap: Lap, sectorGateTimes: Float64Array[], startsOnLine: boolean, endsOnLine: boolean): void {
  const k = sectorGateTimes.length;
  const boundaryMs = new Float64Array(k + 2);
  boundaryMs[0] = startsOnLine ? 0 : NaN;
  let prevS = lap.startTimeS;
  for (let g = 0; g < k; g++) {
    const ts = sectorGateTimes[g]!;
    // First crossing strictly after the previous boundary (upper bound of prevS).
    let idx = lowerBound(ts, prevS);
    while (idx < ts.length && ts[idx]! <= prevS) idx++;
    if (idx < ts.length && ts[idx]! < lap.endTimeS) {
      prevS = ts[idx]!;
      boundaryMs[g + 1] = Math.round((prevS - lap.startTimeS) * 1000);
    } else {
      boundaryMs[g + 1] = NaN;
    }
  }
  boundaryMs[k + 1] = endsOnLine ? lap.lapTimeMs : NaN;
  for (let s = 0; s <= k; s++) {
    const d = boundaryMs[s + 1]! - boundaryMs[s]!;
    lap.sectorTimesMs[s] = Number.isFinite(d) ? d : null;
  }
}
