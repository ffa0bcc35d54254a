import { mean as ssMean } from "simple-statistics";

/**
 * Arithmetic mean (simple-statistics, Kahan–Babuška compensated sum). NaN for an empty input
 * instead of simple-statistics' throw, so an empty lap range reads as "no value".
 * Takes typed arrays: simple-statistics only reads `length` and indexes, so no copy is made.
 */
export function mean(values: ArrayLike<number>): number {
  if (values.length === 0) return NaN;
  return ssMean(values as unknown as number[]);
}
