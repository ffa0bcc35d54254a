import type { SeriesLike } from "@/lib/laps/types";
import { calibrateSlipZero, type SlipZeroOptions } from "./calibrate-slip-zero";
import { effectiveRollingRadiusM } from "./effective-rolling-radius";

/**
 * Both tyres' upright rolling radius and crown (cross-section) radius (m) — bike settings. Both
 * wheels are corrected: correcting the rear alone turns a true 0 % slip at 45° lean into about
 * −6 %, worse than no correction.
 */
export interface LeanCorrection {
  rearRadiusM: number;
  rearCrownRadiusM: number;
  frontRadiusM: number;
  frontCrownRadiusM: number;
}

export interface DriveSlipOptions {
  /** Below this front speed the slip is NaN (m/s). Default 30 km/h (Lapbench default: lower down, a small wheel-speed error is a large slip). */
  minFrontSpeedMps?: number;
  /** Rear/front speed ratio that means zero slip. When omitted it is found by calibrateSlipZero. */
  zeroRatio?: number;
  /** Set false to skip the automatic zero (ratio 1). Default true. */
  calibrate?: boolean;
  calibration?: SlipZeroOptions;
  /** Lean-angle correction of the rolling radius; needs the lean_angle channel. */
  lean?: LeanCorrection;
}

/**
 * The Drive slip channel: rear-wheel longitudinal slip per sample,
 * (v_rear/k − v_front) / v_front with k the zero ratio (see slipRatio for the convention),
 * NaN when the front wheel is slower than 30 km/h or a speed is missing.
 *
 * Wheel-speed sensors count wheel revolutions and the logger multiplies by a fixed radius; at
 * lean the tyre rolls on a smaller radius, so with `lean` set both speeds are scaled by
 * r_eff/r0 (effectiveRollingRadiusM) before the ratio is taken.
 */
export function driveSlip(series: SeriesLike, opts: DriveSlipOptions = {}): Float32Array {
  const n = series.timeS.length;
  const out = new Float32Array(n).fill(NaN);
  const front = series.channels.speed_front;
  const rear = series.channels.speed_rear;
  if (!front || !rear) return out;

  const minFrontSpeedMps = opts.minFrontSpeedMps ?? 30 / 3.6;
  const zeroRatio =
    opts.zeroRatio ?? (opts.calibrate === false ? 1 : calibrateSlipZero(series, opts.calibration).ratio);
  const leanCh = opts.lean ? series.channels.lean_angle : undefined;
  const lc = opts.lean;

  for (let i = 0; i < n; i++) {
    const vfRaw = front[i]!;
    if (!(vfRaw >= minFrontSpeedMps)) continue;
    let vf = vfRaw;
    if (!Number.isFinite(rear[i])) continue;
    let vr = rear[i]! / zeroRatio;
    if (lc && leanCh) {
      const leanDeg = leanCh[i]!;
      if (Number.isFinite(leanDeg)) {
        vr *= effectiveRollingRadiusM(lc.rearRadiusM, lc.rearCrownRadiusM, leanDeg) / lc.rearRadiusM;
        vf *= effectiveRollingRadiusM(lc.frontRadiusM, lc.frontCrownRadiusM, leanDeg) / lc.frontRadiusM;
      }
    }
    out[i] = (vr - vf) / vf;
  }
  return out;
}
