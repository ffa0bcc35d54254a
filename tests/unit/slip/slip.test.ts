import { DEFAULT_THRESHOLDS } from "@/lib/findings/thresholds";
import { describe, expect, it } from "vitest";
import type { SessionSeries } from "@/lib/channels/roles";
import { slipRatio } from "@/lib/slip/slip-ratio";
import { effectiveRollingRadiusM } from "@/lib/slip/effective-rolling-radius";
import { calibrateSlipZero } from "@/lib/slip/calibrate-slip-zero";
import { driveSlip } from "@/lib/slip/drive-slip";
import { spinEvents } from "@/lib/slip/spin-events";
import { cornerExitSlip } from "@/lib/slip/corner-exit-slip";
import { slipThrottleScatter } from "@/lib/slip/slip-throttle-scatter";
import { at } from "../../fixtures/at";

const KMH = 1 / 3.6; // NIST SP 811 App. B: km/h → m/s = 1/3.6 (exact)

describe("slipRatio — SAE J670 / ISO 8855 / Pacejka ch.1 longitudinal slip, front wheel as ground reference (formula from memory; standards not open)", () => {
  it.each([
    // [rear km/h, front km/h, expected, source]
    [110, 100, 0.1, "SAE J670 slip ratio worked case (formula from memory): front 100, rear 110 → 0.10 (divide by the reference/ground speed, not 10/110)"],
    [100, 100, 0, "free rolling: Ω·re = Vx → 0 (definition)"],
    [0, 100, -1, "locked rear wheel → −1 (SAE J670 definition)"],
    [90, 100, -0.1, "braking: negative (definition)"],
  ])("rear %d km/h, front %d km/h → %d (%s)", (rear, front, expected) => {
    expect(slipRatio(rear * KMH, front * KMH)).toBeCloseTo(expected, 12);
  });
  it("is not defined without forward speed", () => {
    expect(slipRatio(5, 0)).toBeNaN();
  });
});

describe("effectiveRollingRadiusM — simple toroidal crown model r0 − rc(1 − cos φ)", () => {
  it.each([
    // cos 60° = 1/2 exactly (trigonometry): r0 0.32, rc 0.1 → 0.32 − 0.05 = 0.27
    [0.32, 0.1, 60, 0.27],
    [0.32, 0.1, 0, 0.32],
    // cos 90° = 0 → r0 − rc
    [0.32, 0.1, 90, 0.22],
  ])("r0 %d m, crown %d m, lean %d° → %d m (plain trigonometry)", (r0, rc, lean, expected) => {
    expect(effectiveRollingRadiusM(r0, rc, lean)).toBeCloseTo(expected, 12);
  });
});

/** A synthetic straight: constant-speed cruise, then a hard drive with spin. */
function makeSeries(opts: { mismatch: number; n?: number }): SessionSeries {
  const n = opts.n ?? 400;
  const dt = 0.01;
  const timeS = new Float64Array(n);
  const front = new Float32Array(n);
  const rear = new Float32Array(n);
  const throttle = new Float32Array(n);
  const lean = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    timeS[i] = i * dt;
    front[i] = 50;
    // Cruise: no slip, the rear's entered circumference is off by `mismatch`.
    let trueSlip = 0;
    throttle[i] = 30;
    if (i >= 300 && i < 340) {
      trueSlip = 0.2; // spin burst
      throttle[i] = 90;
    }
    rear[i] = 50 * (1 + trueSlip) * (1 + opts.mismatch);
  }
  return { timeS, channels: { speed_front: front, speed_rear: rear, throttle, lean_angle: lean } };
}

describe("calibrateSlipZero and driveSlip", () => {
  it("finds the circumference mismatch as the median ratio on steady running and removes it", () => {
    const s = makeSeries({ mismatch: 0.02 });
    const cal = calibrateSlipZero(s);
    expect(cal.applied).toBe(true);
    // Float32 storage of 51 m/s and 50 m/s: 51/50 = 1.02 to ~1e-7.
    expect(cal.ratio).toBeCloseTo(1.02, 6);
    const slip = driveSlip(s);
    expect(slip[100]).toBeCloseTo(0, 6);
    // During the burst: rear = 50·1.2·1.02, zero ratio 1.02 → slip (60 − 50)/50 = 0.2 (definition)
    expect(slip[320]).toBeCloseTo(0.2, 5);
  });

  it("never calibrates on wide-open throttle: steady spin at full throttle is not taken as zero", () => {
    // 4 s of steady running at 100 % throttle with a steady 6 % spin, then 1 s at 30 % throttle with none.
    const n = 500;
    const s = makeSeries({ mismatch: 0, n });
    for (let i = 0; i < n; i++) {
      const wide = i < 400;
      s.channels.throttle![i] = wide ? 100 : 30;
      s.channels.speed_rear![i] = 50 * (wide ? 1.06 : 1);
    }
    const cal = calibrateSlipZero(s);
    // Only the part-throttle second qualifies: its ratio is 1 (definition), not the spinning 1.06.
    expect(cal.applied).toBe(true);
    expect(cal.ratio).toBeCloseTo(1, 6);
    expect(driveSlip(s)[100]).toBeCloseTo(0.06, 5);
  });

  it("a ratio outside 0.9–1.1 is not applied and says why (a dead or wrong wheel sensor)", () => {
    const s = makeSeries({ mismatch: 0 });
    s.channels.speed_rear!.fill(5); // rear sensor reads a tenth of the front
    const cal = calibrateSlipZero(s);
    expect(cal.applied).toBe(false);
    expect(cal.ratio).toBe(1);
    expect(cal.outOfBoundsRatio).toBeCloseTo(0.1, 6);
    expect(cal.reason).toMatch(/outside 0.9–1.1/);
  });

  it("without calibration the mismatch shows as slip", () => {
    const slip = driveSlip(makeSeries({ mismatch: 0.02 }), { calibrate: false });
    expect(slip[100]).toBeCloseTo(0.02, 6);
  });

  it("gives NaN below 30 km/h front speed (Lapbench default)", () => {
    const s = makeSeries({ mismatch: 0 });
    s.channels.speed_front![10] = 29 * KMH;
    s.channels.speed_front![11] = 31 * KMH;
    const slip = driveSlip(s, { zeroRatio: 1 });
    expect(slip[10]).toBeNaN();
    expect(Number.isFinite(slip[11])).toBe(true);
  });

  it("lean correction of both tyres gives a true 0 % slip at 45° lean (r_eff = r0 − rc·(1 − cos φ) per tyre)", () => {
    // Both wheels roll at the ground speed V without slip; each sensor counts revolutions
    // ω = V / r_eff and reports ω·r0. Tyres: rear r0 0.32 m, crown 0.10 m; front r0 0.30 m,
    // crown 0.06 m (geometry of the toroidal crown model, plain trigonometry):
    // rear r_eff = 0.32 − 0.10·(1 − cos 45°) = 0.290711 m; front 0.30 − 0.06·(1 − cos 45°) = 0.282426 m.
    const V = 40;
    const c45 = Math.cos(Math.PI / 4);
    const reffR = 0.32 - 0.1 * (1 - c45);
    const reffF = 0.3 - 0.06 * (1 - c45);
    expect(reffR).toBeCloseTo(0.290711, 6);
    expect(reffF).toBeCloseTo(0.282426, 6);
    const s = makeSeries({ mismatch: 0 });
    s.channels.lean_angle!.fill(45);
    s.channels.speed_front!.fill((V * 0.3) / reffF);
    s.channels.speed_rear!.fill((V * 0.32) / reffR);
    const lean = { rearRadiusM: 0.32, rearCrownRadiusM: 0.1, frontRadiusM: 0.3, frontCrownRadiusM: 0.06 };
    expect(driveSlip(s, { zeroRatio: 1, lean })[100]).toBeCloseTo(0, 6);
    // Uncorrected, the same true 0 % reads (r0R/reffR)/(r0F/reffF) − 1 = +3.6 %; correcting the rear
    // alone would read reffF/r0F − 1 = −5.9 %, worse still (same geometry).
    expect(driveSlip(s, { zeroRatio: 1 })[100]).toBeCloseTo((0.32 / reffR) / (0.3 / reffF) - 1, 5);
    expect((0.32 / reffR) / (0.3 / reffF) - 1).toBeCloseTo(0.0363, 4);
  });
});

describe("spinEvents", () => {
  it("finds the spin burst with its start, end, duration and peak", () => {
    const s = makeSeries({ mismatch: 0 });
    const slip = driveSlip(s, { zeroRatio: 1 });
    const ev = spinEvents(slip, s.channels.throttle, s.timeS, { targetSlip: 0.08, minThrottlePct: 50, minDurationS: 0.1 });
    expect(ev).toHaveLength(1);
    expect(at(ev, 0).startTimeS).toBeCloseTo(3.0, 9);
    expect(at(ev, 0).endTimeS).toBeCloseTo(3.39, 9);
    // 40 samples at 100 Hz = 0.40 s (arithmetic)
    expect(at(ev, 0).durationS).toBeCloseTo(0.4, 9);
    expect(at(ev, 0).peakSlip).toBeCloseTo(0.2, 5);
  });
  it("ignores spin shorter than the minimum duration and spin with a closed throttle", () => {
    const s = makeSeries({ mismatch: 0 });
    const slip = driveSlip(s, { zeroRatio: 1 });
    expect(spinEvents(slip, s.channels.throttle, s.timeS, { minDurationS: 0.5 })).toHaveLength(0);
    expect(spinEvents(slip, s.channels.throttle, s.timeS, { minThrottlePct: 95 })).toHaveLength(0);
  });
});

describe("spinEvents: one rule for the page and the finding, and the wheelie guard", () => {
  it("by default a 0.2 s spin is too short: the minimum is the finding's own setting (0.3 s)", () => {
    const s = makeSeries({ mismatch: 0 });
    // Spin only 20 samples (0.2 s) of the 40 planted.
    for (let i = 320; i < 340; i++) s.channels.speed_rear![i] = 50;
    const slip = driveSlip(s, { zeroRatio: 1 });
    expect(DEFAULT_THRESHOLDS.wheelSpinMinDurationS.value).toBe(0.3);
    expect(spinEvents(slip, s.channels.throttle, s.timeS)).toHaveLength(0);
    expect(spinEvents(slip, s.channels.throttle, s.timeS, { minDurationS: 0.1 })).toHaveLength(1);
  });

  it("a front wheel slowing at 5 m/s² with the throttle open (in the air) is a wheelie, not spin", () => {
    // Rear steady at 50 m/s; the lifted front slows 5 m/s² for 0.6 s from 3.0 s and lands at
    // 3.6 s back at road speed: rear/front − 1 reaches 50/47 − 1 = 6.4 % (arithmetic), so the
    // target is set to 3 % to make the slip count as spin without the guard.
    const s = makeSeries({ mismatch: 0, n: 500 });
    const f = s.channels.speed_front!;
    for (let i = 0; i < 500; i++) {
      s.channels.speed_rear![i] = 50;
      s.channels.throttle![i] = 90;
      const t = at(s.timeS, i);
      f[i] = t >= 3 && t < 3.6 ? 50 - 5 * (t - 3) : 50;
    }
    const slip = driveSlip(s, { zeroRatio: 1 });
    const opts = { targetSlip: 0.03, minDurationS: 0.1 };
    expect(spinEvents(slip, s.channels.throttle, s.timeS, opts).length).toBeGreaterThan(0);
    expect(spinEvents(slip, s.channels.throttle, s.timeS, { ...opts, frontSpeedMps: f, wheelieDecelMps2: 3 })).toHaveLength(0);
  });
});

describe("cornerExitSlip and slipThrottleScatter", () => {
  it("summarises slip per corner exit window", () => {
    const n = 300;
    const slip = new Float32Array(n);
    const dist = new Float64Array(n);
    const t = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      dist[i] = i; // 1 m per sample
      t[i] = i * 0.02;
      slip[i] = i >= 120 && i < 130 ? 0.15 : 0.01;
    }
    const res = cornerExitSlip(slip, dist, t, [{ name: "A", distanceM: 100 }, { name: "B", distanceM: 200 }], { exitLengthM: 150 });
    expect(res[0]).toMatchObject({ name: "A", fromM: 100, toM: 200, peakAtM: 120, sampleCount: 100 });
    expect(at(res, 0).peakSlip).toBeCloseTo(0.15, 6);
    // 10 samples × 0.02 s above 0.08
    expect(at(res, 0).timeAboveTargetS).toBeCloseTo(0.2, 9);
    expect(at(res, 1).peakSlip).toBeCloseTo(0.01, 6);
    expect(at(res, 1).toM).toBe(350);
  });
  it("drops NaN pairs and thins to the point budget", () => {
    const slip = Float32Array.from([0.1, NaN, 0.2, 0.3, 0.4, 0.5]);
    const th = Float32Array.from([10, 20, 30, NaN, 50, 60]);
    const sc = slipThrottleScatter(slip, th, 2);
    expect(Array.from(sc.throttlePct)).toEqual([10, 50]);
    expect(sc.slip).toHaveLength(2);
  });
});
