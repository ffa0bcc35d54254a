import { overallRatios, type Drivetrain } from "./overall-ratios";

export interface GearOptions {
  /** Relative mismatch allowed between measured and nominal overall ratio. Default 0.04 (our setting). */
  tolerance?: number;
  /** Below this rear speed the ratio is meaningless; gear 0 (m/s). Default 2. */
  minSpeedMps?: number;
}

/**
 * Gear per sample from engine rpm and rear-wheel speed: the measured overall ratio
 * rpm / (60·v/C) matched to the nearest gear's nominal ratio. 0 means neutral, clutch in,
 * a shift in progress or no data (no gear within the tolerance).
 */
export function gearFromRatios(
  rpm: ArrayLike<number>,
  rearSpeedMps: ArrayLike<number>,
  bike: Drivetrain,
  opts: GearOptions = {},
): Uint8Array {
  const tolerance = opts.tolerance ?? 0.04;
  const minSpeedMps = opts.minSpeedMps ?? 2;
  const ratios = overallRatios(bike);
  const n = Math.min(rpm.length, rearSpeedMps.length);
  const out = new Uint8Array(n);
  const wheelRpmPerMps = 60 / bike.rearCircumferenceM;
  for (let i = 0; i < n; i++) {
    const v = rearSpeedMps[i]!;
    const r = rpm[i]!;
    if (!(v >= minSpeedMps) || !(r > 0)) continue;
    const measured = r / (v * wheelRpmPerMps);
    let best = -1;
    let bestErr = Infinity;
    for (let g = 0; g < ratios.length; g++) {
      const err = Math.abs(measured - ratios[g]!) / ratios[g]!;
      if (err < bestErr) {
        bestErr = err;
        best = g;
      }
    }
    if (best >= 0 && bestErr <= tolerance) out[i] = best + 1;
  }
  return out;
}
