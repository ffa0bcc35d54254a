import { describe, expect, it } from "vitest";
import { buildAnalysisBase } from "@/lib/analysis/analysis-base";
import { computeBrief } from "@/lib/analysis/brief-page";
import { toLocalMetres } from "@/lib/geo/to-local-metres";
import { alignToReference } from "@/lib/braking/align-to-reference";
import type { SessionSeries } from "@/lib/channels/roles";
import type { Lap } from "@/lib/laps/types";

/**
 * Two laps of an invented circular track (no real place: a circle of radius 500 m around an
 * arbitrary point), the second ridden on a line 1.5 m wider, so it is 0.3 % longer
 * (circumference 2πr: 2π·501.5 / 2π·500 = 1.003). Both laps brake at the same angle around the
 * circle, i.e. at the same place on the track. Compared by each lap's own distance, that place is
 * 0.003 · (0.85 · 2π · 500 m) ≈ 8 m further along the wider lap; the brief must still say
 * "about the same point". Geometry: arc length s = r·θ.
 */
const BAR = 1e5; // NIST SP 811 App. B: 1 bar = 100 000 Pa (exact)
const TWO_PI = 2 * Math.PI;
const ORIGIN = { lat: 45.1, lon: 7.3 };
const BRAKE_AT = 0.85 * TWO_PI;
const APEX_AT = 0.9 * TWO_PI;

/** Speed (m/s) by angle: 50 m/s, braking linearly to 20 m/s from `brakeAt` to the apex, back up to 50 within 0.05 rad. */
function speedAt(theta: number, brakeAt: number): number {
  if (theta >= brakeAt && theta <= APEX_AT) return 50 - (30 * (theta - brakeAt)) / (APEX_AT - brakeAt);
  if (theta > APEX_AT && theta < APEX_AT + 0.05) return 20 + (30 * (theta - APEX_AT)) / 0.05;
  return 50;
}

function session(laps: { radiusM: number; brakeAt: number }[]) {
  const proj = toLocalMetres(ORIGIN);
  const t: number[] = [];
  const lat: number[] = [];
  const lon: number[] = [];
  const v: number[] = [];
  const p: number[] = [];
  const lapRows: Lap[] = [];
  let time = 0;
  for (const [k, l] of laps.entries()) {
    const steps = Math.round((TWO_PI * l.radiusM) / 1); // one sample per ~1 m
    const start = time;
    for (let i = 0; i < steps; i++) {
      const theta = (i / steps) * TWO_PI;
      const speed = speedAt(theta, l.brakeAt);
      const ll = proj.toLatLon(l.radiusM * Math.sin(theta), l.radiusM * Math.cos(theta) - l.radiusM);
      t.push(time);
      lat.push(ll.lat);
      lon.push(ll.lon);
      v.push(speed);
      p.push(theta >= l.brakeAt && theta <= APEX_AT - 0.01 ? 10 * BAR : 0);
      time += (TWO_PI * l.radiusM) / steps / speed;
    }
    lapRows.push({ number: k + 1, startTimeS: start, endTimeS: time, lapTimeMs: Math.round((time - start) * 1000), sectorTimesMs: [Math.round((time - start) * 1000)], outLap: false, inLap: false, pitPass: false, complete: true });
  }
  // The last lap ends on one more sample at the line.
  t.push(time);
  const last = proj.toLatLon(0, 0);
  lat.push(last.lat);
  lon.push(last.lon);
  v.push(50);
  p.push(0);
  const series: SessionSeries = {
    timeS: Float64Array.from(t),
    channels: {
      speed_front: Float32Array.from(v),
      gps_speed: Float32Array.from(v),
      brake_front: Float32Array.from(p),
      gps_lat: Float64Array.from(lat),
      gps_lon: Float64Array.from(lon),
    },
  };
  const base = buildAnalysisBase(
    { sessionId: 1, title: "Alignment", laps: lapRows, gates: null, bike: null, trackThresholds: {}, namedCorners: [{ name: "Turn 1", distanceM: APEX_AT * 500 }] },
    series,
  );
  return computeBrief(base, { lap: 2 });
}

describe("rider brief: braking points compared where they are on the track", () => {
  it("the same braking place on a lap 0.3 % longer reads as the same point, not ~8 m later", () => {
    const brief = session([
      { radiusM: 500, brakeAt: BRAKE_AT },
      { radiusM: 501.5, brakeAt: BRAKE_AT },
    ]);
    expect(brief.available).toBe(true);
    expect(brief.bestLap).toBe(1);
    const c = brief.corners.find((x) => x.name === "Turn 1")!;
    expect(c.earlierM).not.toBeNull();
    // Sampled every ~1 m: the onset is known to about a metre on each lap.
    expect(Math.abs(c.earlierM!)).toBeLessThan(2);
    expect(c.text).toMatch(/about the same point/);
  });

  it("braking 15 m later on the wider lap still reads as about 15 m later", () => {
    // 15 m of arc on the wider line is 15/501.5 rad; projected onto the best lap's circle that is 15·500/501.5 ≈ 14.96 m.
    const brief = session([
      { radiusM: 500, brakeAt: BRAKE_AT },
      { radiusM: 501.5, brakeAt: BRAKE_AT + 15 / 501.5 },
    ]);
    const c = brief.corners.find((x) => x.name === "Turn 1")!;
    expect(c.earlierM!).toBeGreaterThan(-17);
    expect(c.earlierM!).toBeLessThan(-13);
    expect(c.text).toMatch(/1[3-7] m later/);
  });
});

describe("alignToReference without GPS", () => {
  it("scales by the ratio of the two laps' lengths: 2 678 m on a 3 009.4 m lap is 2 670 m on a 3 000 m one", () => {
    // Proportion: 2678 · 3000 / 3009.4 = 2669.66 m (a lap 0.313 % longer, the same place).
    const lap = { distanceM: [0, 1000, 2000, 3009.4] };
    const ref = { distanceM: [0, 1000, 2000, 3000] };
    const point = { name: "Turn 1", braked: true, onsetDistanceM: 2678, releaseDistanceM: 2800, peakPressurePa: 1e6, minSpeedMps: 20, apexDistanceM: 2830, onsetToApexM: 152 };
    const [a] = alignToReference([point], lap, ref);
    expect(a.onsetDistanceM!).toBeCloseTo((2678 * 3000) / 3009.4, 6);
    expect(a.apexDistanceM).toBeCloseTo((2830 * 3000) / 3009.4, 6);
    // The lap's own braking distance is measured along its own path and stays as it was.
    expect(a.onsetToApexM).toBe(152);
  });
});
