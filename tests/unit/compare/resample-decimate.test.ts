import { describe, expect, it } from "vitest";
import { gather, gridColumns, keptIndices, markMinMax, resampleDecimate } from "@/lib/compare/resample-decimate";
import { decimateMinMax } from "@/lib/compare/decimate-min-max";
import { resampleOnDistance } from "@/lib/compare/resample-on-distance";
import { at } from "../../fixtures/at";

/** Deterministic pseudo-random numbers (mulberry32), so a failure repeats. */
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe("resampleDecimate: resampling", () => {
  it("interpolates linearly between the samples either side (worked by hand)", () => {
    // Samples at 0, 2.5, 5 m with values 10, 20, 0. At 1 m: 10 + 10·(1/2.5) = 14; at 2 m: 18;
    // at 3 m: 20 − 20·(0.5/2.5) = 16; at 4 m: 8; at 5 m the sample itself, 0; at 6 m past the end: NaN.
    const grid = [0, 1, 2, 3, 4, 5, 6];
    const out = resampleDecimate(grid, [0, 2.5, 5], [10, 20, 0], new Float64Array(grid.length));
    expect(Array.from(out.subarray(0, 6))).toEqual([10, 14, 18, 16, 8, 0].map((v) => expect.closeTo(v, 12)));
    expect(out[6]).toBeNaN();
  });

  it("bridges NaN between a slow channel's samples and takes the first time a repeated distance is reached", () => {
    // A stopped bike repeats distance 2 at t = 2 and t = 3: the grid point at 2 m takes the first.
    const out = resampleDecimate([0, 1, 2, 3], [0, 1, 2, 2, 3], [0, NaN, 4, 9, 6], new Float64Array(4));
    expect(Array.from(out)).toEqual([0, 2, 4, 6]);
  });

  it("matches resampleOnDistance point for point on a 1 m grid (random lap with gaps and stops)", () => {
    const r = rng(7);
    const n = 5000;
    const d = new Float64Array(n);
    const v = new Float64Array(n);
    for (let i = 1; i < n; i++) {
      d[i] = at(d, i - 1) + (r() < 0.02 ? 0 : r() * 1.4); // stops repeat a distance
      v[i] = r() < 0.3 ? NaN : Math.sin(i / 40) * 50 + r();
    }
    v[0] = 3;
    const ref = resampleOnDistance(d, d, v, 1);
    const out = resampleDecimate(ref.distanceM, d, v, new Float64Array(ref.distanceM.length));
    expect(out.length).toBe(ref.values.length);
    for (let g = 0; g < out.length; g++) expect(Object.is(out[g], ref.values[g]) || out[g] === ref.values[g]).toBe(true);
  });
});

describe("resampleDecimate: decimation in the same pass", () => {
  it("keeps exactly the points decimateMinMax keeps, and the union across series", () => {
    const r = rng(11);
    const m = 6000;
    const grid = Float64Array.from({ length: m }, (_, g) => g);
    const series = [0, 1, 2].map((s) => Float64Array.from({ length: m }, (_, g) => (r() < 0.01 ? NaN : Math.cos(g / (30 + 20 * s)) * 10 + r())));
    const width = 700;
    const cols = gridColumns(grid, width)!;
    expect(cols).not.toBeNull();
    const keep = new Uint8Array(m);
    const expected = new Set<number>();
    // Samples from 40.5 m to 5900.5 m: the grid points outside are NaN, as past a lap's end.
    const xs = Float64Array.from({ length: 5861 }, (_, i) => 40.5 + i);
    for (const y of series) {
      const out = resampleDecimate(grid, xs, y, new Float64Array(m), cols, keep);
      expect(out[0]).toBeNaN();
      expect(out[m - 1]).toBeNaN();
      // The two steps apart: resample (checked above), then decimateMinMax of the resampled series.
      for (const x of decimateMinMax(grid, out, width).x) expected.add(x);
    }
    expect(Array.from(keptIndices(keep))).toEqual([...expected].sort((a, b) => a - b));
    // markMinMax, the decimation half alone, keeps decimateMinMax's points of a series with NaN inside.
    const alone = new Uint8Array(m);
    markMinMax(at(series, 0), cols, alone);
    expect(Array.from(keptIndices(alone))).toEqual(Array.from(decimateMinMax(grid, at(series, 0), width).x));
    expect(keptIndices(keep).length).toBeLessThanOrEqual(3 * (3 * width) + 2);
  });

  it("marks nothing and keeps every point below four points per pixel column", () => {
    const grid = Float64Array.from({ length: 1000 }, (_, g) => g);
    expect(gridColumns(grid, 300)).toBeNull();
    expect(gridColumns(grid, 250)).not.toBeNull();
  });

  it("gather picks values at kept indices as Float32", () => {
    expect(Array.from(gather([1, 2, 3, 4], Uint32Array.from([0, 3])))).toEqual([1, 4]);
    expect(Array.from(gather([1.5, 2], null))).toEqual([1.5, 2]);
  });
});
