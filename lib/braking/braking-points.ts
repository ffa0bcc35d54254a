import { DEFAULT_THRESHOLDS } from "@/lib/findings/thresholds";

export interface BrakingLap {
  /** Distance from the lap's start (m), increasing. */
  distanceM: ArrayLike<number>;
  speedMps: ArrayLike<number>;
  brakeFrontPa: ArrayLike<number>;
}

export interface BrakingCorner {
  name: string;
  /** Apex distance on the reference lap (m). */
  distanceM: number;
}

export interface BrakingPointsOptions {
  /**
   * Front pressure that counts as braking (Pa). Default DEFAULT_THRESHOLDS.brakeAppliedPa (2 bar,
   * Lapbench default) — the one brake-on threshold the brief and the findings share.
   */
  thresholdPa?: number;
  /** This lap's apex is looked for within ± this of the reference apex (m). Default 60. */
  apexSearchM?: number;
  /** Brake applications closer than this are one braking (rider re-squeezing) (m). Default 20. */
  mergeGapM?: number;
}

export interface BrakingPoint {
  name: string;
  braked: boolean;
  /** Where front pressure first passed the threshold before the corner (m, interpolated). */
  onsetDistanceM: number | null;
  /** Where it last fell back below the threshold (m, interpolated). */
  releaseDistanceM: number | null;
  peakPressurePa: number | null;
  minSpeedMps: number;
  /** This lap's apex: where the minimum speed was (m). */
  apexDistanceM: number;
  /** Braking distance: onset to apex (m). */
  onsetToApexM: number | null;
}

function crossing(d: ArrayLike<number>, p: ArrayLike<number>, i0: number, i1: number, level: number): number {
  const p0 = p[i0];
  const p1 = p[i1];
  if (!Number.isFinite(p0) || p1 === p0) return d[i1];
  const u = (level - p0) / (p1 - p0);
  return d[i0] + Math.min(1, Math.max(0, u)) * (d[i1] - d[i0]);
}

/**
 * Braking points of one lap, corner by corner. Each corner owns the stretch from the previous
 * corner's apex to its own; the braking is the last brake application (short releases merged)
 * that begins in that stretch before this lap's apex. Onset and release are interpolated to the
 * threshold crossing.
 */
export function brakingPoints(lap: BrakingLap, corners: readonly BrakingCorner[], opts: BrakingPointsOptions = {}): BrakingPoint[] {
  const threshold = opts.thresholdPa ?? DEFAULT_THRESHOLDS.brakeAppliedPa.value;
  const apexSearchM = opts.apexSearchM ?? 60;
  const mergeGapM = opts.mergeGapM ?? 20;
  const { distanceM: d, speedMps: v, brakeFrontPa: p } = lap;
  const n = d.length;
  const sorted = [...corners].sort((a, b) => a.distanceM - b.distanceM);

  // Brake applications on this lap: [startIndex, endIndex] of samples at or above threshold.
  const runs: Array<[number, number]> = [];
  for (let i = 0; i < n; i++) {
    if (!(p[i] >= threshold)) continue;
    const s = i;
    while (i + 1 < n && p[i + 1] >= threshold) i++;
    const last = runs[runs.length - 1];
    if (last && d[s] - d[last[1]] < mergeGapM) last[1] = i;
    else runs.push([s, i]);
  }

  let prevApexM = -Infinity;
  return sorted.map((c) => {
    // This lap's apex near the reference apex.
    let apexI = -1;
    for (let i = 0; i < n; i++) {
      if (Math.abs(d[i] - c.distanceM) > apexSearchM || !Number.isFinite(v[i])) continue;
      if (apexI < 0 || v[i] < v[apexI]) apexI = i;
    }
    const apexM = apexI >= 0 ? d[apexI] : c.distanceM;
    const minSpeedMps = apexI >= 0 ? v[apexI] : NaN;
    let run: [number, number] | undefined;
    for (const r of runs) if (d[r[0]] > prevApexM && d[r[0]] <= apexM) run = r;
    prevApexM = apexM;
    if (!run) {
      return { name: c.name, braked: false, onsetDistanceM: null, releaseDistanceM: null, peakPressurePa: null, minSpeedMps, apexDistanceM: apexM, onsetToApexM: null };
    }
    const [s, e] = run;
    const onset = s > 0 ? crossing(d, p, s - 1, s, threshold) : d[s];
    const release = e + 1 < n ? crossing(d, p, e, e + 1, threshold) : d[e];
    let peak = -Infinity;
    for (let i = s; i <= e; i++) if (p[i] > peak) peak = p[i];
    return { name: c.name, braked: true, onsetDistanceM: onset, releaseDistanceM: release, peakPressurePa: peak, minSpeedMps, apexDistanceM: apexM, onsetToApexM: apexM - onset };
  });
}
