import { getPreciseDistance } from "geolib";
import { describe, expect, it } from "vitest";
import { toLocalMetres } from "@/lib/geo/to-local-metres";
import { at } from "../../fixtures/at";

// Invented origins (open sea / no circuit); three latitudes including a high one.
const ORIGINS = [
  { lat: 44.5, lon: -30.0 },
  { lat: -33.2, lon: 170.5 },
  { lat: 60.1, lon: -2.0 },
];

describe("toLocalMetres", () => {
  for (const origin of ORIGINS) {
    it(`stays within 0.1 % of geolib.getPreciseDistance (Vincenty, WGS-84) out to 3 km at lat ${origin.lat}`, () => {
      const p = toLocalMetres(origin);
      let worst = 0;
      // Points on a 3 km circle and a 1.5 km circle; distances from the origin and between points.
      const pts: { x: number; y: number }[] = [];
      for (let b = 0; b < 360; b += 15) {
        const r = b % 30 === 0 ? 3000 : 1500;
        pts.push({ x: r * Math.sin((b * Math.PI) / 180), y: r * Math.cos((b * Math.PI) / 180) });
      }
      for (const q of pts) {
        const ll = p.toLatLon(q.x, q.y);
        const ref = getPreciseDistance(origin, { latitude: ll.lat, longitude: ll.lon }, 0.0001);
        worst = Math.max(worst, Math.abs(Math.hypot(q.x, q.y) - ref) / ref);
      }
      for (let i = 0; i < pts.length; i++) {
        const j = (i + pts.length / 2) % pts.length; // opposite point: chords through the origin area
        const k = (i + 1) % pts.length; // neighbour: a chord away from the origin
        for (const m of [j, k]) {
          const a = p.toLatLon(at(pts, i).x, at(pts, i).y);
          const b = p.toLatLon(at(pts, m).x, at(pts, m).y);
          const local = Math.hypot(at(pts, i).x - at(pts, m).x, at(pts, i).y - at(pts, m).y);
          const ref = getPreciseDistance({ latitude: a.lat, longitude: a.lon }, { latitude: b.lat, longitude: b.lon }, 0.0001);
          worst = Math.max(worst, Math.abs(local - ref) / ref);
        }
      }
      expect(worst).toBeLessThan(0.001);
    });
  }

  it("is exact at the origin and round-trips through toLatLon", () => {
    const p = toLocalMetres(at(ORIGINS, 0));
    expect(p.xM(at(ORIGINS, 0).lon)).toBe(0);
    expect(p.yM(at(ORIGINS, 0).lat)).toBe(0);
    const ll = p.toLatLon(1234.5, -987.25);
    expect(p.xM(ll.lon)).toBeCloseTo(1234.5, 9);
    expect(p.yM(ll.lat)).toBeCloseTo(-987.25, 9);
  });

  it("uses WGS-84 radii: metres per degree of latitude at 45° matches Vincenty over ±0.005°", () => {
    // Reference: geolib.getPreciseDistance (Vincenty) over 0.01° of meridian, scaled to 1°.
    // Also the series 111 132.92 − 559.82·cos 2φ + 1.175·cos 4φ (m/degree; from memory) gives 111 131.75 at 45°.
    const p = toLocalMetres({ lat: 45, lon: 0 });
    const ref = getPreciseDistance({ latitude: 44.995, longitude: 0 }, { latitude: 45.005, longitude: 0 }, 0.00001) * 100;
    expect(Math.abs(p.metresPerDegLat - ref)).toBeLessThan(0.05);
    expect(Math.abs(p.metresPerDegLat - (111132.92 - 559.82 * Math.cos(Math.PI / 2) + 1.175 * Math.cos(Math.PI)))).toBeLessThan(0.1);
  });

  it("keeps longitudes continuous across the antimeridian", () => {
    const p = toLocalMetres({ lat: 0, lon: 179.999 });
    expect(p.xM(-179.999)).toBeCloseTo(0.002 * p.metresPerDegLon, 6);
  });

  it("rejects an invalid origin", () => {
    expect(() => toLocalMetres({ lat: 91, lon: 0 })).toThrow(RangeError);
  });
});
