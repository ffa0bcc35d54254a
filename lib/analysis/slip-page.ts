/**
 * Drive slip computed from an AnalysisBase, reshaped into the plain object the slip page renders.
 * Pure (no database): lib/data/analysis.ts calls it on request, precomputePageAnalyses at ingest.
 */
import type { Lap } from "@/lib/laps/types";
import { isFlyingLap } from "@/lib/laps/types";
import { driveSlip } from "@/lib/slip/drive-slip";
import { calibrateSlipZero } from "@/lib/slip/calibrate-slip-zero";
import { spinEvents } from "@/lib/slip/spin-events";
import { cornerExitSlip, type CornerExitSlip } from "@/lib/slip/corner-exit-slip";
import { slipThrottleScatter } from "@/lib/slip/slip-throttle-scatter";
import { bucketByDistance } from "./bucket-by-distance";
import { lapDistance, lapRange, type AnalysisBase, type LapInfo } from "./analysis-base";
import { arr, cornerAt, lapAt, thresholdOf } from "./page-helpers";

export interface SpinRow {
  lap: number | null;
  corner: string | null;
  startTimeS: number;
  /** Time above the target (s). */
  durationS: number;
  peakSlip: number;
  distanceM: number | null;
}

export type SlipTrace = { distanceM: (number | null)[]; slip: (number | null)[]; throttlePct: (number | null)[] };

export interface SlipAnalysis {
  available: boolean;
  reason?: string;
  targetSlip: number;
  targetSource: "bike" | "track" | "default";
  zero: { ratio: number; applied: boolean; sampleCount: number; reason?: string | null };
  lean: { possible: boolean; applied: boolean; crownRadiusMm: number | null; frontCrownRadiusMm: number | null };
  laps: LapInfo[];
  lap: number | null;
  /** Selected lap on a 2 m grid: distance (m), slip (fraction), throttle (%). */
  trace: SlipTrace | null;
  spins: SpinRow[];
  /** Per flying lap, the corner exits. */
  exits: { lap: number; exits: CornerExitSlip[] }[];
  scatter: { throttlePct: number[]; slip: number[] };
  cornerSource: AnalysisBase["cornerSource"];
}

/** Everything of the slip page but the lap trace, and the slip channel the traces are cut from. */
export function slipCore(base: AnalysisBase, leanAsked: boolean): { result: SlipAnalysis; slip: Float32Array | null } {
  const { series } = base;
  const target = thresholdOf(base, "wheelSpinTargetSlip");
  const minThrottle = thresholdOf(base, "wheelSpinMinThrottlePct").value;
  const crown = base.bike?.tyreCrownRadiusMm ?? null;
  const frontCrown = base.bike?.tyreCrownRadiusFrontMm ?? null;
  const rearCirc = base.bike?.wheelCircRearMm ?? null;
  const frontCirc = base.bike?.wheelCircFrontMm ?? null;
  // Both tyres or neither: correcting one wheel only biases the slip at lean.
  const leanPossible = !!(series.channels.lean_angle && crown && rearCirc && frontCrown && frontCirc);
  const empty: SlipAnalysis = {
    available: false,
    targetSlip: target.value,
    targetSource: target.source,
    zero: { ratio: 1, applied: false, sampleCount: 0 },
    lean: { possible: leanPossible, applied: false, crownRadiusMm: crown, frontCrownRadiusMm: frontCrown },
    laps: base.lapInfo,
    lap: null,
    trace: null,
    spins: [],
    exits: [],
    scatter: { throttlePct: [], slip: [] },
    cornerSource: base.cornerSource,
  };
  if (!series.channels.speed_front || !series.channels.speed_rear) {
    return { result: { ...empty, reason: "Drive slip needs both wheel speeds; this session has no front or rear wheel speed channel." }, slip: null };
  }

  const zero = calibrateSlipZero(series);
  const leanApplied = leanAsked && leanPossible;
  const slip = driveSlip(series, {
    zeroRatio: zero.ratio,
    lean: leanApplied
      ? { rearRadiusM: rearCirc! / 1000 / (2 * Math.PI), rearCrownRadiusM: crown! / 1000, frontRadiusM: frontCirc! / 1000 / (2 * Math.PI), frontCrownRadiusM: frontCrown! / 1000 }
      : undefined,
  });
  const throttle = series.channels.throttle;
  // The same spin rule as the wheel-spin finding: target, throttle, minimum duration, wheelie guard.
  const spins: SpinRow[] = spinEvents(slip, throttle, series.timeS, {
    targetSlip: target.value,
    minThrottlePct: minThrottle,
    minDurationS: thresholdOf(base, "wheelSpinMinDurationS").value,
    frontSpeedMps: series.channels.speed_front,
    wheelieDecelMps2: thresholdOf(base, "wheelieDecelMps2").value,
  }).map((e) => {
    const k = lapAt(base, e.startTimeS);
    const d = k >= 0 ? base.dist.distanceM[e.startIndex] - base.dist.lapStartDistanceM[k] : NaN;
    return { lap: k >= 0 ? base.laps[k].number : null, corner: k >= 0 ? cornerAt(base.corners, d) : null, startTimeS: e.startTimeS, durationS: e.durationS, peakSlip: e.peakSlip, distanceM: Number.isFinite(d) ? d : null };
  });

  const exits: SlipAnalysis["exits"] = [];
  base.laps.forEach((l, k) => {
    if (!isFlyingLap(l) || base.corners.length === 0) return;
    const [from, to] = lapRange(series.timeS, l);
    exits.push({ lap: l.number, exits: cornerExitSlip(slip.subarray(from, to), lapDistance(base, k, from, to), series.timeS.subarray(from, to), base.corners, { targetSlip: target.value }) });
  });
  const sc = throttle ? slipThrottleScatter(slip, throttle, 2500) : { throttlePct: new Float32Array(0), slip: new Float32Array(0) };
  return {
    result: {
      ...empty,
      available: true,
      zero: { ratio: zero.ratio, applied: zero.applied, sampleCount: zero.sampleCount, reason: zero.reason ?? null },
      lean: { possible: leanPossible, applied: leanApplied, crownRadiusMm: crown, frontCrownRadiusMm: frontCrown },
      spins,
      exits,
      scatter: { throttlePct: Array.from(sc.throttlePct, (x) => Math.round(x * 10) / 10), slip: Array.from(sc.slip, (x) => Math.round(x * 1e4) / 1e4) },
    },
    slip,
  };
}

/** One lap's slip and throttle on the 2 m grid of bucketByDistance. */
export function slipTrace(base: AnalysisBase, slip: Float32Array, lap: Lap): SlipTrace {
  const k = base.laps.indexOf(lap);
  const [from, to] = lapRange(base.series.timeS, lap);
  const d = lapDistance(base, k, from, to);
  const b = bucketByDistance(d, slip.subarray(from, to), base.series.channels.throttle?.subarray(from, to), base.dist.lapLengthM[k] || d[d.length - 1] || 0);
  return { distanceM: arr(b.distanceM), slip: arr(b.peak), throttlePct: arr(b.mean) };
}

/** The lap the slip page shows: the one asked for, else the best, else the first. */
export function slipLapShown<L extends { number: number }>(laps: readonly L[], best: L | null, lap: number | null | undefined): L | null {
  return laps.find((l) => l.number === lap) ?? best ?? laps[0] ?? null;
}

export function computeSlip(base: AnalysisBase, opts: { lap?: number | null; lean?: boolean } = {}): SlipAnalysis {
  const { result, slip } = slipCore(base, !!opts.lean);
  if (!slip) return result;
  const chosen = slipLapShown(base.laps, base.bestLap, opts.lap);
  return { ...result, lap: chosen?.number ?? null, trace: chosen ? slipTrace(base, slip, chosen) : null };
}

export type { CornerExitSlip, LapInfo };
