export interface Decimated {
  x: Float64Array;
  y: Float64Array;
}

/** Decimate only when points outnumber pixel columns at least this many times (as uPlot does). */
export const DECIMATE_RATIO = 4;

/**
 * Min/max decimation per pixel column for drawing a long series at `pixelWidth` columns: keeps
 * the first and last point and, in each column, the point with the lowest y and the one with the
 * highest y (in their original order), plus the column's first NaN so gaps in the line survive.
 * The drawn envelope is identical to drawing every point. `x` must ascend.
 * Below DECIMATE_RATIO points per column the input is returned as copies.
 * Output length ≤ 3·pixelWidth + 2.
 */
export function decimateMinMax(x: ArrayLike<number>, y: ArrayLike<number>, pixelWidth: number): Decimated {
  const n = Math.min(x.length, y.length);
  const width = Math.floor(pixelWidth);
  if (width < 1 || n < DECIMATE_RATIO * width) {
    return { x: Float64Array.from({ length: n }, (_, i) => x[i]), y: Float64Array.from({ length: n }, (_, i) => y[i]) };
  }
  const ox = new Float64Array(3 * width + 2);
  const oy = new Float64Array(3 * width + 2);
  let o = 0;
  const emit = (i: number) => {
    ox[o] = x[i];
    oy[o] = y[i];
    o++;
  };
  const x0 = x[0];
  const span = x[n - 1] - x0;
  const perX = span > 0 ? width / span : 0;

  emit(0);
  let i = 1;
  const last = n - 1;
  while (i < last) {
    const col = Math.min(width - 1, Math.floor((x[i] - x0) * perX));
    let minI = -1;
    let maxI = -1;
    let nanI = -1;
    // Consume the column's points (x ascends, so they are contiguous).
    while (i < last && Math.min(width - 1, Math.floor((x[i] - x0) * perX)) === col) {
      const v = y[i];
      if (Number.isNaN(v)) {
        if (nanI < 0) nanI = i;
      } else {
        if (minI < 0 || v < y[minI]) minI = i;
        if (maxI < 0 || v > y[maxI]) maxI = i;
      }
      i++;
    }
    // Emit the up-to-three kept indices in ascending order (−1 = none), without allocating.
    let a = minI;
    let b = maxI === minI ? -1 : maxI;
    let c = nanI;
    let tmp: number;
    if (a > b) { tmp = a; a = b; b = tmp; }
    if (b > c) { tmp = b; b = c; c = tmp; }
    if (a > b) { tmp = a; a = b; b = tmp; }
    if (a >= 0) emit(a);
    if (b >= 0) emit(b);
    if (c >= 0) emit(c);
  }
  emit(last);
  return { x: ox.slice(0, o), y: oy.slice(0, o) };
}
