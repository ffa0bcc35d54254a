/**
 * Ingest keeps only ANALYSED_ROLES in memory and re-analysis loads only those: the union of what
 * analyseSeries, every findings detector and the stored pages declare they read. The check is
 * behavioural: analysing the generated 20-minute log (sample-logs/files, ground truth beside it)
 * with only those channels gives the same laps, findings and summary as with every channel of
 * the file — so a detector that started reading an undeclared role would fail here.
 */
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyseSeries } from "@/lib/analysis/analyse-series";
import { ANALYSED_ROLES } from "@/lib/analysis/analysed-roles";
import { FINDINGS_READS } from "@/lib/findings/run-findings";
import { detectBrakeOnStraight } from "@/lib/findings/detect-brake-on-straight";
import { trackGatesForAnalysis } from "@/lib/laps/track-gates-for-analysis";
import type { SeriesLike } from "@/lib/laps/types";
import { demoTrackInput } from "@/workers/demo-track";
import { readSampleCsv } from "../findings/read-sample-csv";

const series = readSampleCsv(path.resolve(__dirname, "../../../sample-logs/files/demo-session-20min.csv"));
const t = demoTrackInput();
const track = { gates: trackGatesForAnalysis({ gates: t.gates, lengthM: t.lengthM, thresholds: null }), pitSpeedLimitMs: 60 / 3.6 };
const bike = { revCeilingRpm: 13_500, forkStrokeM: 0.12, shockStrokeM: 0.065 };

function only(s: SeriesLike, keep: (role: string) => boolean): SeriesLike {
  return { timeS: s.timeS, channels: Object.fromEntries(Object.entries(s.channels).filter(([role]) => keep(role))) };
}

/** The analysis without its own timing figures (milliseconds it took). */
function result(s: SeriesLike) {
  return JSON.parse(JSON.stringify(analyseSeries(s, track, bike), (k, v: unknown) => (/Ms$/.test(k) && /analysis|compute/i.test(k) ? undefined : v)));
}

describe("ANALYSED_ROLES", () => {
  it("the file holds channels outside the set, so the comparison drops something", () => {
    const outside = Object.keys(series.channels).filter((r) => !ANALYSED_ROLES.has(r as never));
    expect(outside.length).toBeGreaterThan(0); // rear brake pressure and GPS altitude
  });

  it("analysing only the declared roles gives what every channel gives", () => {
    const full = result(series);
    expect(full.laps.length).toBeGreaterThan(3);
    expect(result(only(series, (r) => ANALYSED_ROLES.has(r as never)))).toEqual(full);
  });

  it("and the comparison has teeth: without a role a detector declares, the result changes", () => {
    expect(detectBrakeOnStraight.reads).toContain("brake_front");
    expect(FINDINGS_READS).toContain("brake_front");
    expect(result(only(series, (r) => ANALYSED_ROLES.has(r as never) && r !== "engine_rpm"))).not.toEqual(result(series));
  });
});
