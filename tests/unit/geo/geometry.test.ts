import { describe, expect, it } from "vitest";
import { haversineM } from "@/lib/geo/haversine-m";
import { pointInPolygon } from "@/lib/geo/point-in-polygon";
import { runFindings } from "@/lib/findings/run-findings";
import { at } from "../../fixtures/at";

describe("haversineM", () => {
  it("Aviation Formulary (Ed Williams) worked example: LAX 33°57′N 118°24′W → JFK 40°38′N 73°47′W = 0.623585 rad", () => {
    const R = 6371008.8; // the sphere haversineM uses; the angle is independent of it
    const rad = haversineM(33 + 57 / 60, -(118 + 24 / 60), 40 + 38 / 60, -(73 + 47 / 60)) / R;
    expect(rad).toBeCloseTo(0.623585, 5);
    // 1 nm = 1 arc-minute → 0.623585 rad · (180·60/π) = 2144 nm (same source)
    expect(Math.round((rad * 180 * 60) / Math.PI)).toBe(2144);
  });
});

describe("pointInPolygon and a pit lane given as a GPS polygon", () => {
  // An invented pit lane: a 0.001° × 0.0002° box.
  const box = [
    { lat: 10, lon: 20 },
    { lat: 10.001, lon: 20 },
    { lat: 10.001, lon: 20.0002 },
    { lat: 10, lon: 20.0002 },
  ];
  it.each([
    [10.0005, 20.0001, true],
    [10.0005, 20.0003, false],
    [9.9999, 20.0001, false],
  ])("(%d, %d) inside: %s", (lat, lon, inside) => {
    expect(pointInPolygon(lat, lon, box)).toBe(inside);
  });

  it("pit_overspeed uses the polygon with the GPS position held between fixes", () => {
    // 10 s at 10 Hz moving north along lon 20.0001 at 25 m/s (90 km/h) through the box.
    const n = 100;
    const timeS = new Float64Array(n);
    const v = new Float32Array(n).fill(25);
    const lat = new Float32Array(n).fill(NaN);
    const lon = new Float32Array(n).fill(NaN);
    const mPerDeg = 6371008.8 * (Math.PI / 180);
    for (let i = 0; i < n; i++) {
      timeS[i] = i / 10;
      if (i % 2 === 0) {
        lat[i] = 9.9995 + (25 * at(timeS, i)) / mPerDeg;
        lon[i] = 20.0001;
      }
    }
    const f = runFindings({ timeS, channels: { speed_front: v, gps_lat: lat, gps_lon: lon } }, { track: { pitLane: box } }).filter((x) => x.kind === "pit_overspeed");
    expect(f).toHaveLength(1);
    // Enters at 55.6 m south of the box / 25 m/s = 2.22 s, leaves after 111.2 m more = 6.67 s;
    // fixes every 0.2 s, so the first fix inside is at 2.4 s and the last at 6.6 s (held to 6.7).
    expect(at(f, 0).startTimeS).toBeCloseTo(2.4, 6);
    expect(at(f, 0).endTimeS).toBeCloseTo(6.7, 6);
    expect(at(f, 0).measuredValue).toBe(25);
  });
});
