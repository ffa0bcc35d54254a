export interface CornerRef {
  name: string;
  /** Apex distance from the lap's start (m). */
  distanceM: number;
}

export interface CornerExitSlip {
  name: string;
  fromM: number;
  toM: number;
  peakSlip: number;
  /** Distance (m) where the peak slip happened; NaN when there was no slip sample. */
  peakAtM: number;
  meanSlip: number;
  /** Time the slip spent above the target in this exit (s). */
  timeAboveTargetS: number;
  sampleCount: number;
}

/**
 * Drive slip per corner exit for one lap: from each corner's apex to `exitLengthM` further on
 * (or the next corner, whichever comes first). All arrays are that lap's samples, with
 * `distanceM` starting at 0 at the lap's start. Default exit length 150 m and target 0.08 are
 * Lapbench settings, not published figures.
 */
export function cornerExitSlip(
  slip: Float32Array,
  distanceM: Float64Array,
  timeS: Float64Array,
  corners: readonly CornerRef[],
  opts: { exitLengthM?: number; targetSlip?: number } = {},
): CornerExitSlip[] {
  const exitLengthM = opts.exitLengthM ?? 150;
  const targetSlip = opts.targetSlip ?? 0.08;
  const sorted = [...corners].sort((a, b) => a.distanceM - b.distanceM);
  const n = slip.length;
  return sorted.map((c, k) => {
    const fromM = c.distanceM;
    const next = sorted[k + 1];
    const toM = Math.min(fromM + exitLengthM, next ? next.distanceM : Infinity);
    let peak = NaN;
    let peakAt = NaN;
    let sum = 0;
    let cnt = 0;
    let above = 0;
    for (let i = 0; i < n; i++) {
      const d = distanceM[i]!;
      if (!(d >= fromM && d < toM)) continue;
      const s = slip[i]!;
      if (!Number.isFinite(s)) continue;
      sum += s;
      cnt++;
      if (!(s <= peak)) {
        peak = s;
        peakAt = d;
      }
      if (s > targetSlip && i + 1 < n) above += timeS[i + 1]! - timeS[i]!;
    }
    return { name: c.name, fromM, toM, peakSlip: peak, peakAtM: peakAt, meanSlip: cnt ? sum / cnt : NaN, timeAboveTargetS: above, sampleCount: cnt };
  });
}
