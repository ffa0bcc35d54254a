/**
 * The data behind Drive slip, Suspension use, Gears and the Rider brief: a session's stored
 * samples, laps, bike and track read once (loadAnalysisBase), then reshaped by the plain lib/
 * computations into small plain objects a page can render. Callers check access first
 * (getSessionForViewer); these functions take a session id that is already allowed.
 */
import type { Sequelize } from "sequelize";
import { initModels, Bike, Lap as LapModel, RideSession, Track, type TrackGates as StoredGates, type TrackCorner } from "@/models";
import type { ChannelRole, SessionSeries } from "@/lib/channels/roles";
import type { Lap, SeriesLike, TrackGates } from "@/lib/laps/types";
import { isFlyingLap } from "@/lib/laps/types";
import { detectLaps } from "@/lib/laps/detect-laps";
import { distanceChannel, type DistanceChannel } from "@/lib/laps/distance-channel";
import { lowerBound } from "@/lib/laps/lower-bound";
import { findCorners } from "@/lib/braking/find-corners";
import { brakingPoints, type BrakingPoint } from "@/lib/braking/braking-points";
import { compareBraking } from "@/lib/braking/compare-braking";
import { driveSlip } from "@/lib/slip/drive-slip";
import { calibrateSlipZero } from "@/lib/slip/calibrate-slip-zero";
import { spinEvents } from "@/lib/slip/spin-events";
import { cornerExitSlip, type CornerExitSlip } from "@/lib/slip/corner-exit-slip";
import { slipThrottleScatter } from "@/lib/slip/slip-throttle-scatter";
import { suspensionUse, DEFAULT_LOW_HIGH_BOUNDARY_MS } from "@/lib/suspension/suspension-use";
import { gearFromRatios } from "@/lib/gear/gear-from-ratios";
import { timeInGear, type TimeInGear } from "@/lib/gear/time-in-gear";
import { shiftEvents } from "@/lib/gear/shift-events";
import { DEFAULT_THRESHOLDS } from "@/lib/findings/thresholds";
import { bucketByDistance } from "@/lib/analysis/bucket-by-distance";
import { outlineFromFixes, projectOnOutline, type Outline } from "@/lib/geo/outline-path";
import { loadSessionSeries } from "./session-series";
import { jsonColumn } from "./json-column";

export interface LapInfo {
  number: number;
  lapTimeMs: number;
  flying: boolean;
  best: boolean;
  startTimeS: number;
  endTimeS: number;
}

export interface BikeInfo {
  id: number;
  name: string;
  wheelCircRearMm: number | null;
  primaryRatio: number | null;
  gearboxRatios: number[] | null;
  sprocketFront: number | null;
  sprocketRear: number | null;
  forkStrokeMm: number | null;
  shockStrokeMm: number | null;
  tyreCrownRadiusMm: number | null;
  thresholds: Record<string, number>;
}

export interface AnalysisBase {
  sessionId: number;
  title: string;
  series: SessionSeries;
  laps: Lap[];
  lapInfo: LapInfo[];
  dist: DistanceChannel;
  bestLap: Lap | null;
  bike: BikeInfo | null;
  trackThresholds: Record<string, number>;
  /** Corners: the track's named corners, else found on the best lap's speed trace. */
  corners: { name: string; distanceM: number }[];
  cornerSource: "track" | "found" | "none";
}

function toLibGates(g: StoredGates | null): TrackGates | null {
  if (!g?.startFinish) return null;
  return { startFinish: g.startFinish, sectors: g.sectors ?? [], pitEntry: g.pitEntry ?? undefined, pitExit: g.pitExit ?? undefined };
}

/** Sample index range [from, to) of a lap on the master clock. */
export function lapRange(timeS: Float64Array, lap: { startTimeS: number; endTimeS: number }): [number, number] {
  return [lowerBound(timeS, lap.startTimeS), lowerBound(timeS, lap.endTimeS)];
}

/** Distance from the lap's start for samples [from, to). */
function lapDistance(base: AnalysisBase, lapIdx: number, from: number, to: number): Float64Array {
  const off = base.dist.lapStartDistanceM[lapIdx];
  const out = new Float64Array(to - from);
  for (let i = from; i < to; i++) out[i - from] = base.dist.distanceM[i] - off;
  return out;
}

function groundSpeed(series: SeriesLike) {
  return series.channels.speed_front ?? series.channels.gps_speed ?? series.channels.speed_rear;
}

export async function loadAnalysisBase(sequelize: Sequelize, sessionId: number, roles?: readonly ChannelRole[]): Promise<AnalysisBase> {
  initModels(sequelize);
  const session = await RideSession.findByPk(sessionId);
  if (!session) throw new Error(`session ${sessionId} not found`);
  // Distance and laps always need the wheel speeds and GPS.
  const need: ChannelRole[] | undefined = roles ? [...new Set<ChannelRole>([...roles, "speed_front", "gps_speed", "gps_lat", "gps_lon"])] : undefined;
  const [{ series }, lapRows, bikeRow, trackRow] = await Promise.all([
    loadSessionSeries(sequelize, sessionId, need),
    LapModel.findAll({ where: { sessionId }, order: [["number", "ASC"]] }),
    session.bikeId ? Bike.findByPk(session.bikeId) : null,
    session.trackId ? Track.findByPk(session.trackId) : null,
  ]);
  let laps: Lap[] = lapRows.map((l) => ({
    number: l.number,
    startTimeS: l.startTimeS,
    endTimeS: l.endTimeS,
    lapTimeMs: l.lapTimeMs,
    sectorTimesMs: jsonColumn<(number | null)[]>(l.sectorTimesMs) ?? [],
    outLap: Boolean(l.isOutLap),
    inLap: Boolean(l.isInLap),
    pitPass: Boolean(l.pitPass),
    complete: jsonColumn<{ complete?: boolean }>(l.stats)?.complete ?? (!l.isOutLap && !l.isInLap),
    invalid: Boolean(l.isInvalid),
  }));
  // Laps are stored at ingest; a session read before that (or with no track then) gets them
  // from the track's gates here, without storing.
  if (laps.length === 0) {
    const gates = toLibGates(jsonColumn<StoredGates>(trackRow?.gates));
    if (gates) laps = detectLaps(series, gates);
  }
  const dist = distanceChannel(series, laps);
  let bestLap: Lap | null = null;
  for (const l of laps) if (isFlyingLap(l) && (!bestLap || l.lapTimeMs < bestLap.lapTimeMs)) bestLap = l;
  const lapInfo = laps.map((l) => ({ number: l.number, lapTimeMs: l.lapTimeMs, flying: isFlyingLap(l), best: l === bestLap, startTimeS: l.startTimeS, endTimeS: l.endTimeS }));

  const bike: BikeInfo | null = bikeRow
    ? {
        id: bikeRow.id,
        name: bikeRow.name,
        wheelCircRearMm: bikeRow.wheelCircRearMm,
        primaryRatio: bikeRow.primaryRatio,
        gearboxRatios: jsonColumn<number[]>(bikeRow.gearboxRatios),
        sprocketFront: bikeRow.sprocketFront,
        sprocketRear: bikeRow.sprocketRear,
        forkStrokeMm: bikeRow.forkStrokeMm,
        shockStrokeMm: bikeRow.shockStrokeMm,
        tyreCrownRadiusMm: bikeRow.tyreCrownRadiusMm,
        thresholds: jsonColumn<Record<string, number>>(bikeRow.thresholds) ?? {},
      }
    : null;

  let corners: { name: string; distanceM: number }[] = [];
  let cornerSource: AnalysisBase["cornerSource"] = "none";
  const named = jsonColumn<TrackCorner[]>(trackRow?.corners);
  if (named && named.length) {
    corners = named.filter((c) => Number.isFinite(c.distanceM)).map((c) => ({ name: c.name, distanceM: c.distanceM }));
    cornerSource = "track";
  } else if (bestLap) {
    const v = groundSpeed(series);
    if (v) {
      const idx = laps.indexOf(bestLap);
      const [from, to] = lapRange(series.timeS, bestLap);
      const base0 = { dist } as AnalysisBase;
      corners = findCorners(v.subarray(from, to), lapDistance(base0, idx, from, to)).map((c) => ({ name: c.name, distanceM: c.distanceM }));
      cornerSource = corners.length ? "found" : "none";
    }
  }
  return {
    sessionId,
    title: session.title ?? `Session ${session.id}`,
    series,
    laps,
    lapInfo,
    dist,
    bestLap,
    bike,
    trackThresholds: jsonColumn<Record<string, number>>(trackRow?.thresholds) ?? {},
    corners,
    cornerSource,
  };
}

/** A threshold as the findings engine resolves it (mergeThresholds: track over bike over default). */
function thresholdOf(base: AnalysisBase, key: keyof typeof DEFAULT_THRESHOLDS): { value: number; source: "bike" | "track" | "default" } {
  const t = base.trackThresholds[key];
  if (typeof t === "number") return { value: t, source: "track" };
  const b = base.bike?.thresholds[key];
  if (typeof b === "number") return { value: b, source: "bike" };
  return { value: DEFAULT_THRESHOLDS[key].value, source: "default" };
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

export interface SlipAnalysis {
  available: boolean;
  reason?: string;
  targetSlip: number;
  targetSource: "bike" | "track" | "default";
  zero: { ratio: number; applied: boolean; sampleCount: number };
  lean: { possible: boolean; applied: boolean; crownRadiusMm: number | null };
  laps: LapInfo[];
  lap: number | null;
  /** Selected lap on a 2 m grid: distance (m), slip (fraction), throttle (%). */
  trace: { distanceM: (number | null)[]; slip: (number | null)[]; throttlePct: (number | null)[] } | null;
  spins: SpinRow[];
  /** Per flying lap, the corner exits. */
  exits: { lap: number; exits: CornerExitSlip[] }[];
  scatter: { throttlePct: number[]; slip: number[] };
  cornerSource: AnalysisBase["cornerSource"];
}

export async function slipAnalysis(sequelize: Sequelize, sessionId: number, opts: { lap?: number | null; lean?: boolean } = {}): Promise<SlipAnalysis> {
  const base = await loadAnalysisBase(sequelize, sessionId, ["speed_front", "speed_rear", "throttle", "lean_angle"]);
  const { series } = base;
  const target = thresholdOf(base, "wheelSpinTargetSlip");
  const minThrottle = thresholdOf(base, "wheelSpinMinThrottlePct").value;
  const crown = base.bike?.tyreCrownRadiusMm ?? null;
  const rearCirc = base.bike?.wheelCircRearMm ?? null;
  const leanPossible = !!(series.channels.lean_angle && crown && rearCirc);
  const empty: SlipAnalysis = {
    available: false,
    targetSlip: target.value,
    targetSource: target.source,
    zero: { ratio: 1, applied: false, sampleCount: 0 },
    lean: { possible: leanPossible, applied: false, crownRadiusMm: crown },
    laps: base.lapInfo,
    lap: null,
    trace: null,
    spins: [],
    exits: [],
    scatter: { throttlePct: [], slip: [] },
    cornerSource: base.cornerSource,
  };
  if (!series.channels.speed_front || !series.channels.speed_rear) return { ...empty, reason: "Drive slip needs both wheel speeds; this session has no front or rear wheel speed channel." };

  const zero = calibrateSlipZero(series);
  const leanApplied = !!opts.lean && leanPossible;
  const slip = driveSlip(series, {
    zeroRatio: zero.ratio,
    lean: leanApplied ? { rearRadiusM: rearCirc! / 1000 / (2 * Math.PI), rearCrownRadiusM: crown! / 1000 } : undefined,
  });
  const throttle = series.channels.throttle;
  const spins: SpinRow[] = spinEvents(slip, throttle, series.timeS, { targetSlip: target.value, minThrottlePct: minThrottle }).map((e) => {
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

  const chosen = base.laps.find((l) => l.number === opts.lap) ?? base.bestLap ?? base.laps[0] ?? null;
  let trace: SlipAnalysis["trace"] = null;
  if (chosen) {
    const k = base.laps.indexOf(chosen);
    const [from, to] = lapRange(series.timeS, chosen);
    const d = lapDistance(base, k, from, to);
    const b = bucketByDistance(d, slip.subarray(from, to), throttle?.subarray(from, to), base.dist.lapLengthM[k] || d[d.length - 1] || 0);
    trace = { distanceM: arr(b.distanceM), slip: arr(b.peak), throttlePct: arr(b.mean) };
  }
  const sc = throttle ? slipThrottleScatter(slip, throttle, 2500) : { throttlePct: new Float32Array(0), slip: new Float32Array(0) };
  return {
    ...empty,
    available: true,
    zero: { ratio: zero.ratio, applied: zero.applied, sampleCount: zero.sampleCount },
    lean: { possible: leanPossible, applied: leanApplied, crownRadiusMm: crown },
    lap: chosen?.number ?? null,
    trace,
    spins,
    exits,
    scatter: { throttlePct: Array.from(sc.throttlePct, (x) => Math.round(x * 10) / 10), slip: Array.from(sc.slip, (x) => Math.round(x * 1e4) / 1e4) },
  };
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
}

export interface SuspensionAnalysis {
  scope: string;
  lap: number | null;
  laps: LapInfo[];
  window: number;
  boundaryMs: number;
  fork: SuspensionSide | null;
  shock: SuspensionSide | null;
  sampleRateHz: number | null;
}

export const SG_WINDOWS = [5, 7, 9, 11, 15, 21] as const;

export async function suspensionAnalysis(
  sequelize: Sequelize,
  sessionId: number,
  opts: { lap?: number | null; window?: number; boundaryMs?: number } = {},
): Promise<SuspensionAnalysis> {
  const base = await loadAnalysisBase(sequelize, sessionId, ["fork_travel", "shock_travel", "lean_angle"]);
  const { series } = base;
  const window = SG_WINDOWS.includes(opts.window as (typeof SG_WINDOWS)[number]) ? opts.window! : 7;
  const boundaryMs = opts.boundaryMs && opts.boundaryMs > 0 ? opts.boundaryMs : DEFAULT_LOW_HIGH_BOUNDARY_MS;
  const lap = opts.lap != null ? base.laps.find((l) => l.number === opts.lap) ?? null : null;
  const [from, to] = lap ? lapRange(series.timeS, lap) : [0, series.timeS.length];
  const t = series.timeS.subarray(from, to);
  const n = series.timeS.length;
  const rate = n > 1 ? (n - 1) / (series.timeS[n - 1] - series.timeS[0]) : null;
  const speed = series.channels.speed_front ?? series.channels.speed_rear;
  const side = (label: "Fork" | "Shock", travel: Float32Array | undefined, strokeMm: number | null): SuspensionSide | null => {
    if (!travel) return null;
    const x = travel.subarray(from, to);
    let observed = 0;
    for (let i = 0; i < x.length; i++) if (x[i] > observed) observed = x[i];
    // Without the bike's stroke, the deepest travel seen stands in (bottoming then means nothing).
    const strokeM = strokeMm ? strokeMm / 1000 : observed || 1;
    const u = suspensionUse(x, t, { strokeM, lowHighBoundaryMs: boundaryMs, velocityWindow: window, velocityOrder: 2, speedMs: speed?.subarray(from, to), leanDeg: series.channels.lean_angle?.subarray(from, to) });
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
    };
  };
  return {
    scope: lap ? `Lap ${lap.number}` : "Whole session",
    lap: lap?.number ?? null,
    laps: base.lapInfo,
    window,
    boundaryMs,
    fork: side("Fork", series.channels.fork_travel, base.bike?.forkStrokeMm ?? null),
    shock: side("Shock", series.channels.shock_travel, base.bike?.shockStrokeMm ?? null),
    sampleRateHz: rate,
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

export async function gearAnalysis(sequelize: Sequelize, sessionId: number): Promise<GearAnalysis> {
  const base = await loadAnalysisBase(sequelize, sessionId, ["gear", "engine_rpm", "speed_rear", "throttle"]);
  const { series, bike } = base;
  const c = series.channels;
  let gear: Uint8Array | null = null;
  let source: GearAnalysis["source"] = "none";
  if (c.gear) {
    gear = Uint8Array.from(c.gear, (g) => (Number.isFinite(g) && g > 0 ? Math.round(g) : 0));
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

/** Front pressure that counts as the start of braking in the brief: 2 bar, as the findings' brake threshold (common practice). */
export const BRIEF_BRAKE_THRESHOLD_PA = DEFAULT_THRESHOLDS.brakeOnStraightPressurePa.value;

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

export async function riderBrief(sequelize: Sequelize, sessionId: number, opts: { lap?: number | null } = {}): Promise<RiderBrief> {
  const base = await loadAnalysisBase(sequelize, sessionId, ["speed_front", "gps_speed", "brake_front", "gps_lat", "gps_lon"]);
  const { series } = base;
  const out: RiderBrief = { available: false, sessionId, title: base.title, laps: base.lapInfo, lap: null, bestLap: base.bestLap?.number ?? null, corners: [], outline: null };
  const v = groundSpeed(series);
  const p = series.channels.brake_front;
  if (!base.bestLap) return { ...out, reason: "This session has no complete flying lap to compare with." };
  if (!v || !p) return { ...out, reason: "The brief needs the front brake pressure and a speed channel; this session lacks one of them." };
  if (base.corners.length === 0) return { ...out, reason: "No corners were found on the best lap." };
  const flying = base.laps.filter(isFlyingLap);
  // Default: the latest flying lap that is not the best one (comparing the best with itself says nothing).
  const shown = base.laps.find((l) => l.number === opts.lap) ?? [...flying].reverse().find((l) => l !== base.bestLap) ?? base.bestLap;

  const lapPoints = (l: Lap) => {
    const k = base.laps.indexOf(l);
    const [from, to] = lapRange(series.timeS, l);
    const d = lapDistance(base, k, from, to);
    return { from, d, points: brakingPoints({ distanceM: d, speedMs: v.subarray(from, to), brakeFrontPa: p.subarray(from, to) }, base.corners, { thresholdPa: BRIEF_BRAKE_THRESHOLD_PA }) };
  };
  const ref = lapPoints(base.bestLap);
  const cur = lapPoints(shown);
  const diffs = compareBraking(cur.points, ref.points, { referenceLabel: "your best lap" });

  // The outline from the best lap's own fixes keeps it clean of pit-lane and out-lap paths.
  const [bf, bt] = lapRange(series.timeS, base.bestLap);
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
  return { ...out, available: true, lap: shown.number, corners, outline };
}

export type { CornerExitSlip };
