import { describe, expect, it } from "vitest";
import { lag1Autocorrelation } from "@/lib/stats/lag1-autocorrelation";
import { mean } from "@/lib/stats/mean";
import { sampleStandardDeviation } from "@/lib/stats/sample-standard-deviation";
import { summarizeFinite } from "@/lib/stats/summarize-finite";

// NIST Statistical Reference Datasets, univariate summary statistics (public domain), certified
// values from NIST's StRD univariate pages (NumAcc1, NumAcc2). Data built from NIST's description of each set.
// Lew, Michelso and Mavro are not tested: their 200/100/50 data values are only in NIST's .dat
// files, which are not available here, and we do not type them in from memory.
const NUMACC1 = [10000001, 10000003, 10000002];
const NUMACC2 = [1.2, ...Array.from({ length: 500 }, () => [1.1, 1.3]).flat()];

describe("lib/stats against NIST StRD", () => {
  it("NumAcc1 (n = 3): mean 10000002, SD 1, r1 −0.5", () => {
    expect(mean(NUMACC1)).toBe(10000002);
    expect(sampleStandardDeviation(NUMACC1)).toBe(1);
    expect(lag1Autocorrelation(NUMACC1)).toBe(-0.5);
  });

  it("NumAcc2 (n = 1001): mean 1.2, SD 0.1, r1 −0.999 (to 13 significant digits)", () => {
    expect(NUMACC2).toHaveLength(1001);
    expect(Math.abs(mean(NUMACC2) - 1.2) / 1.2).toBeLessThan(1e-13);
    expect(Math.abs(sampleStandardDeviation(NUMACC2) - 0.1) / 0.1).toBeLessThan(1e-13);
    expect(Math.abs(lag1Autocorrelation(NUMACC2) + 0.999) / 0.999).toBeLessThan(1e-13);
  });

  it("accepts typed arrays (as channels are stored) with the same results", () => {
    expect(sampleStandardDeviation(Float64Array.from(NUMACC2))).toBeCloseTo(0.1, 13);
  });

  it("summarizeFinite skips NaN samples and keeps NumAcc1's certified values", () => {
    const withGaps = Float64Array.from([NaN, 10000001, NaN, 10000003, 10000002, NaN]);
    expect(summarizeFinite(withGaps)).toEqual({ n: 3, mean: 10000002, sd: 1, min: 10000001, max: 10000003 });
    expect(summarizeFinite(withGaps, 0, 1).n).toBe(0);
  });

  it("gives NaN, not a throw, for too few values", () => {
    expect(mean([])).toBeNaN();
    expect(sampleStandardDeviation([1])).toBeNaN();
    expect(lag1Autocorrelation([5, 5, 5])).toBeNaN();
  });
});
