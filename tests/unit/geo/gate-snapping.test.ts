/**
 * The gate editor's snapping math (lib/geo/gate-snapping.ts). Plane results are checked against
 * worked examples of orthogonal projection onto a segment (3-4-5 right triangles: the foot of the
 * perpendicular from (30, 40) to the x-axis is (30, 0) at distance 40); distances and bearings on
 * the Earth against geolib 3.3 (getPreciseDistance: Vincenty on WGS-84; getGreatCircleBearing).
 */
import { describe, expect, it } from "vitest";
import { getGreatCircleBearing, getPreciseDistance } from "geolib";
import { flipGate, gateAtSnap, gateShape, pointAt, projectionFor, snapToPath, toPath, type Path } from "@/lib/geo/gate-snapping";

/** A path given in plane metres (distance accumulated as toPath does). */
function planePath(pts: [number, number][]): Path {
  const x = Float64Array.from(pts, (p) => p[0]);
  const y = Float64Array.from(pts, (p) => p[1]);
  const d = new Float64Array(pts.length);
  for (let i = 1; i < pts.length; i++) d[i] = d[i - 1] + Math.hypot(x[i]! - x[i - 1]!, y[i]! - y[i - 1]!);
  return { x, y, d };
}

// An L: 100 m east, then 100 m north.
const L = planePath([
  [0, 0],
  [100, 0],
  [100, 100],
]);

describe("snapToPath: the nearest point of the path", () => {
  it("drops the perpendicular onto the segment (3-4-5 worked example)", () => {
    const s = snapToPath(L, 30, 40)!;
    expect(s.i).toBe(0);
    expect(s.x).toBeCloseTo(30, 9);
    expect(s.y).toBeCloseTo(0, 9);
    expect(s.off).toBeCloseTo(40, 9);
    expect(s.along).toBeCloseTo(30, 9);
    expect([s.hx, s.hy]).toEqual([1, 0]);
  });

  it("takes the nearer segment, with distance along counted over the earlier ones", () => {
    // 30 m west of the north leg at 60 m up, 60 m from the east leg: the north leg wins.
    const s = snapToPath(L, 70, 60)!;
    expect(s.i).toBe(1);
    expect(s.off).toBeCloseTo(30, 9);
    expect(s.along).toBeCloseTo(160, 9);
    expect(s.hx).toBeCloseTo(0, 12);
    expect(s.hy).toBeCloseTo(1, 12);
  });

  it("clamps past an end to the end point (distance 50 from (130, 140) to (100, 100): 30-40-50)", () => {
    const s = snapToPath(L, 130, 140)!;
    expect([s.x, s.y]).toEqual([100, 100]);
    expect(s.off).toBeCloseTo(50, 9);
    expect(s.along).toBeCloseTo(200, 9);
  });

  it("skips repeated points and returns null for a path without a segment", () => {
    const dup = planePath([
      [0, 0],
      [0, 0],
      [0, 10],
    ]);
    expect(snapToPath(dup, 3, 4)!.i).toBe(1);
    expect(snapToPath(planePath([[0, 0]]), 1, 1)).toBeNull();
  });
});

describe("pointAt: a point at a distance along the lap", () => {
  it("interpolates on the segment and wraps a closed lap both ways", () => {
    expect(pointAt(L, 150)).toEqual({ x: 100, y: 50 });
    const at = pointAt(L, 25)!;
    expect(pointAt(L, 225)).toEqual(at);
    expect(pointAt(L, -175)).toEqual(at);
    expect(at).toEqual({ x: 25, y: 0 });
    expect(pointAt(planePath([[0, 0]]), 5)).toBeNull();
  });
});

describe("on the Earth, against geolib", () => {
  // An invented path near 46° N: about 400 m north-east, then 300 m east.
  const pts: [number, number][] = [
    [46.0, -35.0],
    [46.00255, -34.99635],
    [46.00255, -34.99245],
  ];
  const proj = projectionFor(pts);
  const p = toPath(proj, pts);

  it("toPath's cumulative distance is geolib's Vincenty distance within 0.1 %", () => {
    let ref = 0;
    for (let i = 1; i < pts.length; i++) {
      ref += getPreciseDistance({ latitude: pts[i - 1]![0], longitude: pts[i - 1]![1] }, { latitude: pts[i]![0], longitude: pts[i]![1] }, 0.001);
      expect(Math.abs(p.d[i]! - ref) / ref).toBeLessThan(0.001);
    }
  });

  it("a gate placed at a snapped point is as wide as asked, centred on it and square to the path", () => {
    const s = snapToPath(p, p.x[1]! * 0.5 - 8, p.y[1]! * 0.5 + 8)!;
    expect(s.i).toBe(0);
    const g = gateAtSnap(proj, s, 30);
    const A = { latitude: g.a.lat, longitude: g.a.lon };
    const B = { latitude: g.b.lat, longitude: g.b.lon };
    expect(getPreciseDistance(A, B, 0.001)).toBeCloseTo(30, 1);
    const at = proj.toLatLon(s.x, s.y);
    const mid = { latitude: (g.a.lat + g.b.lat) / 2, longitude: (g.a.lon + g.b.lon) / 2 };
    expect(getPreciseDistance(mid, { latitude: at.lat, longitude: at.lon }, 0.001)).toBeLessThan(0.05);
    // a on the rider's right: the bearing from a to b is the path's heading turned 90° left.
    const heading = getGreatCircleBearing({ latitude: pts[0]![0], longitude: pts[0]![1] }, { latitude: pts[1]![0], longitude: pts[1]![1] });
    const ab = getGreatCircleBearing(A, B);
    expect(Math.abs(((ab - (heading - 90) + 540) % 360) - 180)).toBeLessThan(0.5);
  });

  it("gateShape's forward direction is the path heading, and flipping a gate reverses it", () => {
    const s = snapToPath(p, p.x[1]! + 100, p.y[1]! - 5)!;
    expect(s.i).toBe(1);
    const g = gateAtSnap(proj, s, 20);
    const shape = gateShape(proj, g);
    expect(shape.tx * s.hx + shape.ty * s.hy).toBeGreaterThan(0.9999);
    expect(Math.hypot(shape.bx - shape.ax, shape.by - shape.ay)).toBeCloseTo(20, 1);
    const back = gateShape(proj, flipGate(g));
    expect(back.tx * s.hx + back.ty * s.hy).toBeLessThan(-0.9999);
    expect(flipGate(flipGate(g))).toEqual(g);
  });
});
