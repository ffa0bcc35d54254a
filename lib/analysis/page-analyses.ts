/**
 * Drive slip, Suspension use, Gears and the Rider brief computed from an AnalysisBase, reshaped
 * into the small plain objects the pages render. Pure (no database): lib/data/analysis.ts calls
 * these on request, precomputePageAnalyses (ingest) with the default settings for every lap.
 */
import type { Lap } from "@/lib/laps/types";
import { isFlyingLap } from "@/lib/laps/types";
import { lowerBound } from "@/lib/laps/lower-bound";
import { brakingPoints, type BrakingPoint } from "@/lib/braking/braking-points";
import { compareBraking, type BrakingDifference } from "@/lib/braking/compare-braking";
import { alignToReference } from "@/lib/braking/align-to-reference";
import { driveSlip } from "@/lib/slip/drive-slip";
import { calibrateSlipZero } from "@/lib/slip/calibrate-slip-zero";
import { spinEvents } from "@/lib/slip/spin-events";
import { cornerExitSlip, type CornerExitSlip } from "@/lib/slip/corner-exit-slip";
import { slipThrottleScatter } from "@/lib/slip/slip-throttle-scatter";
import { suspensionUse, DEFAULT_LOW_HIGH_BOUNDARY_MS, DEFAULT_VELOCITY_WINDOW_MS } from "@/lib/suspension/suspension-use";
import { gearFromRatios } from "@/lib/gear/gear-from-ratios";
import { timeInGear, type TimeInGear } from "@/lib/gear/time-in-gear";
import { shiftEvents } from "@/lib/gear/shift-events";
import { DEFAULT_THRESHOLDS } from "@/lib/findings/thresholds";
import { resolveThreshold } from "@/lib/findings/resolve-thresholds";
import { bucketByDistance } from "./bucket-by-distance";
import { outlineFromFixes, projectOnOutline, type Outline } from "@/lib/geo/outline-path";
import { groundSpeed, lapDistance, lapRange, type AnalysisBase, type LapInfo } from "./analysis-base";

/** A threshold as the findings engine resolves it (resolveThreshold: track over bike over default). */
function thresholdOf(base: AnalysisBase, key: keyof typeof DEFAULT_THRESHOLDS): { value: number; source: "bike" | "track" | "default" } {
  return resolveThreshold(key, base.bike?.thresholds, base.trackThresholds);
}

function lapAt(base: AnalysisBase, timeS: number): number {
  for (let k = 0; k < base.laps.length; k++) if (timeS >= base.laps[k].startTimeS && timeS < base.laps[k].endTimeS) return k;
  return -1;
}

/** The corner whose exit a lap distance lies in: the last apex at or before it. */
function cornerAt(corners: { name: string; distanceM: number }[], d: number): string | null {
  if (corners.length === 0 || !Number.isFinite(d)) return null;
  const sorted = [...corners].sort((a, b) => a.distanceM - b.distanceM);
  let c = sorted[sorted.length - 1];
  for (const x of sorted) if (x.distanceM <= d) c = x;
  return c.name;
}

const arr = (a: ArrayLike<number>): (number | null)[] => Array.from(a, (x) => (Number.isFinite(x) ? Math.round(x * 1e4) / 1e4 : null));

/* ───────────────────────────── Drive slip ───────────────────────────── */

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
function slipCore(base: AnalysisBase, leanAsked: boolean): { result: SlipAnalysis; slip: Float32Array | null } {
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
    frontSpeedMs: series.channels.speed_front,
    wheelieDecelMs2: thresholdOf(base, "wheelieDecelMs2").value,
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
function slipTrace(base: AnalysisBase, slip: Float32Array, lap: Lap): SlipTrace {
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

/* ─────────────────────────── Suspension use ─────────────────────────── */

export interface SuspensionSide {
  label: "Fork" | "Shock";
  strokeMm: number;
  strokeFromBike: boolean;
  position: { edgesPct: number[]; timePct: number[] };
  velocity: { edgesMms: number[]; timePct: number[] };
  split: { boundaryMs: number; compressionLowPct: number; compressionHighPct: number; reboundLowPct: number; reboundHighPct: number };
  sagMm: { rolling: number | null; standing: number | null };
  maxTravelMm: number | null;
  maxTravelPct: number | null;
  bottomingCount: number;
  /** The travel channel's own sample rate (Hz) and the velocity window in its own samples. */
  channelRateHz: number | null;
  windowSamples: number;
  /** Why the velocity histogram is empty, when it is (too few of the channel's own samples in a row). */
  velocityNote: string | null;
}

export interface SuspensionAnalysis {
  scope: string;
  lap: number | null;
  laps: LapInfo[];
  /** Velocity window (ms). */
  window: number;
  boundaryMs: number;
  fork: SuspensionSide | null;
  shock: SuspensionSide | null;
  sampleRateHz: number | null;
}

/**
 * Savitzky–Golay windows offered, in milliseconds (each becomes an odd count of the travel
 * channel's own samples): at 100 Hz these are the 5- to 21-sample windows.
 */
export const SG_WINDOWS = [50, 70, 90, 110, 150, 210] as const;
/** The Savitzky–Golay window the page starts with (ms; a Lapbench default). */
export const DEFAULT_SG_WINDOW = DEFAULT_VELOCITY_WINDOW_MS;

/** The settings as computeSuspension reads them: a window not offered, or a boundary ≤ 0, falls back to the default. */
export function suspensionSettings(opts: { window?: number; boundaryMs?: number }): { window: number; boundaryMs: number } {
  const window = SG_WINDOWS.includes(opts.window as (typeof SG_WINDOWS)[number]) ? opts.window! : DEFAULT_SG_WINDOW;
  const boundaryMs = opts.boundaryMs && opts.boundaryMs > 0 ? opts.boundaryMs : DEFAULT_LOW_HIGH_BOUNDARY_MS;
  return { window, boundaryMs };
}

/** Fork and shock over samples [from, to) (the whole session or one lap). */
function suspensionSides(base: AnalysisBase, from: number, to: number, window: number, boundaryMs: number): { fork: SuspensionSide | null; shock: SuspensionSide | null } {
  const { series } = base;
  const t = series.timeS.subarray(from, to);
  const speed = series.channels.speed_front ?? series.channels.speed_rear;
  const side = (label: "Fork" | "Shock", travel: Float32Array | undefined, strokeMm: number | null): SuspensionSide | null => {
    if (!travel) return null;
    const x = travel.subarray(from, to);
    let observed = 0;
    for (let i = 0; i < x.length; i++) if (x[i] > observed) observed = x[i];
    // Without the bike's stroke, the deepest travel seen stands in (bottoming then means nothing).
    const strokeM = strokeMm ? strokeMm / 1000 : observed || 1;
    const u = suspensionUse(x, t, { strokeM, lowHighBoundaryMs: boundaryMs, velocityWindowMs: window, velocityOrder: 2, speedMs: speed?.subarray(from, to), leanDeg: series.channels.lean_angle?.subarray(from, to) });
    const mm = (v: number | null) => (v == null || !Number.isFinite(v) ? null : Math.round(v * 10000) / 10);
    return {
      label,
      strokeMm: strokeM * 1000,
      strokeFromBike: !!strokeMm,
      position: { edgesPct: Array.from(u.position.edges), timePct: Array.from(u.position.timePct) },
      velocity: { edgesMms: Array.from(u.velocity.edges, (e) => Math.round(e * 1000)), timePct: Array.from(u.velocity.timePct) },
      split: u.split,
      sagMm: { rolling: mm(u.sag.steadySpeedM), standing: mm(u.sag.stoppedM) },
      maxTravelMm: mm(u.maxTravelM),
      maxTravelPct: Number.isFinite(u.maxTravelPct) ? u.maxTravelPct : null,
      bottomingCount: strokeMm ? u.bottoming.count : 0,
      channelRateHz: u.channelRateHz,
      windowSamples: u.velocityWindowSamples,
      velocityNote:
        u.sampleCount > 0 && u.velocity.timePct.every((p) => p === 0)
          ? `No velocity: the ${label.toLowerCase()} channel has no run of ${u.velocityWindowSamples} samples in a row${u.channelRateHz ? ` at its own ${Math.round(u.channelRateHz)} Hz` : ""} to fit the ${window} ms window.`
          : null,
    };
  };
  return { fork: side("Fork", series.channels.fork_travel, base.bike?.forkStrokeMm ?? null), shock: side("Shock", series.channels.shock_travel, base.bike?.shockStrokeMm ?? null) };
}

export function sampleRateHz(timeS: Float64Array): number | null {
  const n = timeS.length;
  return n > 1 ? (n - 1) / (timeS[n - 1] - timeS[0]) : null;
}

export function computeSuspension(base: AnalysisBase, opts: { lap?: number | null; window?: number; boundaryMs?: number } = {}): SuspensionAnalysis {
  const { series } = base;
  const { window, boundaryMs } = suspensionSettings(opts);
  const lap = opts.lap != null ? base.laps.find((l) => l.number === opts.lap) ?? null : null;
  const [from, to] = lap ? lapRange(series.timeS, lap) : [0, series.timeS.length];
  return {
    scope: lap ? `Lap ${lap.number}` : "Whole session",
    lap: lap?.number ?? null,
    laps: base.lapInfo,
    window,
    boundaryMs,
    ...suspensionSides(base, from, to, window, boundaryMs),
    sampleRateHz: sampleRateHz(series.timeS),
  };
}

/* ─────────────────────────────── Gears ──────────────────────────────── */

export interface GearAnalysis {
  source: "logged" | "ratios" | "none";
  reason?: string;
  rows: TimeInGear[];
  shifts: { lap: number | null; timeS: number; fromGear: number; toGear: number; direction: "up" | "down"; clutchless: boolean; rpmBefore: number; rpmAfter: number; shiftTimeS: number }[];
  clutchlessUpshifts: number;
  upshifts: number;
}

export function computeGears(base: AnalysisBase): GearAnalysis {
  const { series, bike } = base;
  const c = series.channels;
  let gear: Uint8Array | null = null;
  let source: GearAnalysis["source"] = "none";
  if (c.gear) {
    // A plain loop: Uint8Array.from over a typed array goes through its iterator and first
    // collects every sample into a JS list (~0.2 s and tens of MB of heap for a 2.5-hour log).
    const logged = c.gear;
    const g = new Uint8Array(logged.length);
    for (let i = 0; i < logged.length; i++) {
      const x = logged[i];
      g[i] = Number.isFinite(x) && x > 0 ? Math.round(x) : 0;
    }
    gear = g;
    source = "logged";
  } else if (c.engine_rpm && c.speed_rear && bike?.primaryRatio && bike.gearboxRatios?.length && bike.sprocketFront && bike.sprocketRear && bike.wheelCircRearMm) {
    gear = gearFromRatios(c.engine_rpm, c.speed_rear, {
      primaryRatio: bike.primaryRatio,
      gearboxRatios: bike.gearboxRatios,
      sprocketFront: bike.sprocketFront,
      sprocketRear: bike.sprocketRear,
      rearCircumferenceM: bike.wheelCircRearMm / 1000,
    });
    source = "ratios";
  }
  if (!gear) {
    return { source, reason: "No gear channel, and the bike's ratios, sprockets and rear wheel circumference are not all set (or engine speed / rear wheel speed is missing).", rows: [], shifts: [], clutchlessUpshifts: 0, upshifts: 0 };
  }
  const rpm = c.engine_rpm ?? new Float32Array(gear.length).fill(NaN);
  const shifts = shiftEvents(gear, rpm, c.throttle, series.timeS).map((s) => {
    const k = lapAt(base, s.timeS);
    return { lap: k >= 0 ? base.laps[k].number : null, timeS: s.timeS, fromGear: s.fromGear, toGear: s.toGear, direction: s.direction, clutchless: s.clutchless, rpmBefore: s.rpmBefore, rpmAfter: s.rpmAfter, shiftTimeS: s.shiftTimeS };
  });
  return {
    source,
    rows: timeInGear(gear, series.timeS),
    shifts,
    clutchlessUpshifts: shifts.filter((s) => s.clutchless).length,
    upshifts: shifts.filter((s) => s.direction === "up").length,
  };
}

/* ──────────────────────────── Rider brief ───────────────────────────── */

/** Default front pressure that counts as the start of braking in the brief: the shared brake-on threshold (2 bar, Lapbench default). */
export const BRIEF_BRAKE_THRESHOLD_PA = DEFAULT_THRESHOLDS.brakeAppliedPa.value;

export interface BriefCorner {
  name: string;
  /** One plain sentence. */
  text: string;
  /** Metres earlier (+) or later (−) than on the best lap; null when either did not brake. */
  earlierM: number | null;
  peakBar: number | null;
  bestPeakBar: number | null;
  minSpeedKmh: number | null;
  bestMinSpeedKmh: number | null;
  /** Where the corner is on the outline (local metres), if GPS allows. */
  at: [number, number] | null;
  /** Where braking started on the shown lap and on the best lap (local metres). */
  brakeAt: [number, number] | null;
  bestBrakeAt: [number, number] | null;
}

export interface RiderBrief {
  available: boolean;
  reason?: string;
  sessionId: number;
  title: string;
  laps: LapInfo[];
  lap: number | null;
  bestLap: number | null;
  corners: BriefCorner[];
  outline: Outline | null;
}

/** Braking of one lap against the best lap, corner by corner: the points, their differences, and the brief's rows. */
export interface LapBraking {
  points: BrakingPoint[];
  differences: BrakingDifference[];
  corners: BriefCorner[];
}

/** The brief's default lap: the latest flying lap that is not the best one (comparing the best with itself says nothing). */
export function briefLapShown<L extends { number: number }>(laps: readonly L[], flying: readonly L[], best: L, lap: number | null | undefined): L {
  return laps.find((l) => l.number === lap) ?? [...flying].reverse().find((l) => l !== best) ?? best;
}

type BriefCore = { out: RiderBrief; braking: ((l: Lap) => LapBraking) | null };

function briefCore(base: AnalysisBase): BriefCore {
  const { series } = base;
  const out: RiderBrief = { available: false, sessionId: base.sessionId, title: base.title, laps: base.lapInfo, lap: null, bestLap: base.bestLap?.number ?? null, corners: [], outline: null };
  const v = groundSpeed(series);
  const p = series.channels.brake_front;
  if (!base.bestLap) return { out: { ...out, reason: "This session has no complete flying lap to compare with." }, braking: null };
  if (!v || !p) return { out: { ...out, reason: "The brief needs the front brake pressure and a speed channel; this session lacks one of them." }, braking: null };
  if (base.corners.length === 0) return { out: { ...out, reason: "No corners were found on the best lap." }, braking: null };
  const bestLap = base.bestLap;
  const brakeOnPa = thresholdOf(base, "brakeAppliedPa").value;

  const lapPoints = (l: Lap) => {
    const k = base.laps.indexOf(l);
    const [from, to] = lapRange(series.timeS, l);
    const d = lapDistance(base, k, from, to);
    return { from, d, points: brakingPoints({ distanceM: d, speedMs: v.subarray(from, to), brakeFrontPa: p.subarray(from, to) }, base.corners, { thresholdPa: brakeOnPa }) };
  };
  const ref = lapPoints(bestLap);

  // The outline from the best lap's own fixes keeps it clean of pit-lane and out-lap paths.
  const [bf, bt] = lapRange(series.timeS, bestLap);
  const lat = series.channels.gps_lat;
  const lon = series.channels.gps_lon;
  const outline = lat && lon ? outlineFromFixes(lat.subarray(bf, bt), lon.subarray(bf, bt), 4) : null;
  const posAt = (lapData: { from: number; d: Float64Array }, dM: number | null): [number, number] | null => {
    if (!outline || !lat || !lon || dM == null) return null;
    const i = lowerBound(lapData.d, dM);
    // Nearest GPS fix around that sample (GPS is slower than the clock).
    for (let k = 0; k < 200; k++) {
      for (const j of [i + k, i - k]) {
        const g = lapData.from + j;
        if (j >= 0 && j < lapData.d.length && Number.isFinite(lat[g]) && Number.isFinite(lon[g])) return projectOnOutline(outline, lat[g], lon[g]);
      }
    }
    return null;
  };
  const refByName = new Map(ref.points.map((r) => [r.name, r]));
  const bar = (pa: number | null | undefined) => (pa == null || !Number.isFinite(pa) ? null : Math.round(pa / 1e4) / 10);
  const kmh = (ms: number | null | undefined) => (ms == null || !Number.isFinite(ms) ? null : Math.round(ms * 3.6));
  const braking = (shown: Lap): LapBraking => {
    const cur = shown === bestLap ? ref : lapPoints(shown);
    // Compared where they are on the track: this lap's points projected onto the best lap's path.
    const pathOf = (l: { from: number; d: Float64Array }) => ({ distanceM: l.d, lat: lat?.subarray(l.from, l.from + l.d.length), lon: lon?.subarray(l.from, l.from + l.d.length) });
    const aligned = cur === ref ? ref.points : alignToReference(cur.points, pathOf(cur), pathOf(ref));
    const diffs = compareBraking(aligned, ref.points, { referenceLabel: "your best lap" });
    const corners: BriefCorner[] = diffs.map((dff) => {
      const c: BrakingPoint | undefined = cur.points.find((x) => x.name === dff.name);
      const r = refByName.get(dff.name);
      return {
        name: dff.name,
        text: dff.text,
        earlierM: dff.onsetEarlierM,
        peakBar: bar(c?.peakPressurePa),
        bestPeakBar: bar(r?.peakPressurePa),
        minSpeedKmh: kmh(c?.minSpeedMs),
        bestMinSpeedKmh: kmh(r?.minSpeedMs),
        at: posAt(ref, r?.apexDistanceM ?? null),
        brakeAt: posAt(cur, c?.onsetDistanceM ?? null),
        bestBrakeAt: posAt(ref, r?.onsetDistanceM ?? null),
      };
    });
    return { points: cur.points, differences: diffs, corners };
  };
  return { out: { ...out, available: true, outline }, braking };
}

export function computeBrief(base: AnalysisBase, opts: { lap?: number | null } = {}): RiderBrief {
  const { out, braking } = briefCore(base);
  if (!braking) return out;
  const shown = briefLapShown(base.laps, base.laps.filter(isFlyingLap), base.bestLap!, opts.lap);
  return { ...out, lap: shown.number, corners: braking(shown).corners };
}

/* ─────────────────────── Precomputed at ingest ──────────────────────── */

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

export type { CornerExitSlip, LapInfo };
