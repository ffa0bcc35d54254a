import path from "node:path";
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { mergeThresholds, pitLaneTimes } from "@/lib/analysis/analyse-series";
import { DEFAULT_THRESHOLDS } from "@/lib/findings/thresholds";
import { trackGatesForAnalysis } from "@/lib/data/tracks";
import { demoTrackInput } from "@/workers/demo-track";
import { readSampleCsv } from "../findings/read-sample-csv";
import { at } from "../../fixtures/at";

describe("mergeThresholds: defaults ⊕ bike ⊕ track", () => {
  it.each([
    ["track over bike", [{ brakeOnStraightPressurePa: 3e5 }, { brakeOnStraightPressurePa: 2.5e5 }], { brakeOnStraightPressurePa: 2.5e5 }],
    ["bike kept where the track is silent", [{ brakeOnStraightPressurePa: 3e5 }, { gpsDropoutS: 2 }], { brakeOnStraightPressurePa: 3e5, gpsDropoutS: 2 }],
    ["unknown keys and non-finite values dropped", [{ minLapTimeS: 40, wheelSpinTargetSlip: NaN }, null], {}],
  ] as const)("%s", (_label, layers, expected) => {
    expect(mergeThresholds(...(layers as unknown as Record<string, number>[]))).toEqual(expected);
  });

  it("names only keys the findings engine knows (DEFAULT_THRESHOLDS)", () => {
    const all = Object.fromEntries(Object.keys(DEFAULT_THRESHOLDS).map((k) => [k, 1]));
    expect(Object.keys(mergeThresholds(all)).sort()).toEqual(Object.keys(DEFAULT_THRESHOLDS).sort());
  });
});

describe("pitLaneTimes on the generated three-lap log (sample-logs/files/three-laps-20hz.truth.json)", () => {
  const file = path.resolve(__dirname, "../../../sample-logs/files/three-laps-20hz.csv");
  const truth = JSON.parse(readFileSync(file.replace(/\.csv$/, ".truth.json"), "utf8")) as {
    stoppedAtS: number;
    pitLane: { fromS: number; toS: number }[];
    gateCrossings: { gate: string; timeS: number }[];
  };
  const t = demoTrackInput();
  const gates = trackGatesForAnalysis({ gates: t.gates, lengthM: t.lengthM, thresholds: null })!;
  const ranges = pitLaneTimes(readSampleCsv(file), gates);

  it("starts in the box, leaves at the pit exit gate, comes back through the pit entry gate and stays", () => {
    expect(ranges).toHaveLength(truth.pitLane.length);
    const exit = truth.gateCrossings.find((c) => c.gate === "pit_exit")!.timeS;
    const entry = truth.gateCrossings.find((c) => c.gate === "pit_entry")!.timeS;
    expect(at(ranges, 0).startTimeS).toBe(0); // the log begins with the bike in the box
    // 20 Hz fixes in the 60 km/h lane are 0.8 m apart; the generator's 0.3 m GPS noise moves a crossing ~20 ms.
    expect(Math.abs(at(ranges, 0).endTimeS - exit)).toBeLessThan(0.05);
    expect(Math.abs(at(ranges, 1).startTimeS - entry)).toBeLessThan(0.05);
    expect(at(ranges, 1).endTimeS).toBeGreaterThanOrEqual(truth.stoppedAtS);
  });

  it("no pit gates: no pit-lane times", () => {
    expect(pitLaneTimes(readSampleCsv(file), { ...gates, pitEntry: undefined })).toEqual([]);
  });
});
