import { DECIMATE_RATIO } from "./decimate-min-max";

/**
 * Pixel column of every grid point for a min/max decimation to `pixelWidth` columns, or null when
 * the grid has fewer than DECIMATE_RATIO points per column (then nothing is decimated). Columns
 * split the grid's x span evenly, as decimateMinMax does. Computed once per request and shared
 * by every series on that grid.
 */
export function gridColumns(grid: ArrayLike<number>, pixelWidth: number): Int32Array | null {
  const m = grid.length;
  const width = Math.floor(pixelWidth);
  if (width < 1 || m < DECIMATE_RATIO * width) return null;
  const x0 = grid[0];
  const span = grid[m - 1] - x0;
  const perX = span > 0 ? width / span : 0;
  const cols = new Int32Array(m);
  for (let g = 0; g < m; g++) cols[g] = Math.min(width - 1, Math.floor((grid[g] - x0) * perX));
  return cols;
}

/**
 * Resample one series onto an ascending grid and, in the same pass, mark the grid points a
 * min/max decimation keeps.
 *
 * Resampling is resampleOnDistance's: `xs` is the series' own x at each sample (non-decreasing:
 * distance from the lap start, or time); a grid point takes the line between the nearest finite
 * samples either side of it (NaN-aware, so a channel slower than the clock resamples cleanly), the
 * first sample at exactly that x when there is one, and NaN before the first or after the last
 * sample. Pointers walk forward over grid and samples together: no search per point.
 *
 * Decimation is decimateMinMax's, per pixel column of `cols` (gridColumns): the first and last
 * grid points and, in each column, the point of the lowest and of the highest value and the
 * first NaN. They are marked in `keep` (1 = keep), so several series on one grid keep the union
 * of their points and still share one x column. With `cols` null nothing is marked.
 *
 * Writes `out[g]` for every grid point; returns `out`.
 */
export function resampleDecimate(
  grid: ArrayLike<number>,
  xs: ArrayLike<number>,
  values: ArrayLike<number>,
  out: Float64Array,
  cols: Int32Array | null = null,
  keep: Uint8Array | null = null,
): Float64Array {
  const m = grid.length;
  const n = Math.min(xs.length, values.length);
  let k = 0; // first sample with x >= grid point
  let lastFinite = -1; // last sample index < k with a finite value
  let nextFinite = -1; // first sample index >= k with a finite value (cached)
  const marking = cols != null && keep != null && m > 0;
  let col = -1;
  let minG = -1;
  let maxG = -1;
  let nanG = -1;
  let minV = 0;
  let maxV = 0;
  const last = m - 1;
  for (let g = 0; g < m; g++) {
    const d = grid[g];
    while (k < n && xs[k] < d) {
      if (Number.isFinite(values[k])) lastFinite = k;
      k++;
    }
    let v = NaN;
    if (k < n) {
      if (nextFinite < k) {
        nextFinite = k;
        while (nextFinite < n && !Number.isFinite(values[nextFinite])) nextFinite++;
      }
      if (nextFinite < n) {
        if (xs[nextFinite] === d) v = values[nextFinite];
        else if (lastFinite >= 0) {
          const da = xs[lastFinite];
          const db = xs[nextFinite];
          const va = values[lastFinite];
          v = db === da ? va : va + ((values[nextFinite] - va) * (d - da)) / (db - da);
        }
      }
    }
    out[g] = v;
    if (!marking || g === 0 || g === last) continue;
    const c = cols![g];
    if (c !== col) {
      if (minG >= 0) keep![minG] = 1;
      if (maxG >= 0) keep![maxG] = 1;
      if (nanG >= 0) keep![nanG] = 1;
      col = c;
      minG = maxG = nanG = -1;
    }
    if (v !== v) {
      if (nanG < 0) nanG = g;
    } else {
      if (minG < 0 || v < minV) { minG = g; minV = v; }
      if (maxG < 0 || v > maxV) { maxG = g; maxV = v; }
    }
  }
  if (marking) {
    if (minG >= 0) keep![minG] = 1;
    if (maxG >= 0) keep![maxG] = 1;
    if (nanG >= 0) keep![nanG] = 1;
    keep![0] = 1;
    keep![last] = 1;
  }
  return out;
}

/** The decimation half alone, for a series already on the grid (the Running gap). */
export function markMinMax(values: ArrayLike<number>, cols: Int32Array, keep: Uint8Array): void {
  const m = Math.min(values.length, cols.length);
  if (m === 0) return;
  let col = -1;
  let minG = -1;
  let maxG = -1;
  let nanG = -1;
  const flush = () => {
    if (minG >= 0) keep[minG] = 1;
    if (maxG >= 0) keep[maxG] = 1;
    if (nanG >= 0) keep[nanG] = 1;
  };
  for (let g = 1; g < m - 1; g++) {
    if (cols[g] !== col) {
      flush();
      col = cols[g];
      minG = maxG = nanG = -1;
    }
    const v = values[g];
    if (v !== v) {
      if (nanG < 0) nanG = g;
    } else {
      if (minG < 0 || v < values[minG]) minG = g;
      if (maxG < 0 || v > values[maxG]) maxG = g;
    }
  }
  flush();
  keep[0] = 1;
  keep[m - 1] = 1;
}

/** Grid indices marked in `keep`, ascending. */
export function keptIndices(keep: Uint8Array): Uint32Array {
  let count = 0;
  for (let g = 0; g < keep.length; g++) count += keep[g];
  const idx = new Uint32Array(count);
  for (let g = 0, o = 0; g < keep.length; g++) if (keep[g]) idx[o++] = g;
  return idx;
}

/** `values` at the given indices as Float32 (what the series API sends). */
export function gather(values: ArrayLike<number>, idx: Uint32Array | null): Float32Array {
  if (!idx) return new Float32Array(values);
  const out = new Float32Array(idx.length);
  for (let i = 0; i < idx.length; i++) out[i] = values[idx[i]];
  return out;
}
