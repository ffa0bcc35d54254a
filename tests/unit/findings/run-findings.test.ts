import { describe, expect, it } from "vitest";
import type { SessionSeries } from "@/lib/channels/roles";
import { runFindings } from "@/lib/findings/run-findings";
import { CAUTION_TEXT } from "@/lib/findings/caution";
import { DEFAULT_THRESHOLDS } from "@/lib/findings/thresholds";
import { FINDING_KINDS, type FindingKind, type LapSpan } from "@/lib/findings/types";
import { at } from "../../fixtures/at";

const BAR = 1e5; // NIST SP 811 App. B: bar → 100 000 Pa (exact)
const KMH = 1 / 3.6; // NIST SP 811 App. B: km/h → m/s (exact)
const M_PER_DEG_LAT = 6371008.8 * (Math.PI / 180); // metres per degree on the IUGG mean sphere

/**
 * An invented 120 s session at 20 Hz, GPS at 10 Hz, three laps of 40 s; every channel keeps
 * changing. `plant` switches on one event of each kind at a known time.
 */
function makeSession(plant: boolean): { series: SessionSeries; laps: LapSpan[] } {
  const times: number[] = [];
  for (let i = 0; ; i++) {
    let t = i * 0.05;
    if (plant && t >= 105) t += 0.5; // clock gap: 104.95 → 105.5
    if (t >= 120) break;
    times.push(Math.round(t * 1e6) / 1e6);
  }
  const n = times.length;
  const timeS = Float64Array.from(times);
  const front = new Float32Array(n);
  const rear = new Float32Array(n);
  const rpm = new Float32Array(n);
  const thr = new Float32Array(n);
  const brake = new Float32Array(n);
  const lean = new Float32Array(n);
  const fork = new Float32Array(n);
  const lat = new Float32Array(n).fill(NaN);
  const lon = new Float32Array(n).fill(NaN);
  let dist = 0;
  for (let i = 0; i < n; i++) {
    const t = at(timeS, i);
    const inPit = t >= 110;
    let v = inPit ? 14 + 0.5 * Math.sin(t) : 45 + 20 * Math.sin(0.3 * t);
    if (plant && t >= 112 && t < 113) v = 20; // 72 km/h in a 60 km/h pit lane
    front[i] = v;
    rear[i] = v * (1 + 0.01 * Math.sin(2 * t));
    rpm[i] = 9000 + 3000 * Math.sin(0.3 * t);
    thr[i] = 55 + 40 * Math.sin(0.3 * t + 0.2);
    lean[i] = 30 * Math.sin(0.5 * t);
    fork[i] = 0.06 + 0.03 * Math.sin(1.1 * t);
    if (plant && t >= 50 && t < 50.5) {
      brake[i] = 5 * BAR; // brake on the straight
      thr[i] = 80;
    }
    if (plant && t >= 60 && t < 60.2) rpm[i] = 14300; // rev ceiling
    if (plant && t >= 70 && t < 70.5) {
      rear[i] = v * 1.2; // 20 % slip
      thr[i] = 90;
    }
    if (plant && t >= 75 && t < 75.1) fork[i] = 0.119; // 1 mm short of a 120 mm stroke
    if (plant && t >= 82 && t < 104.5) lean[i] = 12.3; // lean sensor stuck for 22.5 s
    if (i > 0) dist += v * (t - at(timeS, i - 1));
    const isFix = Math.round(t * 20) % 2 === 0;
    const dropout = plant && t > 95 && t < 97;
    if (isFix && !dropout) {
      lat[i] = 10 + dist / M_PER_DEG_LAT;
      lon[i] = 20;
      if (plant && Math.abs(t - 100) < 1e-6) lat[i]! += 50 / M_PER_DEG_LAT; // 50 m jump
    }
  }
  const laps: LapSpan[] = [
    { number: 1, startTimeS: 0, endTimeS: 40 },
    { number: 2, startTimeS: 40, endTimeS: 80 },
    { number: 3, startTimeS: 80, endTimeS: 120.1 },
  ];
  return {
    series: {
      timeS,
      channels: { speed_front: front, speed_rear: rear, engine_rpm: rpm, throttle: thr, brake_front: brake, lean_angle: lean, fork_travel: fork, gps_lat: lat, gps_lon: lon },
    },
    laps,
  };
}

// The track's own pit limit (60 km/h) and the bike's own rev ceiling (14 000 rpm): neither has a
// default that fits every track and engine.
const ctxFor = (laps: LapSpan[]) => ({
  laps,
  track: { pitLaneTimes: [{ startTimeS: 110, endTimeS: 120 }], pitSpeedLimitMps: 60 * KMH },
  bike: { forkStrokeM: 0.12, slip: { zeroRatio: 1 }, revCeilingRpm: 14000 },
});

describe("runFindings on a session with one planted event of each kind", () => {
  const { series, laps } = makeSession(true);
  const findings = runFindings(series, ctxFor(laps));

  it.each<[FindingKind, number, number, number, number, string, boolean]>([
    // [kind, lap, start s, end s, measured, unit, carries the caution]
    ["brake_on_straight", 2, 50, 50.45, 5 * BAR, "Pa", true],
    ["rev_ceiling", 2, 60, 60.15, 14300, "rpm", true],
    ["wheel_spin", 2, 70, 70.45, 0.2, "", false],
    ["bottoming", 2, 75, 75.05, 0.119, "m", true],
    ["sensor_flat", 3, 82, 104.45, 22.45, "s", false],
    ["gps_dropout", 3, 95, 97, 2, "s", false],
    // 50 m jump plus the bike's own travel in 0.1 s at v(100 s) = 45 + 20·sin(30) m/s
    ["gps_jump", 3, 99.9, 100.1, (50 + (45 + 20 * Math.sin(30)) * 0.1) / 0.1, "m/s", false],
    ["clock_gap", 3, 104.95, 105.5, 0.55, "s", false],
    ["pit_overspeed", 3, 112, 112.95, 20, "m/s", false],
  ])("%s on lap %d from %d s to %d s", (kind, lap, start, end, measured, unit, caution) => {
    const mine = findings.filter((f) => f.kind === kind);
    expect(mine).toHaveLength(1); // consecutive samples merged into one finding
    const f = at(mine, 0);
    expect(f.lapNumber).toBe(lap);
    expect(f.startTimeS).toBeCloseTo(start, 6);
    expect(f.endTimeS).toBeCloseTo(end, 6);
    expect(f.unit).toBe(unit);
    // gps_jump within 0.5 %: Float32 latitude near 10° resolves ~0.1 m.
    expect(Math.abs(f.measuredValue - measured) / measured).toBeLessThan(kind === "gps_jump" ? 0.005 : 1e-5);
    expect(f.caution).toBe(caution ? CAUTION_TEXT : undefined);
    expect(f.message.length).toBeGreaterThan(10);
  });

  it("finds nothing else", () => {
    expect(findings).toHaveLength(9);
  });

  it("sensor_flat names the stuck channel", () => {
    expect(findings.find((f) => f.kind === "sensor_flat")?.channel).toBe("lean_angle");
  });
});

describe("runFindings on the same session without plants", () => {
  it("finds nothing", () => {
    const { series, laps } = makeSession(false);
    expect(runFindings(series, ctxFor(laps))).toEqual([]);
  });
});

describe("thresholds", () => {
  const { series, laps } = makeSession(true);
  it("track pit limit of 40 km/h (common practice in some national series) catches the whole pit lane run", () => {
    const f = runFindings(series, { ...ctxFor(laps), track: { pitSpeedLimitMps: 40 * KMH, pitLaneTimes: [{ startTimeS: 110, endTimeS: 120 }] } });
    const pit = f.filter((x) => x.kind === "pit_overspeed");
    // 14 ± 0.5 m/s = 50–52 km/h everywhere in the lane is above 40 km/h: one long finding.
    expect(pit).toHaveLength(1);
    expect(at(pit, 0).startTimeS).toBeCloseTo(110, 6);
    expect(at(pit, 0).thresholdValue).toBeCloseTo(40 / 3.6, 9);
  });
  it("the bike's rev ceiling overrides the default; team settings override defaults", () => {
    expect(runFindings(series, { ...ctxFor(laps), bike: { ...ctxFor(laps).bike, revCeilingRpm: 14500 } }).some((x) => x.kind === "rev_ceiling")).toBe(false);
    expect(runFindings(series, { ...ctxFor(laps), thresholds: { brakeOnStraightPressurePa: 6 * BAR } }).some((x) => x.kind === "brake_on_straight")).toBe(false);
  });
  it("no pit-lane information → no pit finding; no stroke → no bottoming", () => {
    const f = runFindings(series, { laps });
    expect(f.some((x) => x.kind === "pit_overspeed" || x.kind === "bottoming")).toBe(false);
  });
  it("every default has a unit, a one-line rationale and a source", () => {
    for (const d of Object.values(DEFAULT_THRESHOLDS)) {
      expect(d.rationale.length).toBeGreaterThan(10);
      expect(d.rationale).not.toMatch(/\n/);
      expect(["common practice", "Lapbench default"]).toContain(d.source);
    }
    // Common-practice trade fact: pit limits are 40 or 60 km/h; the default is the lower, safer one.
    expect(DEFAULT_THRESHOLDS.pitSpeedLimitMps.value * 3.6).toBeCloseTo(40, 9);
    // No published source: our own settings, labelled so.
    expect(DEFAULT_THRESHOLDS.brakeOnStraightPressurePa.value / BAR).toBe(2);
    expect(DEFAULT_THRESHOLDS.brakeOnStraightPressurePa.source).toBe("Lapbench default");
    expect(DEFAULT_THRESHOLDS.brakeOnStraightThrottlePct.source).toBe("Lapbench default");
    // No rev ceiling is assumed (a class's figure is set on the bike).
    expect("revCeilingRpm" in DEFAULT_THRESHOLDS).toBe(false);
  });
  it("the caution says symptom not diagnosis, inspect, and who does the work (service data, technical rules, qualified mechanics)", () => {
    expect(CAUTION_TEXT).toMatch(/symptom, not a diagnosis/);
    expect(CAUTION_TEXT).toMatch(/Inspect the part before the bike goes out again/);
    expect(CAUTION_TEXT).toMatch(/manufacturer's service data.*technical rules.*qualified mechanics/);
    expect(FINDING_KINDS).toHaveLength(9);
  });
});

describe("honest defaults: nothing assumed that the bike or the track does not say", () => {
  const { series, laps } = makeSession(true);
  it("a bike with no rev ceiling set gets no rev-ceiling finding, even at 14 300 rpm (no default ceiling is assumed)", () => {
    const { revCeilingRpm: _none, ...bike } = ctxFor(laps).bike;
    void _none;
    expect(runFindings(series, { ...ctxFor(laps), bike }).some((x) => x.kind === "rev_ceiling")).toBe(false);
    // The same session with the ceiling set finds it: the check itself works.
    expect(runFindings(series, ctxFor(laps)).some((x) => x.kind === "rev_ceiling")).toBe(true);
  });
  it("brake on a straight needs the bike upright and fast: the same pressure at 40° lean, or below the speed floor, is not found", () => {
    const leaning: SessionSeries = { ...series, channels: { ...series.channels, lean_angle: Float32Array.from(series.channels.lean_angle!, (x, i) => (series.timeS[i] >= 50 && series.timeS[i] < 50.5 ? 40 : x)) } };
    expect(runFindings(series, ctxFor(laps)).some((x) => x.kind === "brake_on_straight")).toBe(true);
    expect(runFindings(leaning, ctxFor(laps)).some((x) => x.kind === "brake_on_straight")).toBe(false);
    // At t = 50 s the planted speed is 45 + 20·sin(15) ≈ 58 m/s; a 70 m/s floor puts it below.
    expect(runFindings(series, { ...ctxFor(laps), thresholds: { brakeOnStraightMinSpeedMps: 70 } }).some((x) => x.kind === "brake_on_straight")).toBe(false);
  });
});
