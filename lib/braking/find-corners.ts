export interface FindCornersOptions {
  /**
   * A speed minimum is a corner when it is at least this much below the lower of the two
   * highest speeds either side before a slower point (its prominence), m/s. Default 5 m/s
   * (18 km/h) — Lapbench's setting: enough to skip a lift on a straight, not a fast kink.
   */
  minProminenceMps?: number;
  /** Two minima closer than this along the lap are one corner, the slower kept (m). Default 40. */
  minSeparationM?: number;
  /**
   * The apex is the middle of the stretch around the minimum that stays within this of the
   * minimum speed (m/s): a constant-radius arc at the grip limit is a plateau of speed, and
   * sensor noise puts the single lowest sample anywhere on it. Default 0.5 m/s.
   */
  apexBandMps?: number;
}

export interface FoundCorner {
  /** "Corner 1", "Corner 2" … in lap order; the team renames them. */
  name: string;
  index: number;
  /** Apex: middle of the slowest stretch of the corner, from the lap start (m). */
  distanceM: number;
  /** Where the slowest stretch (within apexBandMps of the minimum) begins and ends (m). */
  slowFromM: number;
  slowToM: number;
  minSpeedMps: number;
  prominenceMps: number;
}

/**
 * Corners of a track from the reference lap's speed trace: the local minima of speed whose
 * topographic prominence is at least `minProminenceMps`. `speedMps` and `distanceM` are the
 * reference lap's samples (distance from the lap's start); NaN samples are skipped.
 */
export function findCorners(speedMps: ArrayLike<number>, distanceM: ArrayLike<number>, opts: FindCornersOptions = {}): FoundCorner[] {
  const minProm = opts.minProminenceMps ?? 5;
  const minSep = opts.minSeparationM ?? 40;
  const band = opts.apexBandMps ?? 0.5;
  // Compact the finite samples so NaN gaps (slow GPS speed) do not make false minima.
  const idx: number[] = [];
  for (let i = 0; i < speedMps.length; i++) if (Number.isFinite(speedMps[i]) && Number.isFinite(distanceM[i])) idx.push(i);
  const m = idx.length;
  const v = new Float64Array(m);
  for (let k = 0; k < m; k++) v[k] = speedMps[idx[k]];

  const found: FoundCorner[] = [];
  let k = 1;
  while (k < m - 1) {
    if (!(v[k] < v[k - 1])) {
      k++;
      continue;
    }
    // Walk over a flat bottom; a minimum needs a rise after it.
    let e = k;
    while (e + 1 < m && v[e + 1] === v[k]) e++;
    if (e + 1 >= m || !(v[e + 1] > v[k])) {
      k = e + 1;
      continue;
    }
    const vmin = v[k];
    let leftMax = vmin;
    for (let j = k - 1; j >= 0 && v[j] >= vmin; j--) if (v[j] > leftMax) leftMax = v[j];
    let rightMax = vmin;
    for (let j = e + 1; j < m && v[j] >= vmin; j++) if (v[j] > rightMax) rightMax = v[j];
    const prominence = Math.min(leftMax, rightMax) - vmin;
    if (prominence >= minProm) {
      let lo = k;
      while (lo > 0 && v[lo - 1] <= vmin + band) lo--;
      let hi = e;
      while (hi + 1 < m && v[hi + 1] <= vmin + band) hi++;
      const fromM = distanceM[idx[lo]];
      const toM = distanceM[idx[hi]];
      const mid = 0.5 * (fromM + toM);
      // The sample nearest the middle of the slow stretch is the apex.
      let at = idx[lo];
      for (let q = lo; q <= hi; q++) if (Math.abs(distanceM[idx[q]] - mid) < Math.abs(distanceM[at] - mid)) at = idx[q];
      found.push({ name: "", index: at, distanceM: distanceM[at], slowFromM: fromM, slowToM: toM, minSpeedMps: vmin, prominenceMps: prominence });
    }
    k = e + 1;
  }
  // Merge minima that sit too close together (a double apex reads as one corner).
  const merged: FoundCorner[] = [];
  for (const c of found) {
    const last = merged[merged.length - 1];
    // Same corner: apexes close together, or overlapping slow stretches (noise on a plateau).
    if (last && (c.distanceM - last.distanceM < minSep || c.slowFromM <= last.slowToM)) {
      if (c.minSpeedMps < last.minSpeedMps) merged[merged.length - 1] = c;
    } else merged.push(c);
  }
  merged.forEach((c, i) => (c.name = `Corner ${i + 1}`));
  return merged;
}
