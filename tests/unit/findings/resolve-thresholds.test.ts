/**
 * One threshold rule for the findings and the pages that show a threshold (track over bike over
 * Lapbench's defaults). The layering is the product's own rule; the cases are the ones where the
 * page's old copy and the findings' copy disagreed (a non-finite stored value).
 */
import { describe, expect, it } from "vitest";
import { mergeThresholds, resolveThreshold } from "@/lib/findings/resolve-thresholds";
import { DEFAULT_THRESHOLDS, type ThresholdKey } from "@/lib/findings/thresholds";

const K: ThresholdKey = "brakeOnStraightPressurePa";

describe("resolveThreshold", () => {
  it.each([
    ["track over bike", { [K]: 3e5 }, { [K]: 2.5e5 }, { value: 2.5e5, source: "track" }],
    ["bike where the track is silent", { [K]: 3e5 }, {}, { value: 3e5, source: "bike" }],
    ["default with neither", null, null, { value: DEFAULT_THRESHOLDS[K].value, source: "default" }],
    ["a NaN on the track is not a setting", { [K]: 3e5 }, { [K]: NaN }, { value: 3e5, source: "bike" }],
    ["nor an infinite or text one on the bike", { [K]: Infinity }, { [K]: "4e5" }, { value: DEFAULT_THRESHOLDS[K].value, source: "default" }],
  ] as const)("%s", (_label, bike, track, want) => {
    expect(resolveThreshold(K, bike, track)).toEqual(want);
  });

  it("gives every key the value the findings engine uses (mergeThresholds, then the default)", () => {
    const bike = { [K]: 3e5, gpsDropoutS: 2, wheelSpinTargetSlip: NaN };
    const track = { gpsDropoutS: 3, bottomingMarginM: Infinity };
    const merged = mergeThresholds(bike, track);
    for (const key of Object.keys(DEFAULT_THRESHOLDS) as ThresholdKey[]) {
      expect(resolveThreshold(key, bike, track).value).toBe(merged[key] ?? DEFAULT_THRESHOLDS[key].value);
    }
  });
});
