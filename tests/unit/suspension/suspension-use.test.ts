import { describe, expect, it } from "vitest";
import { travelFromPot } from "@/lib/suspension/travel-from-pot";
import { suspensionUse } from "@/lib/suspension/suspension-use";
import { bottomingEvents } from "@/lib/suspension/bottoming-events";
import { at } from "../../fixtures/at";

describe("travelFromPot", () => {
  it.each([
    // linear: (2.5 V − 0.5 V) · 30 mm/V = 60 mm = 0.060 m (arithmetic; mm → m 1e-3, SI)
    [{ kind: "linear" as const, offsetV: 0.5, mmPerVolt: 30 }, 2.5, 0.06],
    // two-point: 0.5 V ↔ 0 mm, 4.5 V ↔ 120 mm → 30 mm/V, 2.5 V → 60 mm
    [{ kind: "two_point" as const, lowV: 0.5, lowMm: 0, highV: 4.5, highMm: 120 }, 2.5, 0.06],
    // two-point not starting at zero: 1 V ↔ 10 mm, 3 V ↔ 70 mm → 30 mm/V, 2 V → 40 mm
    [{ kind: "two_point" as const, lowV: 1, lowMm: 10, highV: 3, highMm: 70 }, 2, 0.04],
  ])("%o at %d V → %d m", (cal, volts, expected) => {
    expect(travelFromPot([volts], cal)[0]).toBeCloseTo(expected, 6);
  });
});

describe("suspensionUse", () => {
  // A fork working as a sine about 60 mm with 40 mm amplitude at 2 Hz, 120 mm stroke, 200 Hz.
  const dt = 0.005;
  const n = 2000; // 10 s = 20 full cycles
  const stroke = 0.12;
  const A = 0.04;
  const f = 2;
  const t = new Float64Array(n);
  const x = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = i * dt;
    x[i] = 0.06 + A * Math.sin(2 * Math.PI * f * at(t, i));
  }

  it("splits the time by damping quadrant at the configured boundary", () => {
    // Peak velocity 2πfA = 0.503 m/s (analytic). |v| < b for |cos| < b/vmax, a share
    // (2/π)·asin(b/vmax) of the time. With b = vmax/2: (2/π)·(π/6) = 1/3 low speed, 2/3 high.
    const vmax = 2 * Math.PI * f * A;
    const u = suspensionUse(x, t, { strokeM: stroke, lowHighBoundaryMs: vmax / 2 });
    const low = u.split.compressionLowPct + u.split.reboundLowPct;
    const high = u.split.compressionHighPct + u.split.reboundHighPct;
    // Within 1 percentage point: 100 samples per cycle quantise the share to 1 %.
    expect(Math.abs(low - 100 / 3)).toBeLessThan(1);
    expect(Math.abs(high - 200 / 3)).toBeLessThan(1);
    // Compression and rebound each half the time (symmetry of the sine).
    expect(u.split.compressionLowPct + u.split.compressionHighPct).toBeCloseTo(50, 0);
    // Moving the boundary moves the split: it is a setting, not a constant.
    const u2 = suspensionUse(x, t, { strokeM: stroke, lowHighBoundaryMs: vmax * 2 });
    expect(u2.split.compressionHighPct + u2.split.reboundHighPct).toBe(0);
  });

  it("position histogram in % of stroke and max travel", () => {
    const u = suspensionUse(x, t, { strokeM: stroke, lowHighBoundaryMs: 0.1, bins: 12 });
    // 0.06 ± 0.04 m of 0.12 m: travel lives in 16.7 … 83.3 % of stroke — bins 0 (0–8.3 %) and 11 empty.
    expect(u.position.timePct[0]).toBe(0);
    expect(u.position.timePct[11]).toBe(0);
    const sum = u.position.timePct.reduce((a, b) => a + b, 0);
    expect(sum).toBeCloseTo(100, 9);
    expect(u.maxTravelM).toBeCloseTo(0.1, 5);
    expect(u.maxTravelPct).toBeCloseTo(83.33, 1);
    expect(u.velocity.timePct.reduce((a, b) => a + b, 0)).toBeCloseTo(100, 9);
    expect(u.bottoming.count).toBe(0);
  });

  it("sag: median travel while stopped and at steady speed", () => {
    const m = 1000;
    const tt = new Float64Array(m);
    const xx = new Float32Array(m);
    const sp = new Float32Array(m);
    for (let i = 0; i < m; i++) {
      tt[i] = i * 0.01;
      if (i < 300) {
        sp[i] = 0;
        xx[i] = 0.03;
      } else if (i < 500) {
        sp[i] = 20 + (i - 300) * 0.1; // 10 m/s² — not steady
        xx[i] = 0.05;
      } else {
        sp[i] = 40;
        xx[i] = 0.035 + (i % 2 ? 0.001 : -0.001);
      }
    }
    const u = suspensionUse(xx, tt, { strokeM: 0.12, lowHighBoundaryMs: 0.1, speedMps: sp });
    expect(u.sag.stoppedM).toBeCloseTo(0.03, 6);
    expect(u.sag.steadySpeedM).toBeCloseTo(0.035, 3);
  });
});

describe("bottomingEvents", () => {
  it("counts touches within the margin of full stroke, debounced", () => {
    const n = 100;
    const t = new Float64Array(n);
    const x = new Float32Array(n).fill(0.05);
    for (let i = 0; i < n; i++) t[i] = i * 0.01;
    x[10] = 0.119; // touch (≥ 0.12 − 0.003)
    x[15] = 0.118; // 0.05 s later → same event
    x[60] = 0.12; // 0.45 s later → new event
    x[80] = 0.116; // below the margin → not bottoming
    const ev = bottomingEvents(x, t, 0.12, { marginM: 0.003, debounceS: 0.2 });
    expect(ev).toHaveLength(2);
    expect(at(ev, 0).startTimeS).toBeCloseTo(0.1, 9);
    expect(at(ev, 0).endTimeS).toBeCloseTo(0.15, 9);
    expect(at(ev, 1).peakTravelM).toBeCloseTo(0.12, 6);
  });
});

describe("suspensionUse on a pot logged slower than the master clock", () => {
  // The same 2 Hz, 40 mm sine as above, on a 200 Hz master clock, but the pot is logged at 50 Hz:
  // three master samples in four are NaN (the channel has no value there).
  const dt = 0.005;
  const n = 2000;
  const A = 0.04;
  const f = 2;
  const t = new Float64Array(n);
  const slow = new Float32Array(n).fill(NaN);
  for (let i = 0; i < n; i++) {
    t[i] = i * dt;
    if (i % 4 === 0) slow[i] = 0.06 + A * Math.sin(2 * Math.PI * f * at(t, i));
  }

  it("gives a real velocity histogram from the channel's own 50 Hz samples", () => {
    const vmax = 2 * Math.PI * f * A; // 0.503 m/s, d/dt of A·sin(2πft) (calculus)
    const u = suspensionUse(slow, t, { strokeM: 0.12, lowHighBoundaryMs: vmax / 2 });
    expect(u.channelRateHz).toBeCloseTo(50, 6);
    // 70 ms at 20 ms a sample is 3.5 samples, so the smallest window for a quadratic fit (5).
    expect(u.velocityWindowSamples).toBe(5);
    const total = Array.from(u.velocity.timePct).reduce((a, b) => a + b, 0);
    expect(total).toBeCloseTo(100, 6);
    // Share of time below vmax/2 is (2/π)·asin(1/2) = 1/3 (analytic, as above); 25 samples a cycle
    // quantise the share to 4 %, so within 4 percentage points.
    const low = u.split.compressionLowPct + u.split.reboundLowPct;
    expect(Math.abs(low - 100 / 3)).toBeLessThan(4);
    // Velocity at the channel's own samples is 2πfA·cos(2πft) times the gain of the 5-point
    // quadratic derivative filter (−2, −1, 0, 1, 2)/(10·Δt) at θ = 2πfΔt: G = (2 sin θ + 4 sin 2θ)/(10 θ)
    // = 0.965 at θ = 0.251 (frequency response of the tabulated coefficients, Savitzky & Golay 1964).
    // Within 0.5 % of the peak; the samples in between stay NaN (no value is invented).
    const th = 2 * Math.PI * f * 0.02;
    const gain = (2 * Math.sin(th) + 4 * Math.sin(2 * th)) / (10 * th);
    let worst = 0;
    for (let i = 40; i < n - 40; i += 4) worst = Math.max(worst, Math.abs(at(u.velocityMps, i) - gain * vmax * Math.cos(2 * Math.PI * f * at(t, i))));
    expect(worst / vmax).toBeLessThan(0.005);
    expect(Number.isNaN(u.velocityMps[1])).toBe(true);
  });

  it("sets the window in milliseconds: the same span of time at 200 Hz and at 50 Hz", () => {
    const fast = new Float32Array(n);
    for (let i = 0; i < n; i++) fast[i] = 0.06 + A * Math.sin(2 * Math.PI * f * at(t, i));
    const a = suspensionUse(fast, t, { strokeM: 0.12, lowHighBoundaryMs: 0.1, velocityWindowMs: 100 });
    const b = suspensionUse(slow, t, { strokeM: 0.12, lowHighBoundaryMs: 0.1, velocityWindowMs: 100 });
    expect(a.velocityWindowSamples).toBe(21); // 100 ms / 5 ms = 20 → odd 21
    expect(b.velocityWindowSamples).toBe(5); // 100 ms / 20 ms = 5
  });

  it("does not smooth across a dropout in the channel", () => {
    const gap = slow.slice();
    for (let i = 1000; i < 1200; i++) gap[i] = NaN; // 1 s without the pot
    const u = suspensionUse(gap, t, { strokeM: 0.12, lowHighBoundaryMs: 0.1 });
    // Both sides of the gap keep their velocities; the gap itself has none.
    expect(Number.isFinite(u.velocityMps[996])).toBe(true);
    expect(Number.isFinite(u.velocityMps[1200])).toBe(true);
    for (let i = 1000; i < 1200; i++) expect(Number.isNaN(u.velocityMps[i])).toBe(true);
  });
});
