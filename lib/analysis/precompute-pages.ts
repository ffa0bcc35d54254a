/**
 * The slip, suspension, gears and brief results with the default settings, computed once at
 * ingest and stored (lib/data/session-analysis.ts); each page module computes its own part.
 */
import type { AnalysisBase, LapInfo } from "./analysis-base";
import { lapRange } from "./analysis-base";
import { slipCore, slipTrace, type SlipAnalysis, type SlipTrace } from "./slip-page";
import { sampleRateHz, suspensionSettings, suspensionSides, type SuspensionSide } from "./suspension-page";
import { computeGears, type GearAnalysis } from "./gears-page";
import { briefCore, type LapBraking, type RiderBrief } from "./brief-page";


/**
 * The page results with the default settings, as stored at ingest (lib/data/session-analysis.ts):
 * each part is what its page function returns, less what is cheap to rebuild from the lap rows
 * (lap list, title) and split by lap where a page shows one lap at a time.
 */
export interface PageAnalysesOf {
  /** The slip page without its lap trace (lap and trace null). */
  slip: SlipAnalysis;
  /** Per lap number, the slip trace the page shows for that lap. */
  slipTraces: Map<number, SlipTrace>;
  suspension: StoredSuspension;
  gears: GearAnalysis;
  brief: StoredBrief;
}

export interface StoredSuspension {
  lapList: LapInfo[];
  window: number;
  boundaryMs: number;
  sampleRateHz: number | null;
  session: { fork: SuspensionSide | null; shock: SuspensionSide | null };
  /** By lap number. */
  laps: Record<number, { fork: SuspensionSide | null; shock: SuspensionSide | null }>;
}

export interface StoredBrief {
  /** The brief without a lap (available false with its reason, or true with the outline). */
  brief: RiderBrief;
  /** Per lap number, its braking against the best lap. */
  laps: Record<number, LapBraking>;
}

/** The four pages' results for the default settings, computed on each page's own channels. */
export function precomputePageAnalyses(bases: { slip: AnalysisBase; suspension: AnalysisBase; gears: AnalysisBase; brief: AnalysisBase }): PageAnalysesOf {
  const { result: slip, slip: slipChannel } = slipCore(bases.slip, false);
  const slipTraces = new Map<number, SlipTrace>();
  if (slipChannel) for (const l of bases.slip.laps) slipTraces.set(l.number, slipTrace(bases.slip, slipChannel, l));

  const sb = bases.suspension;
  const { window, boundaryMs } = suspensionSettings({});
  const suspension: StoredSuspension = { lapList: sb.lapInfo, window, boundaryMs, sampleRateHz: sampleRateHz(sb.series.timeS), session: suspensionSides(sb, 0, sb.series.timeS.length, window, boundaryMs), laps: {} };
  for (const l of sb.laps) {
    const [from, to] = lapRange(sb.series.timeS, l);
    suspension.laps[l.number] = suspensionSides(sb, from, to, window, boundaryMs);
  }

  const { out, braking } = briefCore(bases.brief);
  const brief: StoredBrief = { brief: out, laps: {} };
  if (braking) for (const l of bases.brief.laps) brief.laps[l.number] = braking(l);

  return { slip, slipTraces, suspension, gears: computeGears(bases.gears), brief };
}
