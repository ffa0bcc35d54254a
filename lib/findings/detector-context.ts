import type { SeriesLike } from "@/lib/laps/types";
import { checkWheelSensor, type WheelSensorCheck } from "@/lib/laps/live-wheel-speed";
import { DEFAULT_THRESHOLDS, type ThresholdKey, type Thresholds } from "./thresholds";
import { resolveThreshold } from "./resolve-thresholds";
import type { FindingsContext, LapSpan } from "./types";

export interface DetectorContext {
  series: SeriesLike;
  ctx: FindingsContext;
  th: Thresholds;
  /** Median sample interval of the master clock (s). */
  dtS: number;
  /** Ground speed per sample (m/s): front wheel, else rear wheel, else GPS speed held between fixes — a dead wheel sensor skipped; undefined if none. */
  groundSpeedMps: ArrayLike<number> | undefined;
  /** A wheel whose sensor reads (near) nothing while the bike moves; ground speed comes from elsewhere. */
  deadWheels: WheelSensorCheck[];
  /** The wheel-speed channel that works (front, else rear), for GPS-jump checks; undefined if none. */
  liveWheelMps: ArrayLike<number> | undefined;
  lapOf: (timeS: number) => number | null;
}

function medianStep(t: Float64Array): number {
  const n = t.length;
  if (n < 2) return 0;
  // At most ~100 000 steps, evenly spread, are enough for a median.
  const stride = Math.max(1, Math.floor((n - 1) / 100000));
  const steps = new Float64Array(Math.ceil((n - 1) / stride));
  let k = 0;
  for (let i = 0; i + 1 < n; i += stride) steps[k++] = t[i + 1] - t[i];
  const s = steps.subarray(0, k).sort();
  return k % 2 ? s[k >> 1] : 0.5 * (s[(k >> 1) - 1] + s[k >> 1]);
}

/** Carry each finite sample forward over the NaNs that follow it (slow channels on a fast clock). */
export function holdForward(x: ArrayLike<number>): Float64Array {
  const out = new Float64Array(x.length);
  let last = NaN;
  for (let i = 0; i < x.length; i++) {
    if (Number.isFinite(x[i])) last = x[i];
    out[i] = last;
  }
  return out;
}

function makeLapOf(laps: readonly LapSpan[] | undefined) {
  const sorted = [...(laps ?? [])].sort((a, b) => a.startTimeS - b.startTimeS);
  return (t: number): number | null => {
    for (const l of sorted) if (t >= l.startTimeS && t < l.endTimeS) return l.number;
    return null;
  };
}

/** The roles buildDetectorContext reads for every detector: the wheel speeds and GPS speed behind the ground speed. */
export const DETECTOR_CONTEXT_READS = ["speed_front", "speed_rear", "gps_speed"] as const;

/** Thresholds resolved once (resolveThreshold: team settings over DEFAULT_THRESHOLDS), then the shared series facts. */
export function buildDetectorContext(series: SeriesLike, ctx: FindingsContext): DetectorContext {
  const th = {} as Thresholds;
  for (const key of Object.keys(DEFAULT_THRESHOLDS) as ThresholdKey[]) {
    th[key] = resolveThreshold(key, null, ctx.thresholds).value;
  }
  const c = series.channels;
  const front = checkWheelSensor(series, "speed_front");
  const rear = checkWheelSensor(series, "speed_rear");
  const deadWheels = [front, rear].filter((x): x is WheelSensorCheck => !!x?.dead);
  const liveWheelMps = c.speed_front && !front?.dead ? c.speed_front : c.speed_rear && !rear?.dead ? c.speed_rear : undefined;
  const groundSpeedMps = liveWheelMps ?? (c.gps_speed ? holdForward(c.gps_speed) : undefined);
  return { series, ctx, th, dtS: medianStep(series.timeS), groundSpeedMps, deadWheels, liveWheelMps, lapOf: makeLapOf(ctx.laps) };
}
