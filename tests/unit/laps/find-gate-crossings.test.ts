import { describe, expect, it } from "vitest";
import { findGateCrossings } from "@/lib/laps/find-gate-crossings";
import { GATES, proj } from "./synthetic-session";
import { at } from "../../fixtures/at";

/** Fixes along y = −100 (the synthetic main straight) at the given x positions and times. */
function fixesAt(xs: number[], ts: number[]) {
  const lat = new Float64Array(xs.length);
  const lon = new Float64Array(xs.length);
  xs.forEach((x, i) => {
    const ll = proj.toLatLon(x, -100);
    lat[i] = ll.lat;
    lon[i] = ll.lon;
  });
  return { timeS: Float64Array.from(ts), latDeg: lat, lonDeg: lon };
}

describe("findGateCrossings", () => {
  it("interpolates t* = t0 + u·Δt: 2.000 m before, 3.556 m after, Δt 0.1 s → t0 + 0.036 s (plain arithmetic)", () => {
    const c = findGateCrossings(fixesAt([-2.0, 3.556], [10, 10.1]), GATES.startFinish);
    expect(c).toHaveLength(1);
    // 0.1 · 2/5.556 = 0.035997… s, which rounds to 0.036 s.
    expect(at(c, 0).timeS - 10).toBeCloseTo(0.036, 4);
    expect(Math.abs(at(c, 0).timeS - 10 - (0.1 * 2) / 5.556)).toBeLessThan(1e-9);
    expect(at(c, 0).direction).toBe(1);
    expect(at(c, 0).fixIndex).toBe(0);
  });

  it("ignores a crossing backwards unless asked for it", () => {
    const back = fixesAt([3, -2], [0, 0.1]);
    expect(findGateCrossings(back, GATES.startFinish)).toHaveLength(0);
    const both = findGateCrossings(back, GATES.startFinish, { direction: "both" });
    expect(both).toHaveLength(1);
    expect(at(both, 0).direction).toBe(-1);
    expect(at(both, 0).timeS).toBeCloseTo(0.06, 12); // 3 m of 5 m at constant speed
  });

  it("without interpolation a 10 Hz crossing at 200 km/h could be up to 100 ms late; with it the error is ~0", () => {
    // 200 km/h = 55.556 m/s → 5.556 m between fixes at 10 Hz (plain arithmetic). True crossing at t = 1.000 s.
    const v = 200 / 3.6;
    const ts = [0.93, 1.03];
    const c = findGateCrossings(fixesAt(ts.map((t) => (t - 1) * v), ts), GATES.startFinish);
    expect(Math.abs(at(c, 0).timeS - 1)).toBeLessThan(1e-9);
    expect(at(ts, 1) - 1).toBeCloseTo(0.03, 9); // the naive "first fix after" answer is 30 ms late here
  });

  it("does not interpolate across a GPS dropout longer than maxGapS", () => {
    const f = fixesAt([-20, 30], [0, 3]);
    expect(findGateCrossings(f, GATES.startFinish)).toHaveLength(0);
    expect(findGateCrossings(f, GATES.startFinish, { maxGapS: 5 })).toHaveLength(1);
  });

  it("skips NaN fixes and misses a pass beside the gate", () => {
    const f = fixesAt([-3, 0, 3], [0, 0.1, 0.2]);
    f.latDeg[1] = NaN;
    expect(at(findGateCrossings(f, GATES.startFinish), 0).timeS).toBeCloseTo(0.1, 9);
    // Same pass 40 m north of the track centre: outside the 30 m gate.
    const beside = fixesAt([-3, 3], [0, 0.1]);
    beside.latDeg.forEach((_, i) => (beside.latDeg[i] = proj.toLatLon(0, -60).lat));
    expect(findGateCrossings(beside, GATES.startFinish)).toHaveLength(0);
  });
});
