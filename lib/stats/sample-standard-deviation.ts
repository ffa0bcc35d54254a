import { sampleStandardDeviation as ssSampleSd } from "simple-statistics";

/**
 * Sample standard deviation with n − 1 (Bessel), via simple-statistics (two-pass: mean first,
 * then squared deviations, which keeps NIST NumAcc1's large offset exact). NaN when n < 2.
 */
export function sampleStandardDeviation(values: ArrayLike<number>): number {
  if (values.length < 2) return NaN;
  return ssSampleSd(values as unknown as number[]);
}
