import type { SeriesLike } from "@/lib/laps/types";

export interface SlipZeroOptions {
  /** Only running faster than this counts (m/s). Default 60 km/h. */
  minSpeedMps?: number;
  /** Upright running only: |lean| below this (deg). Default 5°. */
  maxLeanDeg?: number;
  /** Throttle must stay within ± this (percentage points) over the window. Default 3. */
  maxThrottleChangePct?: number;
  /** Low acceleration only: |dv/dt| of the front wheel below this (m/s²). Default 1. */
  maxAccelMps2?: number;
  /** Half-width of the window used to judge "steady" (s). Default 0.25. */
  halfWindowS?: number;
  /** Fewer qualifying samples than this → no calibration (ratio 1). Default 20. */
  minSamples?: number;
  /**
   * Part or closed throttle only: at or above this throttle (%) the rear may be driving (spinning)
   * and is never taken as zero. Default 80 (Lapbench default).
   */
  maxThrottlePct?: number;
  /** A ratio outside these bounds is a wrong circumference or a faulty sensor, not a zero. Default 0.9–1.1 (Lapbench default). */
  minRatio?: number;
  maxRatio?: number;
}

export interface SlipZeroResult {
  /** Median of v_rear / v_front on steady straight running; 1 when not applied. */
  ratio: number;
  sampleCount: number;
  applied: boolean;
  /** The median ratio found when it fell outside the bounds (then not applied); null otherwise. */
  outOfBoundsRatio?: number | null;
  /** Why no zero was applied, in words for the page; null when applied. */
  reason?: string | null;
}

/**
 * Automatic zero of the slip channel. The rolling circumferences entered for the two wheels
 * never match the real ones exactly (wear, pressure, temperature), so at steady speed on a
 * straight the rear/front speed ratio is not exactly 1. We take the median of that ratio while
 * the throttle is steady, the bike upright and the acceleration low, and divide it out later.
 * Channels that are missing (throttle, lean) simply drop their condition.
 */
export function calibrateSlipZero(series: SeriesLike, opts: SlipZeroOptions = {}): SlipZeroResult {
  const minSpeedMps = opts.minSpeedMps ?? 60 / 3.6;
  const maxLeanDeg = opts.maxLeanDeg ?? 5;
  const maxThrottleChangePct = opts.maxThrottleChangePct ?? 3;
  const maxAccelMps2 = opts.maxAccelMps2 ?? 1;
  const halfWindowS = opts.halfWindowS ?? 0.25;
  const minSamples = opts.minSamples ?? 20;
  const maxThrottlePct = opts.maxThrottlePct ?? 80;
  const minRatio = opts.minRatio ?? 0.9;
  const maxRatio = opts.maxRatio ?? 1.1;

  const t = series.timeS;
  const front = series.channels.speed_front;
  const rear = series.channels.speed_rear;
  const throttle = series.channels.throttle;
  const lean = series.channels.lean_angle;
  if (!front || !rear) return { ratio: 1, sampleCount: 0, applied: false };

  const n = t.length;
  // Only steady straight running qualifies, a fraction of the session: the buffer grows as
  // needed instead of holding one double per sample of the whole log.
  let ratios = new Float64Array(Math.min(n, 65536));
  let count = 0;
  let lo = 0;
  let hi = 0;
  for (let i = 0; i < n; i++) {
    while (t[i]! - t[lo]! > halfWindowS) lo++;
    if (hi < i) hi = i;
    while (hi + 1 < n && t[hi + 1]! - t[i]! <= halfWindowS) hi++;
    const vf = front[i]!;
    const vr = rear[i]!;
    if (!(vf >= minSpeedMps) || !Number.isFinite(vr)) continue;
    if (lean && !(Math.abs(lean[i]!) < maxLeanDeg)) continue;
    if (hi === lo) continue;
    const accel = (front[hi]! - front[lo]!) / (t[hi]! - t[lo]!);
    if (!(Math.abs(accel) <= maxAccelMps2)) continue;
    if (throttle) {
      const th = throttle[i]!;
      if (!(th < maxThrottlePct)) continue;
      if (!(Math.abs(throttle[lo]! - th) <= maxThrottleChangePct && Math.abs(throttle[hi]! - th) <= maxThrottleChangePct)) continue;
    }
    if (count === ratios.length) {
      const grown = new Float64Array(Math.min(n, 2 * ratios.length));
      grown.set(ratios);
      ratios = grown;
    }
    ratios[count++] = vr / vf;
  }
  if (count < minSamples) return { ratio: 1, sampleCount: count, applied: false, outOfBoundsRatio: null, reason: "not enough steady straight running at part throttle" };
  const sorted = ratios.subarray(0, count).sort();
  const mid = count >> 1;
  const ratio = count % 2 ? sorted[mid]! : 0.5 * (sorted[mid - 1]! + sorted[mid]!);
  if (!(ratio >= minRatio && ratio <= maxRatio)) {
    return {
      ratio: 1,
      sampleCount: count,
      applied: false,
      outOfBoundsRatio: ratio,
      reason: `rear/front ratio ${ratio.toFixed(3)} on steady straights is outside ${minRatio}–${maxRatio}: check the wheel circumferences and both wheel-speed sensors`,
    };
  }
  return { ratio, sampleCount: count, applied: true, outOfBoundsRatio: null, reason: null };
}
