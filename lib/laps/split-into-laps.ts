import type { Lap } from "./types";

/** Partial laps shorter than this (s) at either end of a log are noise, not laps. */
const MIN_PARTIAL_LAP_S = 1;

/**
 * Cuts a log running from `logStartS` to `logEndS` into laps at the line times `lineTimesS`
 * (s, time order, double counts already dropped). The stretch before the first line crossing is
 * an out-lap and the stretch after the last one an in-lap, both partial; the laps between are
 * complete. Sector times are left as one null per sector for the caller to fill.
 */
export function splitIntoLaps(
  lineTimesS: readonly number[],
  logStartS: number,
  logEndS: number,
  sectorCount: number,
): Lap[] {
  const laps: Lap[] = [];
  if (lineTimesS.length === 0) return laps;
  const push = (startTimeS: number, endTimeS: number, complete: boolean, outLap: boolean, inLap: boolean) => {
    laps.push({
      number: laps.length + 1,
      startTimeS,
      endTimeS,
      lapTimeMs: Math.round((endTimeS - startTimeS) * 1000),
      sectorTimesMs: new Array<number | null>(sectorCount).fill(null),
      outLap,
      inLap,
      pitPass: false,
      complete,
    });
  };
  const first = lineTimesS[0]!;
  if (first - logStartS >= MIN_PARTIAL_LAP_S) push(logStartS, first, false, true, false);
  for (let i = 0; i + 1 < lineTimesS.length; i++) push(lineTimesS[i]!, lineTimesS[i + 1]!, true, false, false);
  const last = lineTimesS[lineTimesS.length - 1]!;
  if (logEndS - last >= MIN_PARTIAL_LAP_S) push(last, logEndS, false, false, true);
  return laps;
}
