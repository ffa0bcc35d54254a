/** Floor for the automatic minimum, s: no circuit lap is shorter (common practice, kart tracks included). */
export const MIN_LAP_TIME_FLOOR_S = 10;
/** Share of the median line-to-line interval taken as the shortest believable lap (ours). */
export const MIN_LAP_TIME_MEDIAN_SHARE = 0.4;

/**
 * Automatic minimum lap time from raw line crossings (s, time order): 40 % of the median interval
 * between consecutive crossings, never below 10 s. A double count (GPS jitter at the line, a bike
 * pushed back over it) gives an interval far below the median, so it falls under the minimum,
 * while a genuinely fast lap stays well above 40 % of a typical one. With fewer than two
 * crossings there is no interval and the floor is returned.
 */
export function defaultMinLapTimeS(crossingTimesS: ArrayLike<number>): number {
  const n = crossingTimesS.length - 1;
  if (n < 1) return MIN_LAP_TIME_FLOOR_S;
  const d = new Float64Array(n);
  for (let i = 0; i < n; i++) d[i] = crossingTimesS[i + 1]! - crossingTimesS[i]!;
  d.sort();
  const median = n % 2 === 1 ? d[(n - 1) / 2]! : 0.5 * (d[n / 2 - 1]! + d[n / 2]!);
  return Math.max(MIN_LAP_TIME_FLOOR_S, MIN_LAP_TIME_MEDIAN_SHARE * median);
}
