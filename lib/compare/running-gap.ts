import { resampleOnDistance } from "./resample-on-distance";

/** A lap as two parallel columns: session time (s) and distance from the lap start (m). */
export interface LapTrace {
  timeS: ArrayLike<number>;
  distanceM: ArrayLike<number>;
}

export interface RunningGap {
  /** Common grid, m: 0 … the shorter lap's length, every gridStepM. */
  distanceM: Float64Array;
  /** time(B) − time(A) since each lap's start at each distance, s: positive = B is behind. */
  gapS: Float64Array;
}

/**
 * Running gap of lap B against reference lap A along distance: both laps resampled onto one
 * distance grid (resampleOnDistance), gap = (t_B(d) − t_B(0)) − (t_A(d) − t_A(0)).
 * Positive where B has lost time to A up to that point. The grid stops at the shorter lap.
 */
export function runningGap(lapA: LapTrace, lapB: LapTrace, gridStepM = 1): RunningGap {
  const a = resampleOnDistance(lapA.timeS, lapA.distanceM, null, gridStepM);
  const b = resampleOnDistance(lapB.timeS, lapB.distanceM, null, gridStepM);
  const m = Math.min(a.distanceM.length, b.distanceM.length);
  const distanceM = a.distanceM.slice(0, m);
  const gapS = new Float64Array(m);
  for (let i = 0; i < m; i++) gapS[i] = b.timeS[i] - a.timeS[i];
  return { distanceM, gapS };
}
