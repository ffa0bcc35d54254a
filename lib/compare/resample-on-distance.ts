export interface DistanceResample {
  /** Grid: 0, step, 2·step, … up to the lap's last distance, m. */
  distanceM: Float64Array;
  /** Time since the lap's first sample at each grid distance, s (first time the distance is reached). */
  timeS: Float64Array;
  /** The channel at each grid distance (same unit as given); NaN where it cannot be interpolated. */
  values: Float64Array;
}

/**
 * Resamples one lap from time onto a common distance grid (`gridStepM`, default 1 m) by linear
 * interpolation. `lapDistanceM` is distance from the lap start (non-decreasing; a stopped bike
 * repeats a distance, and the grid then takes the first time it is reached). `values` is
 * NaN-aware: a grid point takes the line between the nearest finite samples either side of it,
 * so a channel slower than the clock (NaN between its samples) resamples cleanly; no finite
 * sample on one side gives NaN. Grid points before the first sample's distance are NaN.
 * One pass: grid and samples both ascend, so pointers walk forward, no search per point.
 */
export function resampleOnDistance(
  lapTimeS: ArrayLike<number>,
  lapDistanceM: ArrayLike<number>,
  values: ArrayLike<number> | null = null,
  gridStepM = 1,
): DistanceResample {
  if (!(gridStepM > 0)) throw new RangeError("gridStepM must be > 0");
  const n = Math.min(lapTimeS.length, lapDistanceM.length);
  const dEnd = n > 0 ? lapDistanceM[n - 1] : NaN;
  // Tolerance so a lap of exactly 4000 m still gets its 4000 m grid point despite rounding.
  const m = n > 0 && dEnd >= 0 ? Math.floor(dEnd / gridStepM + 1e-9) + 1 : 0;
  const distanceM = new Float64Array(m);
  const timeS = new Float64Array(m);
  const out = new Float64Array(m);
  const t0 = n > 0 ? lapTimeS[0] : 0;

  let k = 0; // first sample with distance >= grid point
  let lastFinite = -1; // last sample index < k with a finite value
  let nextFinite = -1; // first sample index >= k with a finite value (cached)
  for (let g = 0; g < m; g++) {
    const d = g * gridStepM;
    distanceM[g] = d;
    while (k < n && lapDistanceM[k] < d) {
      if (values && Number.isFinite(values[k])) lastFinite = k;
      k++;
    }
    if (k >= n) {
      timeS[g] = NaN;
      out[g] = NaN;
      continue;
    }
    const dk = lapDistanceM[k];
    if (k === 0) {
      timeS[g] = dk === d ? lapTimeS[0] - t0 : NaN;
    } else {
      const d0 = lapDistanceM[k - 1];
      timeS[g] = lapTimeS[k - 1] - t0 + ((lapTimeS[k] - lapTimeS[k - 1]) * (d - d0)) / (dk - d0);
    }
    if (!values) {
      out[g] = NaN;
      continue;
    }
    if (nextFinite < k) {
      nextFinite = k;
      while (nextFinite < n && !Number.isFinite(values[nextFinite])) nextFinite++;
    }
    if (nextFinite >= n) {
      out[g] = NaN;
    } else if (lapDistanceM[nextFinite] === d) {
      out[g] = values[nextFinite];
    } else if (lastFinite < 0) {
      out[g] = NaN;
    } else {
      const da = lapDistanceM[lastFinite];
      const db = lapDistanceM[nextFinite];
      const va = values[lastFinite];
      out[g] = db === da ? va : va + ((values[nextFinite] - va) * (d - da)) / (db - da);
    }
  }
  return { distanceM, timeS, values: out };
}
