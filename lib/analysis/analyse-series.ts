import { detectLaps } from "@/lib/laps/detect-laps";
import { detectLapsFromBeacon } from "@/lib/laps/detect-laps-from-beacon";
import { distanceChannel } from "@/lib/laps/distance-channel";
import { lapStats } from "@/lib/laps/lap-stats";
import { markSuspectLaps } from "@/lib/laps/mark-suspect-laps";
import { bestSectorLap, type BestSectorLap } from "@/lib/laps/best-sector-lap";
import { extractFixes } from "@/lib/laps/extract-fixes";
import { lowerBound } from "@/lib/laps/lower-bound";
import { haversineM } from "@/lib/geo/haversine-m";
import type { Gate } from "@/lib/geo/types";
import { findGateCrossings } from "@/lib/laps/find-gate-crossings";
import { isFlyingLap, type Lap, type SeriesLike, type TrackGates } from "@/lib/laps/types";
import { runFindings } from "@/lib/findings/run-findings";
import { collapseFindings } from "@/lib/findings/collapse-findings";
import { NO_REV_CEILING_NOTE } from "@/lib/findings/thresholds";
import { mergeThresholds as mergeThresholdLayers } from "@/lib/findings/resolve-thresholds";
import type { Finding, FindingKind } from "@/lib/findings/types";
import { engineUsage, type EngineUsage } from "@/lib/engine/engine-usage";

/** What the analysis needs to know about the session's track (plain values, SI). */
export interface AnalysisTrack {
  gates: TrackGates | null;
  /** The track's pit-lane limit, m/s. */
  pitSpeedLimitMps?: number | null;
  /** Track settings over the bike's and the defaults (DEFAULT_THRESHOLDS keys; others ignored). */
  thresholds?: Record<string, number> | null;
}

/** What the analysis needs to know about the bike (plain values, SI). */
export interface AnalysisBike {
  revCeilingRpm?: number | null;
  forkStrokeM?: number | null;
  shockStrokeM?: number | null;
  thresholds?: Record<string, number> | null;
}

export interface AnalysedLap extends Lap {
  /** Lap length along the distance channel, m; null where there is no distance. */
  distanceM: number | null;
  topSpeedMps: number | null;
  stats: { minSpeedMps: number | null; speedSource: string | null; distanceSource: string; maxRpm: number | null };
}

export interface AnalysedFinding extends Finding {
  /** Distance along the lap at the start of the event, m; null outside laps or without distance. */
  distanceM: number | null;
  /** Position at the start of the event (nearest GPS fix), degrees. */
  lat: number | null;
  lon: number | null;
  /** The message as stored: the detector's text, then the caution where the finding has one. */
  storedMessage: string;
}

export interface SessionEngineSummary {
  runningS: number;
  hours: number;
  distanceM: number;
  rpmThreshold: number;
  timeAboveRpmS: number;
  /** The bike's rev ceiling; null when none is set (then nothing is checked against one). */
  ceilingRpm: number | null;
  ceilingExceedances: number;
  timeAboveCeilingS: number;
  maxRpm: number | null;
}

/**
 * The analysis part of RideSession.summary (merged next to the import preview).
 * Times in ms for laps (as Lap.lapTimeMs), everything else SI.
 */
export interface SessionAnalysisSummary {
  analysedAt: string;
  trackId: number | null;
  lapSource: "gps" | "beacon" | "none";
  lapCount: number;
  flyingLapCount: number;
  bestLap: { number: number; lapTimeMs: number } | null;
  bestSectorLap: BestSectorLap | null;
  topSpeedMps: number | null;
  distanceM: number | null;
  findingCounts: Partial<Record<FindingKind, number>>;
  engine: SessionEngineSummary | null;
  /** What the analysis could not check or fell back on, one sentence each (shown on the session page). */
  analysisNotes?: string[];
  /** Laps and findings, ms. */
  analysisMs: number;
  /**
   * The Drive slip, Suspension use, Gears and Rider brief results stored for the default settings
   * (lib/data/session-analysis.ts): total and compute time (ms), rows and JSON bytes; null when
   * they could not be computed (the pages then compute on request). Absent before this existed.
   */
  pages?: { ms: number; computeMs: number; parts: number; bytes: number } | null;
}

export interface SeriesAnalysis {
  laps: AnalysedLap[];
  findings: AnalysedFinding[];
  summary: Omit<SessionAnalysisSummary, "analysedAt" | "trackId" | "analysisMs" | "pages">;
}

/** Share of the rev ceiling above which engine time is counted for the Engine ledger (Lapbench default). */
export const ENGINE_LEDGER_RPM_SHARE = 0.9;

const finiteOrNull = (x: number | null | undefined): number | null => (x != null && Number.isFinite(x) ? x : null);

export { mergeThresholds } from "@/lib/findings/resolve-thresholds";

/**
 * Time ranges spent in the pit lane, from forward crossings of the pit entry and pit exit gates:
 * entry → next exit; a log that starts with an exit began in the pit lane (from the first sample),
 * one that ends after an entry stays in it to the last sample.
 */
export function pitLaneTimes(series: SeriesLike, gates: TrackGates | null): { startTimeS: number; endTimeS: number }[] {
  if (!gates?.pitEntry || !gates.pitExit || series.timeS.length === 0) return [];
  const fixes = extractFixes(series);
  if (fixes.timeS.length < 2) return [];
  const events = [
    ...findGateCrossings(fixes, gates.pitEntry).map((c) => ({ t: c.timeS, entry: true })),
    ...findGateCrossings(fixes, gates.pitExit).map((c) => ({ t: c.timeS, entry: false })),
  ].sort((a, b) => a.t - b.t);
  const out: { startTimeS: number; endTimeS: number }[] = [];
  let openedAt: number | null = null;
  let seenAny = false;
  for (const e of events) {
    if (e.entry) {
      if (openedAt === null) openedAt = e.t;
    } else {
      if (openedAt !== null) out.push({ startTimeS: openedAt, endTimeS: e.t });
      else if (!seenAny) out.push({ startTimeS: series.timeS[0]!, endTimeS: e.t });
      openedAt = null;
    }
    seenAny = true;
  }
  if (openedAt !== null) out.push({ startTimeS: openedAt, endTimeS: series.timeS[series.timeS.length - 1]! });
  return boundPitIntervals(out, fixes, gates.pitExit);
}

/**
 * A missed pit-exit crossing (a GPS gap at the gate) must not keep the bike "in the pit lane" for
 * a lap at racing speed. After the pit entry, once the bike has come within 50 m (plus half the
 * gate's width) of the exit gate's middle and then moves away again without a crossing, it left
 * the pit lane there: the interval ends at its closest approach (Lapbench default). A stop in the
 * garage never comes near the exit gate and keeps its whole interval.
 */
function boundPitIntervals(
  intervals: { startTimeS: number; endTimeS: number }[],
  fixes: { timeS: Float64Array; latDeg: Float64Array; lonDeg: Float64Array },
  exit: Gate,
): { startTimeS: number; endTimeS: number }[] {
  const mx = 0.5 * (exit.a.lat + exit.b.lat);
  const my = 0.5 * (exit.a.lon + exit.b.lon);
  const nearM = 50 + 0.5 * haversineM(exit.a.lat, exit.a.lon, exit.b.lat, exit.b.lon);
  const n = fixes.timeS.length;
  return intervals.map((iv) => {
    let best = Infinity;
    let bestT = NaN;
    for (let k = lowerBound(fixes.timeS, iv.startTimeS); k < n && fixes.timeS[k]! < iv.endTimeS; k++) {
      const d = haversineM(fixes.latDeg[k]!, fixes.lonDeg[k]!, mx, my);
      if (d < nearM) {
        if (d < best) {
          best = d;
          bestT = fixes.timeS[k]!;
        }
      } else if (Number.isFinite(best)) {
        return { startTimeS: iv.startTimeS, endTimeS: bestT };
      }
    }
    return iv;
  });
}

/** Nearest sample with a GPS position to sample i (looks forward first: fixes trail the event less). */
function positionNear(series: SeriesLike, i: number): { lat: number | null; lon: number | null } {
  const lat = series.channels.gps_lat;
  const lon = series.channels.gps_lon;
  if (!lat || !lon) return { lat: null, lon: null };
  const n = series.timeS.length;
  // 200 samples is 2 s at 100 Hz: far more than one fix interval of any logger.
  for (let k = 0; k < 200; k++) {
    const f = i + k;
    if (f < n && Number.isFinite(lat[f]!) && Number.isFinite(lon[f]!)) return { lat: lat[f]!, lon: lon[f]! };
    const b = i - k;
    if (b >= 0 && Number.isFinite(lat[b]!) && Number.isFinite(lon[b]!)) return { lat: lat[b]!, lon: lon[b]! };
  }
  return { lat: null, lon: null };
}

function hasFinite(x: ArrayLike<number> | undefined): boolean {
  if (!x) return false;
  for (let i = 0; i < x.length; i++) if (Number.isFinite(x[i])) return true;
  return false;
}

/**
 * The roles analyseSeries itself reads (the findings declare theirs in lib/findings): GPS for laps,
 * pit lane and distance; the lap beacon for laps without gates; wheel and GPS speed for lap
 * stats, distance and top speed; engine speed for lap maxima and engine use.
 */
export const ANALYSE_SERIES_READS = ["gps_lat", "gps_lon", "gps_speed", "speed_front", "speed_rear", "lap_beacon", "engine_rpm"] as const;

/**
 * Everything Lapbench derives from a session's samples at ingest: laps (GPS gates, else the lap
 * beacon) with distance, top speed and sectors; findings with the lap, distance along the lap and
 * position of each; and the session summary (best lap, best-sector lap, engine usage).
 */
export function analyseSeries(
  series: SeriesLike,
  track: AnalysisTrack | null,
  bike: AnalysisBike | null,
  options: { isInvalid?: (lap: Lap) => boolean } = {},
): SeriesAnalysis {
  const gates = track?.gates ?? null;
  let laps: Lap[] = [];
  let lapSource: SessionAnalysisSummary["lapSource"] = "none";
  if (gates) {
    laps = detectLaps(series, gates);
    if (laps.length) lapSource = "gps";
  }
  const beacon = series.channels.lap_beacon;
  if (laps.length === 0 && beacon) {
    laps = detectLapsFromBeacon(series.timeS, beacon, { minLapTimeS: gates?.minLapTimeS });
    if (laps.length) lapSource = "beacon";
  }

  // A lap much longer than the rest is likely two merged by a missed crossing: kept out of the bests.
  const suspectLaps = markSuspectLaps(laps);

  // A person's "invalid" mark survives a re-analysis and keeps the lap out of the bests.
  if (options.isInvalid) for (const lap of laps) if (options.isInvalid(lap)) lap.invalid = true;

  const dist = distanceChannel(series, laps);
  const hasDistance = dist.source !== "none";
  const analysedLaps: AnalysedLap[] = laps.map((lap, k) => {
    const s = lapStats(series, lap, series.channels.engine_rpm ? ["engine_rpm"] : []);
    return {
      ...lap,
      distanceM: hasDistance ? dist.lapLengthM[k]! : null,
      topSpeedMps: finiteOrNull(s.topSpeedMps),
      stats: {
        minSpeedMps: finiteOrNull(s.minSpeedMps),
        speedSource: s.speedSource,
        distanceSource: dist.source,
        maxRpm: finiteOrNull(s.channels.engine_rpm?.max),
      },
    };
  });

  const thresholds = mergeThresholdLayers(bike?.thresholds, track?.thresholds);
  const pitTimes = pitLaneTimes(series, gates);
  const events = runFindings(series, {
    laps,
    track: {
      pitSpeedLimitMps: finiteOrNull(track?.pitSpeedLimitMps) ?? undefined,
      ...(pitTimes.length ? { pitLaneTimes: pitTimes } : {}),
    },
    bike: {
      revCeilingRpm: finiteOrNull(bike?.revCeilingRpm) ?? undefined,
      forkStrokeM: finiteOrNull(bike?.forkStrokeM) ?? undefined,
      shockStrokeM: finiteOrNull(bike?.shockStrokeM) ?? undefined,
    },
    thresholds,
  });
  // Repeats of one kind on one channel become one finding naming the laps, the count and the worst.
  const findings = collapseFindings(events);
  const lapIndex = new Map(laps.map((l, k) => [l.number, k]));
  const analysedFindings: AnalysedFinding[] = findings.map((f) => {
    const k = f.lapNumber == null ? undefined : lapIndex.get(f.lapNumber);
    const distanceM = k === undefined || !hasDistance ? null : dist.distanceM[f.startIndex]! - dist.lapStartDistanceM[k]!;
    return {
      ...f,
      distanceM: finiteOrNull(distanceM),
      ...positionNear(series, f.startIndex),
      storedMessage: f.caution ? `${f.message} ${f.caution}` : f.message,
    };
  });

  const flying = analysedLaps.filter(isFlyingLap);
  const best = flying.reduce<AnalysedLap | null>((b, l) => (b === null || l.lapTimeMs < b.lapTimeMs ? l : b), null);
  let topSpeedMps: number | null = null;
  for (const l of analysedLaps) if (l.topSpeedMps != null && (topSpeedMps === null || l.topSpeedMps > topSpeedMps)) topSpeedMps = l.topSpeedMps;
  if (laps.length === 0) {
    const v = series.channels.speed_front ?? series.channels.gps_speed;
    if (v) for (let i = 0; i < v.length; i++) if (Number.isFinite(v[i]!) && (topSpeedMps === null || v[i]! > topSpeedMps)) topSpeedMps = v[i]!;
  }
  const counts: Partial<Record<FindingKind, number>> = {};
  for (const f of events) counts[f.kind] = (counts[f.kind] ?? 0) + 1;

  let engine: SessionEngineSummary | null = null;
  if (hasFinite(series.channels.engine_rpm)) {
    // No ceiling is assumed for a bike without one (NO_REV_CEILING_NOTE); time above is then
    // counted at 12 000 rpm, as the Engine ledger does (lib/data/engines.ts defaultLedgerRpm).
    const ceilingRpm = finiteOrNull(bike?.revCeilingRpm);
    const u: EngineUsage = engineUsage(series, ceilingRpm ? ENGINE_LEDGER_RPM_SHARE * ceilingRpm : 12_000, ceilingRpm ?? Infinity);
    engine = {
      runningS: u.runningS,
      hours: u.runningS / 3600,
      distanceM: u.distanceM,
      rpmThreshold: u.rpmThreshold,
      timeAboveRpmS: u.timeAboveRpmS,
      ceilingRpm,
      ceilingExceedances: u.ceilingExceedances,
      timeAboveCeilingS: u.timeAboveCeilingS,
      maxRpm: finiteOrNull(u.maxRpm),
    };
  }
  const analysisNotes: string[] = [];
  for (const l of suspectLaps) {
    analysisNotes.push(`Lap ${l.number} (${(l.lapTimeMs / 1000).toFixed(1)} s) is over 1.5 × the session's median lap: a missed line crossing (GPS gap) may have merged two laps. It is left out of the best lap and best sectors.`);
  }
  if (dist.source === "gps" && series.channels.speed_front) analysisNotes.push("The front wheel speed reads nothing while the bike moves: distance comes from GPS instead.");
  dist.lapScaleRejected.forEach((r, k) => {
    if (Number.isFinite(r)) {
      analysisNotes.push(`Lap ${laps[k]!.number}: the GPS path is ${((r - 1) * 100).toFixed(1)} % off the wheel distance, beyond ±5 %; the wheel distance is kept (a GPS gap or a wrong wheel circumference).`);
    }
  });
  if (engine && engine.ceilingRpm === null) analysisNotes.push(NO_REV_CEILING_NOTE);
  const n = series.timeS.length;
  return {
    laps: analysedLaps,
    findings: analysedFindings,
    summary: {
      lapSource,
      lapCount: laps.length,
      flyingLapCount: flying.length,
      bestLap: best ? { number: best.number, lapTimeMs: best.lapTimeMs } : null,
      bestSectorLap: bestSectorLap(laps),
      topSpeedMps,
      distanceM: hasDistance && n ? dist.distanceM[n - 1]! : null,
      findingCounts: counts,
      engine,
      analysisNotes,
    },
  };
}
