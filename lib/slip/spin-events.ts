import { DEFAULT_THRESHOLDS } from "@/lib/findings/thresholds";

export interface SpinEventOptions {
  /**
   * Slip above this counts as spin. Default 0.08 — Lapbench's starting setting, not a published
   * figure: the right target depends on tyre, bike and traction-control map; set it per bike.
   */
  targetSlip?: number;
  /** Only under open throttle: throttle at or above this (%). Default 20. */
  minThrottlePct?: number;
  /** Shorter excursions are ignored (s). Default DEFAULT_THRESHOLDS.wheelSpinMinDurationS (0.3), the same for the page and the finding. */
  minDurationS?: number;
  /**
   * Wheelie guard: the front wheel speed. Where it slows faster than `wheelieDecelMps2` with the
   * throttle open, the front is in the air (it is not braking), so the slip against it is not spin.
   */
  frontSpeedMps?: ArrayLike<number>;
  /** Default DEFAULT_THRESHOLDS.wheelieDecelMps2 (5 m/s², Lapbench default). */
  wheelieDecelMps2?: number;
  /** Excursions separated by less than this are one event (s). Default 0.1. */
  mergeGapS?: number;
}

export interface SpinEvent {
  startIndex: number;
  /** Last sample of the event (inclusive). */
  endIndex: number;
  startTimeS: number;
  endTimeS: number;
  durationS: number;
  peakSlip: number;
  peakTimeS: number;
}

/**
 * Spin events: stretches where Drive slip is above the target under open throttle, merged
 * across short dips and kept when they last at least `minDurationS`. A missing throttle
 * channel (pass undefined) drops the throttle condition.
 */
export function spinEvents(
  slip: ArrayLike<number>,
  throttlePct: ArrayLike<number> | undefined,
  timeS: Float64Array,
  opts: SpinEventOptions = {},
): SpinEvent[] {
  const targetSlip = opts.targetSlip ?? 0.08;
  const minThrottlePct = opts.minThrottlePct ?? 20;
  const minDurationS = opts.minDurationS ?? DEFAULT_THRESHOLDS.wheelSpinMinDurationS.value;
  const front = opts.frontSpeedMps;
  const wheelieDecel = opts.wheelieDecelMps2 ?? DEFAULT_THRESHOLDS.wheelieDecelMps2.value;
  /** Front deceleration over ±0.1 s around sample i (m/s², positive when slowing). */
  let lo = 0;
  let hi = 0;
  const frontDecel = (i: number): number => {
    while (timeS[i]! - timeS[lo]! > 0.1) lo++;
    if (hi < i) hi = i;
    while (hi + 1 < n && timeS[hi + 1]! - timeS[i]! <= 0.1) hi++;
    if (hi === lo || !front) return 0;
    return -(front[hi]! - front[lo]!) / (timeS[hi]! - timeS[lo]!);
  };
  const mergeGapS = opts.mergeGapS ?? 0.1;
  const n = slip.length;
  const dtS = n > 1 ? (timeS[n - 1]! - timeS[0]!) / (n - 1) : 0;

  const events: SpinEvent[] = [];
  let cur: SpinEvent | null = null;
  const close = () => {
    if (cur && cur.durationS >= minDurationS - 1e-9) events.push(cur);
    cur = null;
  };
  for (let i = 0; i < n; i++) {
    const s = slip[i]!;
    let on = s > targetSlip && (!throttlePct || throttlePct[i]! >= minThrottlePct);
    if (on && front && frontDecel(i) > wheelieDecel) on = false;
    if (!on) continue;
    if (cur && timeS[i]! - cur.endTimeS > mergeGapS + 1e-9) close();
    if (!cur) {
      cur = { startIndex: i, endIndex: i, startTimeS: timeS[i]!, endTimeS: timeS[i]!, durationS: dtS, peakSlip: s, peakTimeS: timeS[i]! };
    } else {
      cur.endIndex = i;
      cur.endTimeS = timeS[i]!;
      // A stretch of k samples covers k sample periods of time.
      cur.durationS = cur.endTimeS - cur.startTimeS + dtS;
      if (s > cur.peakSlip) {
        cur.peakSlip = s;
        cur.peakTimeS = timeS[i]!;
      }
    }
  }
  close();
  return events;
}
