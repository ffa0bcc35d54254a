export interface Run {
  /** First and last sample of the run (inclusive). */
  start: number;
  end: number;
}

/**
 * Consecutive true samples of a predicate merged into runs: runs closer than `mergeGapS` join,
 * and runs shorter than `minDurationS` (k samples cover k sample intervals) are dropped.
 */
export function maskRuns(
  n: number,
  on: (i: number) => boolean,
  timeS: Float64Array,
  opts: { minDurationS?: number; mergeGapS?: number; dtS?: number } = {},
): Run[] {
  const minDurationS = opts.minDurationS ?? 0;
  const mergeGapS = opts.mergeGapS ?? 0;
  const dtS = opts.dtS ?? (n > 1 ? (timeS[n - 1] - timeS[0]) / (n - 1) : 0);
  const runs: Run[] = [];
  for (let i = 0; i < n; i++) {
    if (!on(i)) continue;
    const start = i;
    while (i + 1 < n && on(i + 1)) i++;
    const last = runs[runs.length - 1];
    if (last && timeS[start] - timeS[last.end] <= mergeGapS + 1e-9) last.end = i;
    else runs.push({ start, end: i });
  }
  return runs.filter((r) => timeS[r.end] - timeS[r.start] + dtS >= minDurationS - 1e-9);
}
