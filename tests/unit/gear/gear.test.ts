import { describe, expect, it } from "vitest";
import { nominalTyreCircumferenceM } from "@/lib/gear/nominal-tyre-circumference";
import { overallRatios } from "@/lib/gear/overall-ratios";
import { gearFromRatios } from "@/lib/gear/gear-from-ratios";
import { timeInGear } from "@/lib/gear/time-in-gear";
import { shiftEvents } from "@/lib/gear/shift-events";
import { at } from "../../fixtures/at";

describe("nominalTyreCircumferenceM — D = 25.4·rim + 2·width·aspect/100 (ISO 5751 / ETRTO practice, from memory)", () => {
  it.each([
    // [width, aspect, rim, D mm, π·D mm]: ISO 5751 tyre arithmetic
    [190, 55, 17, 640.8, 2013.1],
    [120, 70, 17, 599.8, 1884.3],
  ])("%d/%d ZR%d → D %d mm, circumference %d mm", (w, a, rim, dMm, cMm) => {
    const c = nominalTyreCircumferenceM(w, a, rim);
    expect(c / Math.PI).toBeCloseTo(dMm / 1000, 6);
    expect(Math.abs(c * 1000 - cMm)).toBeLessThan(0.05); // table rounded to 0.1 mm
  });
});

// An invented drivetrain (not any real bike): primary 1.8, sprockets 16/40, 190/55 ZR17 rear.
const BIKE = {
  primaryRatio: 1.8,
  gearboxRatios: [2.6, 2.0, 1.65, 1.42, 1.27, 1.16],
  sprocketFront: 16,
  sprocketRear: 40,
  rearCircumferenceM: 2.0131, // π·640.8 mm (ISO 5751 tyre arithmetic, 190/55 ZR17)
};

/** v = rpm / overall / 60 · C (rev/min → rev/s → m/s), hand arithmetic. */
const speedAt = (rpm: number, overall: number) => (rpm / overall / 60) * 2.0131;

describe("gearFromRatios", () => {
  it("overall ratio is primary × gearbox × rear/front sprocket", () => {
    // 6th: 1.8 × 1.16 × 40/16 = 5.22 (arithmetic)
    expect(overallRatios(BIKE)[5]).toBeCloseTo(5.22, 12);
  });

  it.each([
    // 12 000 rpm in 6th: 12000/5.22 = 2298.85 wheel rpm × 2.0131 m / 60 = 77.13 m/s (277.7 km/h)
    [12000, 77.13, 6],
    // 12 000 rpm in 1st: overall 1.8 × 2.6 × 2.5 = 11.7 → 1025.64 wheel rpm → 34.41 m/s
    [12000, 34.41, 1],
    // 9 000 rpm in 3rd: overall 7.425 → 1212.12 wheel rpm → 40.67 m/s
    [9000, 40.67, 3],
    // 9 000 rpm at 50 m/s: ratio 9000/(50·60/2.0131) = 6.039, between 4th (6.39) and 5th (5.715): > 4 % from both → 0
    [9000, 50, 0],
  ])("%d rpm at %d m/s → gear %d (tyre arithmetic)", (rpm, v, expected) => {
    const g = gearFromRatios(Float32Array.of(rpm), Float32Array.of(v), BIKE);
    expect(g[0]).toBe(expected);
  });

  it("gives 0 when stopped or without rpm", () => {
    const g = gearFromRatios(Float32Array.of(3000, NaN), Float32Array.of(0.5, 30), BIKE);
    expect(Array.from(g)).toEqual([0, 0]);
  });
});

describe("timeInGear and shiftEvents", () => {
  // 100 Hz: 1 s in 3rd rising to 12 000 rpm, a clutchless upshift to 4th at full throttle,
  // 1 s in 4th, throttle shut, 0.1 s with the clutch in (gear 0), 1 s in 3rd.
  const ov = overallRatios(BIKE);
  const t: number[] = [];
  const rpm: number[] = [];
  const v: number[] = [];
  const th: number[] = [];
  let time = 0;
  const push = (r: number, speed: number, throttle: number) => {
    t.push(time);
    rpm.push(r);
    v.push(speed);
    th.push(throttle);
    time += 0.01;
  };
  for (let i = 0; i < 100; i++) push(10000 + 20 * i, speedAt(10000 + 20 * i, at(ov, 2)), 100);
  const vShift = speedAt(12000, at(ov, 2));
  for (let i = 0; i < 100; i++) push((vShift / 2.0131) * 60 * at(ov, 3), vShift, 100);
  for (let i = 0; i < 10; i++) push(4000, vShift, 0); // clutch in: ratio matches nothing
  for (let i = 0; i < 100; i++) push((vShift / 2.0131) * 60 * at(ov, 2), vShift, 0);
  const timeS = Float64Array.from(t);
  const gear = gearFromRatios(Float32Array.from(rpm), Float32Array.from(v), BIKE);

  it("time in each gear", () => {
    const tig = timeInGear(gear, timeS);
    // 100 samples at 0.01 s = 1.00 s in 4th; 3rd: 100 + 99 intervals (the last sample has no next).
    expect(at(tig, 4).timeS).toBeCloseTo(1.0, 9);
    expect(at(tig, 3).timeS).toBeCloseTo(1.99, 9);
    expect(at(tig, 0).timeS).toBeCloseTo(0.1, 9);
    expect(tig.reduce((a, x) => a + x.pct, 0)).toBeCloseTo(100, 9);
  });

  it("an upshift held open is clutchless; a downshift through the clutch is not", () => {
    const ev = shiftEvents(gear, Float32Array.from(rpm), Float32Array.from(th), timeS);
    expect(ev).toHaveLength(2);
    expect(ev[0]).toMatchObject({ fromGear: 3, toGear: 4, direction: "up", clutchless: true, index: 100 });
    // rpm drop at the shift: 12 000 × (ratio 4th / ratio 3rd) = 12 000 × 1.42/1.65 = 10 327 rpm
    expect(at(ev, 0).rpmAfter).toBeCloseTo(12000 * (1.42 / 1.65), 0);
    expect(ev[1]).toMatchObject({ fromGear: 4, toGear: 3, direction: "down", clutchless: false });
    expect(at(ev, 1).shiftTimeS).toBeCloseTo(0.11, 9);
  });
});
