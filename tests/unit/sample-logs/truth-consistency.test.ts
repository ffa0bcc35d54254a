/**
 * The generator's ground truth checked against independent computations on its own samples.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { getDistance } from "geolib";
import { generateSession, type GeneratedSession } from "@/sample-logs/generate-session";
import { BIKE } from "@/sample-logs/bike-model";
import { CIRCUIT, CLOSURE_ERROR_M } from "@/sample-logs/circuit";
import { at } from "../../fixtures/at";

let s: GeneratedSession;
const col = (role: string) => s.channels.find((c) => c.role === role)!.data;
const idx = (t: number) => Math.round(t * s.truth.sampleRateHz);
const G = 9.80665; // standard gravity (NIST SP 811)

beforeAll(() => {
  s = generateSession({ seed: 7, flyingLaps: 3, gpsRateHz: 20, brakeOnStraightLaps: [2], revCeilingLap: 3, pitOverspeed: "in" });
});

describe("circuit", () => {
  it("is a closed 4.0–4.5 km loop with a ~900 m main straight", () => {
    expect(CLOSURE_ERROR_M).toBeLessThan(0.01);
    expect(CIRCUIT.lengthM).toBeGreaterThan(4000);
    expect(CIRCUIT.lengthM).toBeLessThan(4500);
    const t1 = at(CIRCUIT.corners, 0);
    const t8 = at(CIRCUIT.corners, CIRCUIT.corners.length - 1);
    const mainStraightM = t1.startDistanceM + (CIRCUIT.lengthM - t8.endDistanceM);
    expect(mainStraightM).toBeGreaterThan(850);
    expect(mainStraightM).toBeLessThan(950);
  });

  it("centreline length measured with geolib matches the stated length", () => {
    // geolib getDistance: spherical, R = 6 378 137 m (geolib docs) — an outside library.
    let sum = 0;
    const c = CIRCUIT.centreline;
    for (let i = 1; i < c.length; i++) sum += getDistance(at(c, i - 1), at(c, i), 0.001);
    expect(Math.abs(sum - CIRCUIT.lengthM) / CIRCUIT.lengthM).toBeLessThan(0.002);
  });
});

describe("laps", () => {
  it("has an out-lap, the flying laps and an in-lap, back to back", () => {
    const laps = s.truth.laps;
    expect(laps.map((l) => l.kind)).toEqual(["out", "flying", "flying", "flying", "in"]);
    expect(at(laps, 0).flags.outLap).toBe(true);
    expect(at(laps, 4).flags.inLap).toBe(true);
    for (let k = 1; k < laps.length; k++) expect(at(laps, k).startS).toBe(at(laps, k - 1).endS);
    for (const l of laps.filter((x) => x.kind === "flying")) {
      expect(l.lapTimeMs).toBeCloseTo((l.endS - l.startS) * 1000, 6);
      const sectors = l.sectorTimesMs!;
      expect(sectors).toHaveLength(3);
      expect(sectors.reduce((a, b) => a + b, 0)).toBeCloseTo(l.lapTimeMs, 6);
      expect(l.distanceM).toBeCloseTo(CIRCUIT.lengthM, 0);
    }
  });

  it("GPS lap distance (sum of geolib distances between fixes) is the track length within 1.5 %", () => {
    // Outside reference: geolib.getDistance between consecutive fixes (spherical, R = 6 378 137 m).
    const lat = col("gps_lat"), lon = col("gps_lon");
    for (const l of s.truth.laps.filter((x) => x.kind === "flying")) {
      let sum = 0;
      let prev: { latitude: number; longitude: number } | null = null;
      for (let j = idx(l.startS); j <= idx(l.endS); j++) {
        if (Number.isNaN(lat[j])) continue;
        const p = { latitude: at(lat, j), longitude: at(lon, j) };
        if (prev) sum += getDistance(prev, p, 0.01);
        prev = p;
      }
      expect(Math.abs(sum - s.truth.trackLengthM) / s.truth.trackLengthM).toBeLessThan(0.015);
    }
  });

  it("start/finish crossings found from GPS fixes and the gate segment agree with the truth", () => {
    // Independent crossing finder: local equirectangular metres (mean Earth radius), segment
    // intersection between consecutive fixes, time interpolated along the step.
    const gate = CIRCUIT.gates.find((g) => g.name === "start_finish")!;
    const R = 6371008.8;
    const k = Math.cos((gate.a.lat * Math.PI) / 180);
    const xy = (la: number, lo: number): [number, number] => [((lo - gate.a.lon) * Math.PI * R * k) / 180, ((la - gate.a.lat) * Math.PI * R) / 180];
    const [bx, by] = xy(gate.b.lat, gate.b.lon);
    const lat = col("gps_lat"), lon = col("gps_lon");
    const found: number[] = [];
    let prevJ = -1;
    for (let j = 0; j < s.timeS.length; j++) {
      if (Number.isNaN(lat[j])) continue;
      if (prevJ >= 0) {
        const [px, py] = xy(at(lat, prevJ), at(lon, prevJ));
        const [qx, qy] = xy(at(lat, j), at(lon, j));
        const cross = (ax: number, ay: number, cx: number, cy: number) => ax * cy - ay * cx;
        const d1 = cross(bx, by, px, py), d2 = cross(bx, by, qx, qy);
        if (d1 * d2 < 0) {
          const u = d1 / (d1 - d2);
          const ix = px + u * (qx - px), iy = py + u * (qy - py);
          const along = (ix * bx + iy * by) / (bx * bx + by * by);
          if (along >= 0 && along <= 1) found.push(at(s.timeS, prevJ) + u * (at(s.timeS, j) - at(s.timeS, prevJ)));
        }
      }
      prevJ = j;
    }
    const truth = s.truth.gateCrossings.filter((g) => g.gate === "start_finish").map((g) => g.timeS);
    expect(found).toHaveLength(truth.length);
    found.forEach((t, i) => expect(Math.abs(t - at(truth, i))).toBeLessThan(0.02));
  });
});

describe("bike channels", () => {
  it("rpm = rear wheel speed / rolling circumference × overall ratio × 60", () => {
    // Tyre arithmetic (ISO 5751 / ETRTO practice, from memory): D = 25.4·rim + 2·width·aspect/100.
    const nominalRear = Math.PI * (25.4 * 17 + (2 * 190 * 55) / 100);
    const nominalFront = Math.PI * (25.4 * 17 + (2 * 120 * 70) / 100);
    expect(nominalRear).toBeCloseTo(2013.1, 1);
    expect(nominalFront).toBeCloseTo(1884.3, 1);
    // Rolling circumference a few % under nominal (common practice).
    expect(BIKE.rearCircumferenceM * 1000 / nominalRear).toBeGreaterThan(0.95);
    expect(BIKE.rearCircumferenceM * 1000 / nominalRear).toBeLessThan(0.99);
    expect(BIKE.frontCircumferenceM * 1000 / nominalFront).toBeGreaterThan(0.95);

    const rpm = col("engine_rpm"), gear = col("gear"), rear = col("speed_rear"), front = col("speed_front");
    let checked = 0;
    let worstRel = 0, minSlip = Infinity, maxSlip = -Infinity;
    for (let j = 0; j < s.timeS.length; j++) {
      if (at(gear, j) < 1 || at(front, j) < 15) continue; // clutch fully engaged
      const ratio = BIKE.primaryRatio * at(BIKE.gearRatios, at(gear, j) - 1) * (BIKE.rearSprocket / BIKE.frontSprocket);
      const fromRear = (at(rear, j) / BIKE.rearCircumferenceM) * ratio * 60;
      worstRel = Math.max(worstRel, Math.abs(at(rpm, j) - fromRear) / fromRear);
      // Against the front wheel, the difference is the rear slip.
      const fromFront = (at(front, j) / BIKE.rearCircumferenceM) * ratio * 60;
      minSlip = Math.min(minSlip, at(rpm, j) / fromFront - 1);
      maxSlip = Math.max(maxSlip, at(rpm, j) / fromFront - 1);
      checked++;
    }
    expect(checked).toBeGreaterThan(20000);
    expect(worstRel).toBeLessThan(1e-4); // Float32 storage only
    expect(minSlip).toBeGreaterThan(-0.035);
    expect(maxSlip).toBeLessThan(0.125);
  });

  it("lean angle at each apex is atan(v²/(g·R)) for the corner's radius", () => {
    const lean = col("lean_angle"), front = col("speed_front");
    let checked = 0;
    for (const lap of s.truth.laps) {
      for (const c of lap.corners) {
        const corner = CIRCUIT.corners.find((x) => x.name === c.name)!;
        const j = idx(c.apexS);
        const expected = (Math.atan((at(front, j) ** 2) / (G * corner.radiusM)) * 180) / Math.PI;
        expect(Math.abs(Math.abs(at(lean, j)) - expected)).toBeLessThan(1.0);
        // Left-hand corners lean left (negative), right-hand corners right.
        expect(Math.sign(at(lean, j))).toBe(corner.direction === "left" ? -1 : 1);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(25);
  });

  it("drive slip: 5–12 % peaks on exits, 0.5–2.5 % steady on straights", () => {
    const front = col("speed_front"), rear = col("speed_rear"), thr = col("throttle");
    let peak = 0;
    const straight: number[] = [];
    for (let j = idx(at(s.truth.laps, 1).startS); j < idx(at(s.truth.laps, 3).endS); j++) {
      if (at(front, j) < 30 / 3.6) continue;
      const slip = (at(rear, j) - at(front, j)) / at(front, j); // SAE J670 form, front wheel as ground reference
      peak = Math.max(peak, slip);
      if (at(front, j) > 200 / 3.6 && at(thr, j) > 95) straight.push(slip);
    }
    straight.sort((a, b) => a - b);
    expect(peak).toBeGreaterThan(0.05);
    expect(peak).toBeLessThanOrEqual(0.125);
    const median = straight[straight.length >> 1];
    expect(median).toBeGreaterThan(0.005);
    expect(median).toBeLessThan(0.025);
  });

  it("suspension stays inside its strokes, with dive under braking to ~100–110 mm", () => {
    const fork = col("fork_travel"), shock = col("shock_travel");
    let forkMax = 0, shockMax = 0, shockMin = Infinity;
    for (let j = 0; j < s.timeS.length; j++) {
      forkMax = Math.max(forkMax, at(fork, j) * 1000);
      shockMax = Math.max(shockMax, at(shock, j) * 1000);
      shockMin = Math.min(shockMin, at(shock, j) * 1000);
    }
    expect(forkMax).toBeGreaterThan(95);
    expect(forkMax).toBeLessThan(BIKE.forkStrokeMm);
    expect(shockMax).toBeLessThan(BIKE.shockStrokeMm);
    expect(shockMin).toBeGreaterThan(0);
  });

  it("brake onset points differ between laps by a few metres, as riders do", () => {
    const flying = s.truth.laps.filter((l) => l.kind === "flying");
    const t1 = flying.map((l) => l.corners.find((c) => c.name === "Turn 1")!.brakeOnsetDistanceM!);
    const spread = Math.max(...t1) - Math.min(...t1);
    expect(spread).toBeGreaterThan(1);
    expect(spread).toBeLessThan(40);
    for (const v of t1) expect(v).toBeLessThan(at(CIRCUIT.corners, 0).apexDistanceM);
  });
});

describe("planted events and clean laps", () => {
  const within = (t: number, kind: string, pad = 0) =>
    s.truth.events.some((e) => e.kind === kind && t >= e.startS - pad && t <= e.endS + pad);

  it("has exactly the planted events", () => {
    expect(s.truth.events.map((e) => `${e.kind}@${e.lap}`).sort()).toEqual(["brake_on_straight@2", "pit_overspeed@4", "rev_ceiling@3"]);
  });

  it("brake on the straight: 3–6 bar with the throttle > 80 % at the truth's times; none elsewhere", () => {
    const bf = col("brake_front"), thr = col("throttle");
    const e = s.truth.events.find((x) => x.kind === "brake_on_straight")!;
    let peak = 0;
    for (let j = idx(e.startS); j <= idx(e.endS); j++) {
      expect(bf[j]).toBeGreaterThanOrEqual(1e5);
      expect(thr[j]).toBeGreaterThan(80);
      peak = Math.max(peak, at(bf, j));
    }
    expect(peak).toBe(e.measured.value);
    expect(peak).toBeGreaterThan(3e5);
    expect(peak).toBeLessThan(6e5);
    // On the main straight (last 520 m of the lap).
    expect(e.trackDistanceM).toBeGreaterThan(CIRCUIT.lengthM - 520);
    let overlapping = 0;
    for (let j = 0; j < s.timeS.length; j++) {
      if (within(at(s.timeS, j), "brake_on_straight", 0.3)) continue;
      if (at(thr, j) > 10 && at(bf, j) >= 0.5e5) overlapping++;
    }
    expect(overlapping).toBe(0);
  });

  it("rev ceiling: one touch above 14 300 rpm for ~0.3 s; below the ceiling everywhere else", () => {
    const rpm = col("engine_rpm");
    const e = s.truth.events.find((x) => x.kind === "rev_ceiling")!;
    expect(e.endS - e.startS).toBeGreaterThan(0.2);
    expect(e.endS - e.startS).toBeLessThan(0.45);
    let peak = 0;
    for (let j = idx(e.startS); j <= idx(e.endS); j++) {
      expect(rpm[j]).toBeGreaterThan(BIKE.revCeilingRpm);
      peak = Math.max(peak, at(rpm, j));
    }
    expect(peak).toBeGreaterThanOrEqual(14300);
    let maxElsewhere = 0;
    for (let j = 0; j < s.timeS.length; j++) if (!within(at(s.timeS, j), "rev_ceiling")) maxElsewhere = Math.max(maxElsewhere, at(rpm, j));
    expect(maxElsewhere).toBeLessThan(BIKE.revCeilingRpm);
    expect(maxElsewhere).toBeGreaterThan(BIKE.shiftRpm - 100); // clean shifts do reach the shift point
  });

  it("pit lane at or under 60 km/h except the planted ~72 km/h overspeed", () => {
    const front = col("speed_front"), gps = col("gps_speed");
    const limit = CIRCUIT.pitLane.speedLimitMps;
    const e = s.truth.events.find((x) => x.kind === "pit_overspeed")!;
    expect(e.measured.value * 3.6).toBeGreaterThan(70);
    expect(e.measured.value * 3.6).toBeLessThan(74);
    let peakInEvent = 0;
    for (const p of s.truth.pitLane) {
      for (let j = idx(p.fromS); j <= idx(p.toS); j++) {
        if (within(at(s.timeS, j), "pit_overspeed")) {
          peakInEvent = Math.max(peakInEvent, at(front, j));
          continue;
        }
        if (within(at(s.timeS, j), "pit_overspeed", 1)) continue;
        expect(front[j]).toBeLessThanOrEqual(limit);
        if (!Number.isNaN(gps[j])) expect(gps[j]).toBeLessThanOrEqual(limit);
      }
    }
    expect(peakInEvent * 3.6).toBeGreaterThan(70);
  });

  it("a session planted with nothing has no events", () => {
    const clean = generateSession({ seed: 3, flyingLaps: 1, brakeOnStraightLaps: [], revCeilingLap: null, pitOverspeed: null });
    expect(clean.truth.events).toEqual([]);
  });
});
