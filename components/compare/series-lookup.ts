/** Small helpers over ascending typed x columns (binary search; no allocation). */

/** Index of the sample nearest to x in ascending xs, or -1 when xs is empty. */
export function nearestIndex(xs: ArrayLike<number>, x: number): number {
  const n = xs.length;
  if (n === 0) return -1;
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (xs[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  if (lo === 0) return 0;
  if (lo >= n) return n - 1;
  return x - xs[lo - 1] <= xs[lo] - x ? lo - 1 : lo;
}

/** Linear interpolation of ys at x over ascending xs (NaN outside). */
export function interpolateAt(xs: ArrayLike<number>, ys: ArrayLike<number>, x: number): number {
  const n = xs.length;
  if (n === 0 || x < xs[0] || x > xs[n - 1]) return NaN;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >>> 1;
    if (xs[mid] <= x) lo = mid;
    else hi = mid;
  }
  const x0 = xs[lo];
  const x1 = xs[hi];
  return x1 === x0 ? ys[lo] : ys[lo] + ((ys[hi] - ys[lo]) * (x - x0)) / (x1 - x0);
}
