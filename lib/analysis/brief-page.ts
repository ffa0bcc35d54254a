/**
 * Rider brief: braking corner by corner on one lap against the rider's best lap, with positions
 * on the best lap's outline. Pure (no database).
 */
import type { Lap } from "@/lib/laps/types";
import { isFlyingLap } from "@/lib/laps/types";
import { lowerBound } from "@/lib/laps/lower-bound";
import { brakingPoints, type BrakingPoint } from "@/lib/braking/braking-points";
import { compareBraking, type BrakingDifference } from "@/lib/braking/compare-braking";
import { alignToReference } from "@/lib/braking/align-to-reference";
import { DEFAULT_THRESHOLDS } from "@/lib/findings/thresholds";
import { outlineFromFixes, projectOnOutline, type Outline } from "@/lib/geo/outline-path";
import { groundSpeed, lapDistance, lapRange, type AnalysisBase, type LapInfo } from "./analysis-base";
import { thresholdOf } from "./page-helpers";

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

export function briefCore(base: AnalysisBase): BriefCore {
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
    return { from, d, points: brakingPoints({ distanceM: d, speedMps: v.subarray(from, to), brakeFrontPa: p.subarray(from, to) }, base.corners, { thresholdPa: brakeOnPa }) };
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
        minSpeedKmh: kmh(c?.minSpeedMps),
        bestMinSpeedKmh: kmh(r?.minSpeedMps),
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
