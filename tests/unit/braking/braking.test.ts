import { describe, expect, it } from "vitest";
import { findCorners } from "@/lib/braking/find-corners";
import { brakingPoints } from "@/lib/braking/braking-points";
import { compareBraking } from "@/lib/braking/compare-braking";
import { at } from "../../fixtures/at";

const BAR = 1e5; // NIST SP 811 App. B: bar → 100 000 Pa (exact)

/**
 * An invented 1600 m lap sampled every 1 m: two corners with apexes at 500 m (20 m/s) and
 * 1200 m (35 m/s), a 2 m/s lift at 300 m that is not a corner. Braking at 10 m/s² before each
 * apex: v² = v_apex² + 2·a·(apex − d) (constant-deceleration kinematics).
 */
function makeLap(brakeShiftM: number) {
  const n = 1601;
  const d = new Float64Array(n);
  const v = new Float32Array(n);
  const p = new Float32Array(n);
  const corners = [
    { apex: 500, vApex: 20 },
    { apex: 1200, vApex: 35 },
  ];
  for (let i = 0; i < n; i++) {
    d[i] = i;
    let speed = 70;
    for (const c of corners) {
      const dist = Math.abs(i - c.apex);
      speed = Math.min(speed, Math.sqrt(c.vApex * c.vApex + 2 * 10 * dist));
    }
    if (i >= 295 && i <= 305) speed -= 2; // a lift, prominence 2 m/s
    v[i] = speed;
    // Brake lever: 12 bar from the onset to 20 m before the apex; onset where the speed starts to drop, shifted.
    for (const c of corners) {
      const onset = c.apex - (70 * 70 - c.vApex * c.vApex) / 20 + brakeShiftM;
      if (i >= onset && i <= c.apex - 20) p[i] = 12 * BAR;
    }
  }
  return { distanceM: d, speedMps: v, brakeFrontPa: p };
}

describe("findCorners", () => {
  it("finds the two speed minima by prominence and ignores the lift", () => {
    const lap = makeLap(0);
    const c = findCorners(lap.speedMps, lap.distanceM, { minProminenceMps: 5 });
    expect(c.map((x) => x.distanceM)).toEqual([500, 1200]);
    expect(c.map((x) => x.name)).toEqual(["Corner 1", "Corner 2"]);
    expect(at(c, 0).minSpeedMps).toBeCloseTo(20, 5);
    // Prominence of corner 2: the lower shoulder is 70 m/s on both sides → 70 − 35 = 35 m/s.
    expect(at(c, 1).prominenceMps).toBeCloseTo(35, 5);
    // With a 1 m/s prominence floor the 2 m/s lift becomes a "corner".
    expect(findCorners(lap.speedMps, lap.distanceM, { minProminenceMps: 1 })).toHaveLength(3);
  });
});

describe("brakingPoints", () => {
  it("onset, release, peak, minimum speed and braking distance per corner", () => {
    const lap = makeLap(0);
    const pts = brakingPoints(lap, [{ name: "Corner 1", distanceM: 500 }, { name: "Corner 2", distanceM: 1200 }], { thresholdPa: 5 * BAR });
    // Corner 1: braking distance (70² − 20²)/(2·10) = 225 m → onset at 275 m (kinematics).
    // The lever jumps 0 → 12 bar between 274 and 275 m; the 5 bar crossing interpolates to 274 + 5/12 m.
    expect(at(pts, 0).onsetDistanceM!).toBeCloseTo(274 + 5 / 12, 6);
    // Release between 480 and 481 m: 480 + 7/12.
    expect(at(pts, 0).releaseDistanceM!).toBeCloseTo(480 + 7 / 12, 6);
    expect(at(pts, 0).peakPressurePa).toBeCloseTo(12 * BAR, 0);
    expect(at(pts, 0).minSpeedMps).toBeCloseTo(20, 5);
    expect(at(pts, 0).onsetToApexM!).toBeCloseTo(500 - (274 + 5 / 12), 6);
    // Corner 2: (70² − 35²)/20 = 183.75 m → onset 1016.25 m; samples at 1 m: first ≥ is 1017,
    // crossing 1016 + 5/12.
    expect(at(pts, 1).onsetDistanceM!).toBeCloseTo(1016 + 5 / 12, 6);
  });

  it("reports a corner taken without braking", () => {
    const lap = makeLap(0);
    lap.brakeFrontPa.fill(0);
    const pt = at(brakingPoints(lap, [{ name: "Corner 1", distanceM: 500 }]), 0);
    expect(pt.braked).toBe(false);
    expect(pt.onsetDistanceM).toBeNull();
    expect(pt.minSpeedMps).toBeCloseTo(20, 5);
  });
});

describe("compareBraking", () => {
  it("says metres later (−) and earlier (+) than the reference", () => {
    const corners = [{ name: "Corner 1", distanceM: 500 }, { name: "Corner 2", distanceM: 1200 }];
    const ref = brakingPoints(makeLap(0), corners);
    const late = brakingPoints(makeLap(12), corners);
    const early = brakingPoints(makeLap(-7), corners);
    const dl = compareBraking(late, ref);
    expect(at(dl, 0).onsetEarlierM!).toBeCloseTo(-12, 6);
    expect(at(dl, 0).text).toBe("Corner 1: you braked 12 m later than on your best lap.");
    const de = compareBraking(early, ref, { referenceLabel: "lap 4" });
    expect(at(de, 1).onsetEarlierM!).toBeCloseTo(7, 6);
    expect(at(de, 1).text).toBe("Corner 2: you braked 7 m earlier than on lap 4.");
    expect(at(compareBraking(ref, ref), 0).text).toBe("Corner 1: you braked at about the same point as on your best lap.");
  });
});
