import { describe, expect, it } from "vitest";
import { savitzkyGolayCoefficients } from "@/lib/suspension/savitzky-golay-coefficients";
import { savitzkyGolayDerivative } from "@/lib/suspension/savitzky-golay";
import { at } from "../../fixtures/at";

// Published convolution tables: Savitzky & Golay, Anal. Chem. 36(8), 1964, with the corrections
// of Steinier, Termonia & Deltour, Anal. Chem. 44, 1972; also Numerical Recipes §14.8.
const TABLES: Array<[string, number, number, number, number[], number]> = [
  // [label, window, order, derivative, integer numerators, normaliser]
  ["5-point quadratic smoothing", 5, 2, 0, [-3, 12, 17, 12, -3], 35],
  ["7-point quadratic smoothing", 7, 2, 0, [-2, 3, 6, 7, 6, 3, -2], 21],
  // Smoothing coefficients of a cubic fit equal the quadratic's (S&G 1964, shared table column).
  ["5-point cubic smoothing", 5, 3, 0, [-3, 12, 17, 12, -3], 35],
  ["5-point quadratic first derivative", 5, 2, 1, [-2, -1, 0, 1, 2], 10],
  ["7-point quadratic first derivative", 7, 2, 1, [-3, -2, -1, 0, 1, 2, 3], 28],
  ["5-point cubic first derivative", 5, 3, 1, [1, -8, 0, 8, -1], 12],
];

describe("savitzkyGolayCoefficients against the published tables (S&G 1964; Steinier et al. 1972; NR §14.8)", () => {
  it.each(TABLES)("%s", (_label, window, order, deriv, num, norm) => {
    const c = savitzkyGolayCoefficients(window, order, deriv);
    expect(c).toHaveLength(window);
    for (let k = 0; k < window; k++) expect(at(c, k)).toBeCloseTo(at(num, k) / norm, 12);
  });

  it("rejects an even window and an order that does not fit", () => {
    expect(() => savitzkyGolayCoefficients(6, 2)).toThrow(RangeError);
    expect(() => savitzkyGolayCoefficients(5, 5)).toThrow(RangeError);
    expect(() => savitzkyGolayCoefficients(5, 2, 3)).toThrow(RangeError);
  });
});

describe("savitzkyGolayDerivative", () => {
  it("peak velocity of A·sin(2πft) is 2πfA (analytic derivative)", () => {
    const A = 0.04; // m
    const f = 3; // Hz
    const dt = 1 / 500;
    const n = 1000;
    const x = new Float32Array(n);
    for (let i = 0; i < n; i++) x[i] = A * Math.sin(2 * Math.PI * f * i * dt);
    const v = savitzkyGolayDerivative(x, dt, 11, 3);
    let peak = 0;
    for (const value of v) peak = Math.max(peak, Math.abs(value));
    const analytic = 2 * Math.PI * f * A; // 0.754 m/s
    expect(Math.abs(peak - analytic) / analytic).toBeLessThan(0.002);
    // The velocity at t = 0 (a record end, off-centre window) is the peak too: cos(0) = 1.
    expect(Math.abs(at(v, 0) - analytic) / analytic).toBeLessThan(0.01);
  });

  it("reproduces the derivative of a quadratic exactly, ends included (least-squares fit of degree ≥ 2 is exact on a quadratic — S&G 1964)", () => {
    const dt = 0.01;
    const n = 40;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const t = i * dt;
      x[i] = 0.02 + 0.5 * t - 3 * t * t;
    }
    const v = savitzkyGolayDerivative(x, dt, 9, 2);
    for (let i = 0; i < n; i++) expect(v[i]).toBeCloseTo(0.5 - 6 * i * dt, 4);
  });

  it("gives NaN for a record shorter than the window", () => {
    expect(Array.from(savitzkyGolayDerivative([1, 2, 3], 0.01, 5, 2)).every(Number.isNaN)).toBe(true);
  });
});
