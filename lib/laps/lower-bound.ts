/** First index i with sorted[i] >= value (sorted ascending); sorted.length when none. Binary search. */
export function lowerBound(sorted: ArrayLike<number>, value: number, from = 0, to = sorted.length): number {
  let lo = from;
  let hi = to;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid]! < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
