import { CAUTION_TEXT } from "./caution";
import type { DetectorContext } from "./detector-context";
import { bar, makeFinding, onLap } from "./make-finding";
import { maskRuns } from "./mask-runs";
import type { Finding } from "./types";

/** Throttle at or above this (%) is "wide open" for the resting-pressure estimate (Lapbench default). */
const WIDE_OPEN_PCT = 95;
/** Spread multiple over the resting median (Lapbench default); the spread is the scaled MAD. */
const REST_SPREAD_FACTOR = 5;
/**
 * 1.4826 × MAD estimates the standard deviation of normally distributed data (Rousseeuw & Croux,
 * "Alternatives to the Median Absolute Deviation", JASA 88, 1993), robust to the few samples of a
 * real brake-on-straight that sit in the same full-throttle stretches.
 */
const MAD_TO_SIGMA = 1.4826;

export interface RestingPressure {
  medianPa: number;
  spreadPa: number;
  samples: number;
}

function median(a: Float64Array): number {
  const s = a.sort();
  const k = s.length;
  return k % 2 ? s[k >> 1] : 0.5 * (s[(k >> 1) - 1] + s[k >> 1]);
}

/**
 * The front pressure the sensor reads at rest in this session: median and robust spread over the
 * samples with the throttle wide open (the rider cannot be braking on purpose then). Null when
 * there is less than a second of such running.
 */
export function restingPressure(p: ArrayLike<number>, throttle: ArrayLike<number>, dtS: number): RestingPressure | null {
  const vals: number[] = [];
  for (let i = 0; i < p.length; i++) if (throttle[i] >= WIDE_OPEN_PCT && Number.isFinite(p[i])) vals.push(p[i]);
  if (vals.length < Math.max(10, 1 / Math.max(dtS, 1e-3))) return null;
  const a = Float64Array.from(vals);
  const med = median(a);
  const dev = Float64Array.from(vals, (v) => Math.abs(v - med));
  return { medianPa: med, spreadPa: MAD_TO_SIGMA * median(dev), samples: vals.length };
}

/**
 * Front brake pressure while the throttle is open on a straight (upright, fast). Pressure counts
 * when it is above the absolute threshold, or above the session's own resting pressure at full
 * throttle by the set margin (or 5 × its spread, whichever is more): a lever pushed by air builds
 * small pressures a fixed 2 bar would miss, while sensor noise stays inside the margin.
 */
export function detectBrakeOnStraight(dc: DetectorContext): Finding[] {
  const p = dc.series.channels.brake_front;
  const thr = dc.series.channels.throttle;
  if (!p || !thr) return [];
  const { th } = dc;
  const lean = dc.series.channels.lean_angle;
  const v = dc.groundSpeedMps;
  const rest = restingPressure(p, thr, dc.dtS);
  const relative = rest ? rest.medianPa + Math.max(th.brakeOnStraightRestMarginPa, REST_SPREAD_FACTOR * rest.spreadPa) : Infinity;
  const limit = Math.min(th.brakeOnStraightPressurePa, relative);
  const onStraight = (i: number) =>
    (!lean || !Number.isFinite(lean[i]) || Math.abs(lean[i]) < th.brakeOnStraightMaxLeanDeg) && (!v || !Number.isFinite(v[i]) || v[i] > th.brakeOnStraightMinSpeedMps);
  const runs = maskRuns(p.length, (i) => p[i] > limit && thr[i] > th.brakeOnStraightThrottlePct && onStraight(i), dc.series.timeS, {
    minDurationS: th.brakeOnStraightMinDurationS,
    mergeGapS: dc.dtS * 1.5,
    dtS: dc.dtS,
  });
  const against =
    limit < th.brakeOnStraightPressurePa && rest
      ? `, above the ${bar(limit)} this sensor's resting ${bar(rest.medianPa)} at full throttle allows`
      : "";
  return runs.map(({ start, end }) => {
    let peak = -Infinity;
    for (let i = start; i <= end; i++) if (p[i] > peak) peak = p[i];
    return makeFinding(dc, start, end, {
      kind: "brake_on_straight",
      severity: "warning",
      measuredValue: peak,
      thresholdValue: limit,
      unit: "Pa",
      message:
        `Front brake pressure up to ${bar(peak)} with the throttle above ${th.brakeOnStraightThrottlePct} %${against}${onLap(dc, start)}. ` +
        "A lever pushed by air at speed can do this; so can a dragging brake.",
      caution: CAUTION_TEXT,
    });
  });
}

/** The channel roles this detector reads (besides the ground speed every detector gets: DETECTOR_CONTEXT_READS). */
detectBrakeOnStraight.reads = ["brake_front", "throttle", "lean_angle"] as const;
