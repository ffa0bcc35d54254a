import type { SeriesLike } from "@/lib/laps/types";

export interface EngineUsage {
  /** Time with the engine running (rpm above `runningRpm`) (s). */
  runningS: number;
  /** Distance covered: integrated front wheel speed, else rear, else GPS speed (m). */
  distanceM: number;
  /** Time above the chosen rpm (s). */
  timeAboveRpmS: number;
  rpmThreshold: number;
  /** Separate excursions above the ceiling (touches within 0.2 s are one). */
  ceilingExceedances: number;
  /** Time above the ceiling (s). */
  timeAboveCeilingS: number;
  maxRpm: number;
}

/**
 * One session's contribution to the Engine ledger. Each sample holds until the next; steps
 * longer than 1 s (clock gaps) are not counted. Engine running means rpm > `runningRpm`
 * (default 500 — Lapbench's setting, below any idle). Speed channels that hold NaN between
 * fixes (GPS) are held forward for the distance.
 */
export function engineUsage(series: SeriesLike, rpmThreshold: number, ceilingRpm: number, runningRpm = 500): EngineUsage {
  const t = series.timeS;
  const rpm = series.channels.engine_rpm;
  const speed = series.channels.speed_front ?? series.channels.speed_rear ?? series.channels.gps_speed;
  let runningS = 0;
  let distanceM = 0;
  let above = 0;
  let aboveCeiling = 0;
  let exceedances = 0;
  let maxRpm = NaN;
  let lastOverT = -Infinity;
  let wasOver = false;
  let v = NaN;
  for (let i = 0; i < t.length; i++) {
    const dt = i + 1 < t.length ? t[i + 1]! - t[i]! : 0;
    const step = dt > 0 && dt <= 1 ? dt : 0;
    if (speed && Number.isFinite(speed[i]!)) v = speed[i]!;
    if (Number.isFinite(v)) distanceM += v * step;
    if (!rpm) continue;
    const r = rpm[i]!;
    if (!Number.isFinite(r)) continue;
    if (!(r <= maxRpm)) maxRpm = r;
    if (r > runningRpm) runningS += step;
    if (r > rpmThreshold) above += step;
    const over = r > ceilingRpm;
    if (over) {
      aboveCeiling += step;
      if (!wasOver && t[i]! - lastOverT > 0.2) exceedances++;
      lastOverT = t[i]!;
    }
    wasOver = over;
  }
  return { runningS, distanceM, timeAboveRpmS: above, rpmThreshold, ceilingExceedances: exceedances, timeAboveCeilingS: aboveCeiling, maxRpm };
}
