import { describe, expect, it } from "vitest";
import { decimateMinMax } from "@/lib/compare/decimate-min-max";
import { resampleOnDistance } from "@/lib/compare/resample-on-distance";
import { runningGap } from "@/lib/compare/running-gap";
import { at } from "../../fixtures/at";

/** A lap at constant speed, sampled at `hz`, starting at session time t0. */
function constantLap(speedMps: number, lengthM: number, hz: number, t0: number) {
  const n = Math.ceil((lengthM / speedMps) * hz) + 1;
  const timeS = new Float64Array(n);
  const distanceM = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    // Last sample exactly at the end of the lap (t = length / speed).
    const t = Math.min(i / hz, lengthM / speedMps);
    timeS[i] = t0 + t;
    distanceM[i] = t * speedMps;
  }
  return { timeS, distanceM };
}

describe("runningGap", () => {
  it("A at 50 m/s, B at 49 m/s over 4000 m: gap(d) = d/49 − d/50 (analytic)", () => {
    const a = constantLap(50, 4000, 100, 1000);
    const b = constantLap(49, 4000, 100, 2500);
    const g = runningGap(a, b);
    expect(g.distanceM).toHaveLength(4001);
    expect(g.distanceM[4000]).toBe(4000);
    let worst = 0;
    for (let i = 0; i < g.distanceM.length; i++) {
      const d = at(g.distanceM, i);
      worst = Math.max(worst, Math.abs(at(g.gapS, i) - (d / 49 - d / 50)));
    }
    expect(worst).toBeLessThan(1e-9);
    expect(g.gapS[4000]).toBeCloseTo(4000 / 49 - 4000 / 50, 9); // 1.632653 s lost by B
  });

  it("swapping the laps flips the sign; the grid stops at the shorter lap", () => {
    const a = constantLap(50, 4000, 100, 0);
    const b = constantLap(49, 3990, 100, 0);
    const g = runningGap(b, a, 2);
    expect(g.distanceM).toHaveLength(1996);
    expect(g.gapS[1000]).toBeCloseTo(-(2000 / 49 - 2000 / 50), 9);
  });
});

describe("resampleOnDistance", () => {
  it("interpolates a NaN-gapped channel linearly between its finite samples", () => {
    // Distance 0..10 m at 1 m/sample; value = 3·d only every 3rd sample, NaN between.
    const timeS = Float64Array.from({ length: 11 }, (_, i) => i * 0.1);
    const distanceM = Float64Array.from({ length: 11 }, (_, i) => i);
    const values = Float32Array.from({ length: 11 }, (_, i) => (i % 3 === 0 ? 3 * i : NaN));
    const r = resampleOnDistance(timeS, distanceM, values, 0.5);
    expect(r.distanceM).toHaveLength(21);
    for (let g = 0; g <= 18; g++) expect(r.values[g]).toBeCloseTo(1.5 * g, 9); // d ≤ 9: inside finite samples
    expect(r.values[19]).toBeNaN(); // past the last finite sample (d = 9)
    expect(r.timeS[7]).toBeCloseTo(0.35, 12);
  });

  it("takes the first time a distance is reached when the bike stands still", () => {
    const r = resampleOnDistance([0, 1, 5, 6], [0, 10, 10, 20], null, 5);
    expect(Array.from(r.timeS)).toEqual([0, 0.5, 1, 5.5, 6]);
  });
});

describe("decimateMinMax", () => {
  const n = 100_000;
  const x = Float64Array.from({ length: n }, (_, i) => i * 0.01);
  // Deterministic wiggly signal with spikes.
  const y = Float64Array.from({ length: n }, (_, i) => Math.sin(i * 0.013) * 10 + ((i * 7919) % 101) / 10 + (i % 9973 === 0 ? 50 : 0));
  y[5000] = NaN;

  it("keeps every column's min and max, the first and last point, and ≤ 4×width + 2 points", () => {
    const width = 800;
    const d = decimateMinMax(x, y, width);
    expect(d.x.length).toBeLessThanOrEqual(4 * width + 2);
    expect(d.x[0]).toBe(x[0]);
    expect(d.x[d.x.length - 1]).toBe(x[n - 1]);
    // Brute force per column: the kept points include the column's extreme values.
    const kept = new Map<number, number>();
    for (let i = 0; i < d.x.length; i++) kept.set(at(d.x, i), at(d.y, i));
    const span = at(x, n - 1) - at(x, 0);
    const colMin = new Float64Array(width).fill(Infinity);
    const colMax = new Float64Array(width).fill(-Infinity);
    const keptMin = new Float64Array(width).fill(Infinity);
    const keptMax = new Float64Array(width).fill(-Infinity);
    for (let i = 1; i < n - 1; i++) {
      if (Number.isNaN(y[i])) continue;
      const c = Math.min(width - 1, Math.floor(((at(x, i) - at(x, 0)) / span) * width));
      colMin[c] = Math.min(at(colMin, c), at(y, i));
      colMax[c] = Math.max(at(colMax, c), at(y, i));
      if (kept.has(at(x, i)) && kept.get(at(x, i)) === at(y, i)) {
        keptMin[c] = Math.min(at(keptMin, c), at(y, i));
        keptMax[c] = Math.max(at(keptMax, c), at(y, i));
      }
    }
    expect(Array.from(keptMin)).toEqual(Array.from(colMin));
    expect(Array.from(keptMax)).toEqual(Array.from(colMax));
    // x stays ascending, and the NaN gap survives.
    for (let i = 1; i < d.x.length; i++) expect(at(d.x, i)).toBeGreaterThan(at(d.x, i - 1));
    expect(Array.from(d.y).some(Number.isNaN)).toBe(true);
  });

  it("returns the data unchanged below 4 points per pixel column", () => {
    const d = decimateMinMax(x.subarray(0, 3199), y.subarray(0, 3199), 800);
    expect(d.x).toHaveLength(3199);
    expect(d.y[10]).toBe(y[10]);
    expect(d.x).toBeInstanceOf(Float64Array);
  });
});
