/**
 * Keeps a line crossing only when it comes at least `minLapTimeS` after the last kept one, so a
 * second crossing moments after the first (GPS jitter, a bike wheeled back over the line) does not
 * start a new lap. Input and output in s, time order.
 */
export function dropDoubleCounts(crossingTimesS: ArrayLike<number>, minLapTimeS: number): number[] {
  const kept: number[] = [];
  let last = -Infinity;
  for (let i = 0; i < crossingTimesS.length; i++) {
    const t = crossingTimesS[i]!;
    if (t - last >= minLapTimeS) {
      kept.push(t);
      last = t;
    }
  }
  return kept;
}
