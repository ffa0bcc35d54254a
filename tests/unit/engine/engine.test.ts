import { describe, expect, it } from "vitest";
import { powerKw } from "@/lib/engine/power-kw";
import { kwToHp, NM_PER_LBF_FT, powerHpFromLbfFt } from "@/lib/engine/power-hp";
import { engineUsage } from "@/lib/engine/engine-usage";
import { engineLedger } from "@/lib/engine/engine-ledger";
import { CAUTION_TEXT } from "@/lib/findings/caution";

describe("powerKw — P = T·ω, kW = N·m·rpm/9549.297 (P = T·ω, 60 000/2π: SI definitions)", () => {
  it.each([
    [100, 9549.297, 100],
    [1, 60000 / (2 * Math.PI), 1],
    // 115 N·m at 13 000 rpm → 115·13000/9549.297 = 156.56 kW (≈ 210 hp at 745.69987 W/hp, NIST SP 811)
    [115, 13000, 156.556],
  ])("%d N·m at %d rpm → %d kW", (T, rpm, kw) => {
    expect(powerKw(T, rpm)).toBeCloseTo(kw, 3);
  });
});

describe("powerHpFromLbfFt — hp = lbf·ft·rpm/5252.113 (1 hp = 33 000 ft·lbf/min, NIST SP 811 B.8; 33 000/2π)", () => {
  it.each([
    // At 5252.113 rpm torque in lbf·ft equals horsepower (the relation's own worked example).
    [100, 5252.113, 100],
    [1, 33000 / (2 * Math.PI), 1],
    // 300 lbf·ft at 6000 rpm → 300·6000/5252.113 = 342.719 hp (arithmetic on the relation).
    [300, 6000, 342.719],
  ])("%d lbf·ft at %d rpm → %d hp", (T, rpm, hp) => {
    expect(powerHpFromLbfFt(T, rpm)).toBeCloseTo(hp, 3);
  });

  it("the two published relations agree: 115 N·m at 13 000 rpm is 156.556 kW and 209.945 hp either way", () => {
    // 115 N·m = 84.8193 lbf·ft (NIST SP 811: 1 lbf·ft = 1.355818 N·m); 84.8193·13000/5252.113 = 209.945 hp;
    // 156.556 kW / 0.74570 kW/hp (NIST SP 811) = 209.945 hp.
    const viaLbfFt = powerHpFromLbfFt(115 / NM_PER_LBF_FT, 13000);
    const viaKw = kwToHp(powerKw(115, 13000));
    expect(viaLbfFt).toBeCloseTo(209.945, 3);
    expect(viaKw).toBeCloseTo(209.945, 3);
    expect(viaLbfFt).toBeCloseTo(viaKw, 6);
  });
});

describe("engineUsage", () => {
  // 100 s at 10 Hz: 13 000 rpm, 50 m/s; from 40.0 s to 40.4 s and 70.0–70.1 s at 14 200 rpm.
  const n = 1001;
  const timeS = new Float64Array(n);
  const rpm = new Float32Array(n);
  const speed = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    timeS[i] = i / 10;
    speed[i] = 50;
    rpm[i] = (i >= 400 && i < 404) || i === 700 ? 14200 : 13000;
    if (i >= 900) rpm[i] = 0; // engine off for the last 10 s
  }
  const u = engineUsage({ timeS, channels: { engine_rpm: rpm, speed_front: speed } }, 12500, 14000);

  it("running time, distance and time above a chosen rpm", () => {
    expect(u.runningS).toBeCloseTo(90, 9); // 900 samples × 0.1 s
    expect(u.distanceM).toBeCloseTo(5000, 6); // 50 m/s × 100 s
    expect(u.timeAboveRpmS).toBeCloseTo(90, 9);
  });
  it("counts separate rev-ceiling exceedances and their time", () => {
    expect(u.ceilingExceedances).toBe(2);
    expect(u.timeAboveCeilingS).toBeCloseTo(0.5, 9);
    expect(u.maxRpm).toBe(14200);
  });
});

describe("engineLedger", () => {
  const session = { durationS: 1800, distanceM: 80000, timeAboveRpmS: 60, ceilingExceedances: 1 };
  it.each([
    // [sessions, interval h, interval km, hours, km, usedPct, warning level]
    [4, 10, 1000, 2, 320, 32, null], // 4×0.5 h = 2 h of 10 → 20 %; 320 km of 1000 → 32 %
    [5, 3, 2000, 2.5, 400, (2.5 / 3) * 100, "near"], // 83 % ≥ 80 % (Lapbench default)
    [6, 3, 2000, 3, 480, 100, "due"],
  ])("%d half-hour sessions, interval %d h / %d km → %d h, %d km, %d %%", (count, h, km, hours, kmExp, pct, level) => {
    const l = engineLedger(Array(count).fill(session), { rebuildIntervalH: h, rebuildIntervalKm: km });
    expect(l.hours).toBeCloseTo(hours, 9);
    expect(l.km).toBeCloseTo(kmExp, 9);
    expect(l.usedPct!).toBeCloseTo(pct, 9);
    expect(l.warning?.level ?? null).toBe(level);
    if (l.warning) expect(l.warning.caution).toBe(CAUTION_TEXT);
    expect(l.ceilingExceedances).toBe(count);
  });
  it("works with only one interval set and says the 80 % is our default", () => {
    const l = engineLedger([{ durationS: 3600 * 9, distanceM: 0 }], { rebuildIntervalH: 10 });
    expect(l.kmUsedPct).toBeNull();
    expect(l.usedPct).toBeCloseTo(90, 9);
    expect(l.warning?.message).toMatch(/Lapbench warns from 80 % by default/);
  });
});
