import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { runFindings } from "@/lib/findings/run-findings";
import type { FindingsContext, LapSpan } from "@/lib/findings/types";
import { readSampleCsv } from "./read-sample-csv";
import { at } from "../../fixtures/at";

/**
 * The sample-log generator's three-lap file with planted events and their ground truth
 * (sample-logs/files/three-laps-20hz.csv + .truth.json, invented data). The findings engine
 * must find every planted event — kind, lap, start time within ±50 ms — and nothing else.
 */
const DIR = path.resolve(__dirname, "../../../sample-logs/files");
const CSV = path.join(DIR, "three-laps-20hz.csv");

interface Truth {
  pitLaneLimitMps: number;
  revCeilingRpm: number;
  laps: { number: number; startS: number; endS: number; flags: { outLap: boolean; inLap: boolean } }[];
  pitLane: { lap: number; fromS: number; toS: number }[];
  events: { kind: string; lap: number; startS: number; endS: number; limit: { value: number }; rule: string }[];
}

describe("runFindings on the generated three-lap sample log", () => {
  it("the sample files exist (npm run samples)", () => {
    expect(existsSync(CSV)).toBe(true);
  });

  const truth: Truth = JSON.parse(readFileSync(CSV.replace(/\.csv$/, ".truth.json"), "utf8"));
  const series = readSampleCsv(CSV);
  const laps: LapSpan[] = truth.laps.map((l) => ({ number: l.number, startTimeS: l.startS, endTimeS: l.endS }));
  const brakeRule = truth.events.find((e) => e.kind === "brake_on_straight");
  const ctx: FindingsContext = {
    laps,
    track: { pitSpeedLimitMps: truth.pitLaneLimitMps, pitLaneTimes: truth.pitLane.map((p) => ({ startTimeS: p.fromS, endTimeS: p.toS })) },
    // The invented bike's strokes (fork 120 mm, shock 65 mm) and its class rev ceiling from the truth.
    bike: { revCeilingRpm: truth.revCeilingRpm, forkStrokeM: 0.12, shockStrokeM: 0.065 },
    // The truth states its own brake-on-straight rule ("≥ 1 bar while throttle > 80 %"); use it so the times compare.
    // The truth's rule is an absolute pressure and a throttle: the margin over the resting pressure
    // is set out of reach so the detector applies exactly that rule.
    thresholds: brakeRule
      ? { brakeOnStraightPressurePa: brakeRule.limit.value, brakeOnStraightThrottlePct: Number(/throttle > (\d+)/.exec(brakeRule.rule)![1]), brakeOnStraightRestMarginPa: 1e9 }
      : {},
  };
  const findings = runFindings(series, ctx);

  it("plants at least one event of each kind", () => {
    expect(new Set(truth.events.map((e) => e.kind))).toEqual(new Set(["brake_on_straight", "rev_ceiling", "pit_overspeed"]));
  });

  it.each(truth.events.map((e) => [e.kind, e.lap, e.startS, e] as const))("finds %s on lap %d at %d s (±50 ms)", (kind, lap, startS, e) => {
    const mine = findings.filter((f) => f.kind === kind && f.lapNumber === lap && Math.abs(f.startTimeS - startS) <= 0.05);
    expect(mine).toHaveLength(1);
    expect(Math.abs(at(mine, 0).endTimeS - e.endS)).toBeLessThanOrEqual(0.05);
  });

  it("finds nothing that was not planted (clean laps stay clean)", () => {
    const unplanted = findings.filter(
      (f) => !truth.events.some((e) => e.kind === f.kind && e.lap === f.lapNumber && Math.abs(f.startTimeS - e.startS) <= 0.05),
    );
    expect(unplanted).toEqual([]);
  });

  it("with the default thresholds the planted events are still found, inside their true span", () => {
    const def = runFindings(series, { ...ctx, thresholds: {} });
    for (const e of truth.events) {
      const hit = def.filter((f) => f.kind === e.kind && f.lapNumber === e.lap && f.startTimeS <= e.endS && f.endTimeS >= e.startS);
      expect(hit, `${e.kind} lap ${e.lap}`).toHaveLength(1);
    }
    expect(def).toHaveLength(truth.events.length);
  });
});
