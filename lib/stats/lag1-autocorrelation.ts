import { mean } from "./mean";

/**
 * Lag-1 autocorrelation r1 = Σ_{i=1}^{n−1} (y_i − ȳ)(y_{i+1} − ȳ) / Σ_{i=1}^{n} (y_i − ȳ)².
 * Formula as defined for the NIST Statistical Reference Datasets (univariate summary statistics).
 * Hand-written because simple-statistics 7.x has no autocorrelation; the mean is its
 * compensated one, and deviations are formed before multiplying so a large offset cancels exactly.
 * NaN when n < 2 or all values are equal.
 */
export function lag1Autocorrelation(values: ArrayLike<number>): number {
  const n = values.length;
  if (n < 2) return NaN;
  const m = mean(values);
  let num = 0;
  let den = 0;
  let prev = values[0]! - m;
  den += prev * prev;
  for (let i = 1; i < n; i++) {
    const d = values[i]! - m;
    num += prev * d;
    den += d * d;
    prev = d;
  }
  return den === 0 ? NaN : num / den;
}
