import { describe, expect, it } from "vitest";
import { detectLaps } from "@/lib/laps/detect-laps";
import { distanceChannel } from "@/lib/laps/distance-channel";
import { LOOP_M, TRACK, buildRoute, routeS, sampleSeries } from "./synthetic-session";
import { at } from "../../fixtures/at";

describe("distanceChannel", () => {
  const route = buildRoute([40, 41, 39.5]);
  // The analytic oval lap is LOOP_M = 2000 + 2π·100 m. At 10 Hz the GPS chords cut the bends:
  // arc − chord = R(θ − 2 sin(θ/2)) ≈ Rθ³/24 per chord, ~0.04 m per lap here.

  it("rescales integrated front-wheel distance to each lap's GPS length (wheel reads 3 % long)", () => {
    const s = sampleSeries(route, 100, 10, 1.03);
    const laps = detectLaps(s, TRACK);
    const d = distanceChannel(s, laps);
    expect(d.source).toBe("speed_front");
    for (let k = 0; k < laps.length; k++) {
      if (!at(laps, k).complete) continue;
      expect(Math.abs(at(d.lapLengthM, k) - LOOP_M)).toBeLessThan(0.1);
      expect(d.lapScale[k]).toBeCloseTo(1 / 1.03, 4);
    }
    // Continuous, non-decreasing, and matching the analytic arc length inside a flying lap.
    for (let i = 1; i < s.timeS.length; i++) expect(at(d.distanceM, i)).toBeGreaterThanOrEqual(at(d.distanceM, i - 1));
    const k = laps.findIndex((l) => l.complete);
    const mid = (at(laps, k).startTimeS + at(laps, k).endTimeS) / 2;
    const i = Math.round((mid - at(s.timeS, 0)) * 100);
    const truthLapDist = routeS(route, at(s.timeS, i)) - routeS(route, at(laps, k).startTimeS);
    expect(Math.abs(at(d.distanceM, i) - at(d.lapStartDistanceM, k) - truthLapDist)).toBeLessThan(0.1);
  });

  it("falls back to GPS path length without a wheel-speed channel", () => {
    const s = sampleSeries(route, 100, 10);
    const gpsOnly = { timeS: s.timeS, channels: { gps_lat: s.channels.gps_lat, gps_lon: s.channels.gps_lon } };
    const laps = detectLaps(gpsOnly, TRACK);
    const d = distanceChannel(gpsOnly, laps);
    expect(d.source).toBe("gps");
    for (let k = 0; k < laps.length; k++) if (at(laps, k).complete) expect(Math.abs(at(d.lapLengthM, k) - LOOP_M)).toBeLessThan(0.1);
    expect(d.distanceM[d.distanceM.length - 1]).toBeGreaterThan(3 * LOOP_M);
  });
});
