import { getPreciseDistance } from "geolib";
import { describe, expect, it } from "vitest";
import { gateAcrossPath } from "@/lib/geo/gate-across-path";
import { gateFromPoints } from "@/lib/geo/gate-from-points";
import { segmentIntersection, sideOfLine } from "@/lib/geo/segment-intersection";
import { toLocalMetres } from "@/lib/geo/to-local-metres";

describe("segmentIntersection", () => {
  it("gives u = d0/(d0+d1): fixes 2.000 m before and 3.556 m after the line (plain arithmetic)", () => {
    // Gate along the y axis from (0,-5) to (0,5); path along x from −2.000 to +3.556.
    const hit = segmentIntersection(-2, 0.3, 3.556, 0.3, 0, -5, 0, 5);
    expect(hit).not.toBeNull();
    expect(hit!.u).toBeCloseTo(2 / 5.556, 12);
    expect(hit!.v).toBeCloseTo(0.53, 12);
  });

  it("reports direction: left of q0→q1 to right is +1, back again is −1", () => {
    // q0→q1 points north; left is west. West → east is forward.
    expect(segmentIntersection(-1, 0, 1, 0, 0, -5, 0, 5)!.direction).toBe(1);
    expect(segmentIntersection(1, 0, -1, 0, 0, -5, 0, 5)!.direction).toBe(-1);
    expect(sideOfLine(0, -5, 0, 5, -1, 0)).toBeGreaterThan(0);
  });

  it("misses a path that passes beyond the gate's ends, or stays on one side", () => {
    expect(segmentIntersection(-1, 6, 1, 6, 0, -5, 0, 5)).toBeNull();
    expect(segmentIntersection(-3, 0, -1, 0, 0, -5, 0, 5)).toBeNull();
    expect(segmentIntersection(-1, 0, 1, 0, 0, 0, 0, 0)).toBeNull(); // degenerate gate
  });
});

describe("gateFromPoints / gateAcrossPath", () => {
  const p = toLocalMetres({ lat: 44.5, lon: -30 });
  it("accepts a 20 m gate and rejects 0.5 m and 300 m ones", () => {
    expect(gateFromPoints(p.toLatLon(0, -10), p.toLatLon(0, 10)).b.lat).toBeCloseTo(p.toLatLon(0, 10).lat, 12);
    expect(() => gateFromPoints(p.toLatLon(0, 0), p.toLatLon(0, 0.5))).toThrow(RangeError);
    expect(() => gateFromPoints(p.toLatLon(0, 0), p.toLatLon(0, 300))).toThrow(RangeError);
    expect(() => gateFromPoints({ lat: NaN, lon: 0 }, p.toLatLon(0, 5))).toThrow(RangeError);
  });

  it("builds a gate square to the path, of the asked width, crossed forward by the path", () => {
    const at = p.toLatLon(100, 50);
    const next = p.toLatLon(103, 54); // heading 3-4-5 north-east
    const g = gateAcrossPath(at, next, 20);
    const ax = p.xM(g.a.lon), ay = p.yM(g.a.lat), bx = p.xM(g.b.lon), by = p.yM(g.b.lat);
    // Width checked with Vincenty, independent of our projection (±1 mm).
    expect(getPreciseDistance({ latitude: g.a.lat, longitude: g.a.lon }, { latitude: g.b.lat, longitude: g.b.lon }, 0.001)).toBeCloseTo(20, 2);
    // Square to the heading: cosine between gate and heading ≈ 0 (this frame is 100 m from the
    // gate's own, so a scale difference of ~1e-5 is expected).
    expect(Math.abs((bx - ax) * 3 + (by - ay) * 4) / (Math.hypot(bx - ax, by - ay) * 5)).toBeLessThan(2e-5);
    const hit = segmentIntersection(100 - 3, 50 - 4, 103, 54, ax, ay, bx, by);
    expect(hit?.direction).toBe(1);
  });
});
