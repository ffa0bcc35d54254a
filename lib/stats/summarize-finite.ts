import { mean } from "./mean";
import { sampleStandardDeviation } from "./sample-standard-deviation";

export interface FiniteSummary {
  /** Number of finite samples used. */
  n: number;
  mean: number;
  /** Sample SD (n − 1); NaN when n < 2. */
  sd: number;
  min: number;
  max: number;
}

/**
 * Mean, sample SD, min and max of the finite values in values[from, to), skipping NaN (a channel
 * slower than the master clock is NaN between its samples). Values keep the channel's unit.
 * Copies the finite values once into a Float64Array for simple-statistics.
 */
export function summarizeFinite(values: ArrayLike<number>, from = 0, to = values.length): FiniteSummary {
  let n = 0;
  for (let i = from; i < to; i++) if (Number.isFinite(values[i])) n++;
  const finite = new Float64Array(n);
  let min = Infinity;
  let max = -Infinity;
  let k = 0;
  for (let i = from; i < to; i++) {
    const v = values[i]!;
    if (!Number.isFinite(v)) continue;
    finite[k++] = v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (n === 0) return { n, mean: NaN, sd: NaN, min: NaN, max: NaN };
  return { n, mean: mean(finite), sd: sampleStandardDeviation(finite), min, max };
}
