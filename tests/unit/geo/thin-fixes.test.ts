/**
 * The one GPS thinning rule (track editor trace, lap outline, page outlines). Distances between
 * kept points are checked with geolib's getPreciseDistance (Vincenty's inverse formula on WGS-84,
 * a reference library), not with our own projection.
 */
import { describe, expect, it } from "vitest";
import { getPreciseDistance } from "geolib";
import { thinFixes } from "@/lib/geo/thin-fixes";
import { outlineFromFixes } from "@/lib/geo/outline-path";

// A straight run north at 1 m steps (1 m ≈ 1/111 195 ° of latitude on a sphere of mean radius;
// the check below measures with Vincenty, so the step need not be exact).
const N = 2000;
const lat = Float64Array.from({ length: N }, (_, i) => 45 + i / 111_195);
const lon = new Float64Array(N).fill(9);

describe("thinFixes", () => {
  it("keeps points at least the spacing apart, measured on the ellipsoid", () => {
    const pts = thinFixes(lat, lon, 8);
    expect(pts.length).toBeGreaterThan(200);
    for (let k = 1; k < pts.length; k++) {
      const d = getPreciseDistance({ latitude: pts[k - 1]![0], longitude: pts[k - 1]![1] }, { latitude: pts[k]![0], longitude: pts[k]![1] }, 0.001);
      // ≥ 8 m less the local projection's error (well under 0.5 % over a few km).
      expect(d).toBeGreaterThanOrEqual(7.95);
      expect(d).toBeLessThan(10);
    }
  });

  it("drops NaN, out-of-range and the (0, 0) a receiver writes without a fix", () => {
    const la = [0, NaN, 45, 0, 91, 45.001, 45.002];
    const lo = [0, 9, 9, 0, 9, 9, 9];
    expect(thinFixes(la, lo, 1)).toEqual([[45, 9], [45.001, 9], [45.002, 9]]);
  });

  it("caps the count by an even stride", () => {
    const pts = thinFixes(lat, lon, 1, 100);
    expect(pts.length).toBeLessThanOrEqual(100);
    expect(pts[0]).toEqual([lat[0], 9]);
  });

  it("page outlines now skip a leading (0, 0) too: the origin is the first real fix", () => {
    const o = outlineFromFixes([0, ...lat], [0, ...lon]);
    expect(o?.origin).toEqual({ lat: 45, lon: 9 });
    expect(Math.abs(o!.points[0]![0]) + Math.abs(o!.points[0]![1])).toBe(0);
  });
});
