import { bottomingEvents, type BottomingEvent, type BottomingOptions } from "./bottoming-events";
import { savitzkyGolayDerivative } from "./savitzky-golay";

/**
 * A starting value for the low/high-speed damping boundary offered in settings. There is no
 * published universal boundary: this is Lapbench's default setting, which a team changes to
 * match its damper, not a fact about suspension.
 */
export const DEFAULT_LOW_HIGH_BOUNDARY_MS = 0.1;

/**
 * The velocity window the pages start with: 70 ms, which is the 7-sample window of a 100 Hz log.
 * A Lapbench default, not a published figure: a team widens it for a noisy pot.
 */
export const DEFAULT_VELOCITY_WINDOW_MS = 70;

/**
 * A travel channel's own samples: a pot logged slower than the master clock shows up as NaN
 * between its samples. Returns the indices of the finite samples, the channel's own step (the
 * median step between them, s) and the window in the channel's own samples (odd, ≥ 5).
 */
export function channelSamples(travelM: ArrayLike<number>, timeS: ArrayLike<number>, windowMs: number): { index: Int32Array; dtS: number; window: number } {
  const n = travelM.length;
  let m = 0;
  const index = new Int32Array(n);
  for (let i = 0; i < n; i++) if (Number.isFinite(travelM[i])) index[m++] = i;
  const idx = index.subarray(0, m);
  if (m < 2) return { index: idx, dtS: NaN, window: 5 };
  const steps = new Float64Array(m - 1);
  for (let k = 1; k < m; k++) steps[k - 1] = timeS[idx[k]!]! - timeS[idx[k - 1]!]!;
  steps.sort();
  const mid = (m - 1) >> 1;
  const dtS = (m - 1) % 2 ? steps[mid]! : 0.5 * (steps[mid - 1]! + steps[mid]!);
  let window = Math.round(windowMs / 1000 / dtS);
  if (!Number.isFinite(window) || window < 5) window = 5;
  if (window % 2 === 0) window += 1;
  return { index: idx, dtS, window };
}

/**
 * Velocity (x per second) of a channel on its own samples: the finite samples are taken out of the
 * master clock, split where a gap is longer than 1.5 channel steps (a dropout is not smoothed
 * across), differentiated by Savitzky–Golay run by run, and put back at their own times. Samples
 * between the channel's own samples stay NaN, and a run shorter than the window gives NaN.
 */
export function channelVelocity(travelM: ArrayLike<number>, timeS: ArrayLike<number>, windowMs: number, order: number): { velocity: Float32Array; dtS: number; window: number; samples: number } {
  const n = travelM.length;
  const out = new Float32Array(n).fill(NaN);
  const { index, dtS, window } = channelSamples(travelM, timeS, windowMs);
  const m = index.length;
  if (m < 2) return { velocity: out, dtS, window, samples: m };
  let start = 0;
  for (let k = 1; k <= m; k++) {
    if (k < m && timeS[index[k]!]! - timeS[index[k - 1]!]! <= 1.5 * dtS) continue;
    const len = k - start;
    if (len >= window) {
      const run = new Float64Array(len);
      for (let j = 0; j < len; j++) run[j] = travelM[index[start + j]!]!;
      const v = savitzkyGolayDerivative(run, dtS, window, order, 1);
      for (let j = 0; j < len; j++) out[index[start + j]!] = v[j]!;
    }
    start = k;
  }
  return { velocity: out, dtS, window, samples: m };
}

export interface SuspensionUseOptions {
  /** Full stroke of the fork or shock (m). */
  strokeM: number;
  /**
   * Savitzky–Golay window for velocity, as a span of time (ms). It becomes an odd number of the
   * channel's OWN samples (at least 5), so a pot logged at 50 Hz on a 200 Hz master clock gets the
   * same smoothing in time as one logged at 200 Hz. Default DEFAULT_VELOCITY_WINDOW_MS.
   */
  velocityWindowMs?: number;
  /** Savitzky–Golay polynomial order. Default 2. */
  velocityOrder?: number;
  /** Low/high-speed split (m/s) — a setting, see DEFAULT_LOW_HIGH_BOUNDARY_MS. */
  lowHighBoundaryMs: number;
  /** Number of position bins across 0–100 % of stroke. Default 20. */
  bins?: number;
  /** Velocity bin width (m/s). Default 0.025. */
  velocityBinWidthMps?: number;
  /** Velocity histogram covers ± this; faster samples go in the outer bins (m/s). Default 0.5. */
  velocityRangeMps?: number;
  /** Ground speed (m/s) for sag; without it sag is not reported. */
  speedMps?: Float32Array;
  /** Lean angle (deg) to keep rolling sag to upright running. */
  leanDeg?: Float32Array;
  bottoming?: BottomingOptions;
}

export interface Histogram {
  /** Bin edges, length = bins + 1. */
  edges: Float64Array;
  /** Share of time per bin, % of the valid samples. */
  timePct: Float64Array;
}

export interface SuspensionUse {
  strokeM: number;
  sampleCount: number;
  /** Position histogram, edges in % of stroke. */
  position: Histogram;
  /** Velocity histogram, edges in m/s; compression (travel increasing) positive. */
  velocity: Histogram;
  /** Share of time in each damping quadrant (%; zero velocity counts as compression). */
  split: { boundaryMs: number; compressionLowPct: number; compressionHighPct: number; reboundLowPct: number; reboundHighPct: number };
  /** The velocity channel itself (m/s). */
  velocityMps: Float32Array;
  /**
   * Sag, two ways: `steadySpeedM` is the median travel while running upright at a steady speed
   * above 10 m/s (|dv/dt| < 0.5 m/s², |lean| < 5°) — rolling sag; `stoppedM` is the median
   * travel while the bike stands still (< 0.5 m/s), which is static sag only if the rider sat
   * on it. Each needs at least 1 s of qualifying samples, else null.
   */
  sag: { steadySpeedM: number | null; stoppedM: number | null };
  maxTravelM: number;
  maxTravelPct: number;
  bottoming: { count: number; events: BottomingEvent[] };
  /** The channel's own sample rate (Hz) and the velocity window in its own samples. */
  channelRateHz: number | null;
  velocityWindowSamples: number;
}

function median(values: Float32Array | Float64Array, count: number): number {
  const s = values.subarray(0, count).sort();
  const mid = count >> 1;
  return count % 2 ? s[mid]! : 0.5 * (s[mid - 1]! + s[mid]!);
}

/** Suspension use of one fork or shock over a record (a lap or a session). */
export function suspensionUse(travelM: Float32Array, timeS: Float64Array, opts: SuspensionUseOptions): SuspensionUse {
  const n = travelM.length;
  const { strokeM, lowHighBoundaryMs } = opts;
  const windowMs = opts.velocityWindowMs ?? DEFAULT_VELOCITY_WINDOW_MS;
  const order = opts.velocityOrder ?? 2;
  const bins = opts.bins ?? 20;
  const vWidth = opts.velocityBinWidthMps ?? 0.025;
  const vRange = opts.velocityRangeMps ?? 0.5;
  const dtS = n > 1 ? (timeS[n - 1]! - timeS[0]!) / (n - 1) : 1;

  const own = channelVelocity(travelM, timeS, windowMs, order);
  const velocityMps = own.velocity;

  const posEdges = new Float64Array(bins + 1);
  for (let b = 0; b <= bins; b++) posEdges[b] = (100 * b) / bins;
  const posCounts = new Float64Array(bins);
  const vBins = 2 * Math.ceil(vRange / vWidth);
  const vEdges = new Float64Array(vBins + 1);
  for (let b = 0; b <= vBins; b++) vEdges[b] = -vRange + b * vWidth;
  const vCounts = new Float64Array(vBins);
  let cLow = 0, cHigh = 0, rLow = 0, rHigh = 0, vCount = 0;
  let pCount = 0;
  let maxTravelM = -Infinity;

  for (let i = 0; i < n; i++) {
    const x = travelM[i]!;
    if (Number.isFinite(x)) {
      pCount++;
      if (x > maxTravelM) maxTravelM = x;
      const pct = (100 * x) / strokeM;
      const b = Math.min(bins - 1, Math.max(0, Math.floor((pct / 100) * bins)));
      posCounts[b]!++;
    }
    const v = velocityMps[i]!;
    if (Number.isFinite(v)) {
      vCount++;
      const b = Math.min(vBins - 1, Math.max(0, Math.floor((v + vRange) / vWidth)));
      vCounts[b]!++;
      const fast = Math.abs(v) >= lowHighBoundaryMs;
      if (v >= 0) {
        if (fast) cHigh++;
        else cLow++;
      } else if (fast) rHigh++;
      else rLow++;
    }
  }
  for (let b = 0; b < bins; b++) posCounts[b] = pCount ? (100 * posCounts[b]!) / pCount : 0;
  for (let b = 0; b < vBins; b++) vCounts[b] = vCount ? (100 * vCounts[b]!) / vCount : 0;
  const pctOf = (k: number) => (vCount ? (100 * k) / vCount : 0);

  // Sag.
  let steadySpeedM: number | null = null;
  let stoppedM: number | null = null;
  const speed = opts.speedMps;
  if (speed) {
    // The sag samples are travel samples as they are (Float32 from the channel): buffers of the
    // same type hold them exactly, and grow as needed instead of two doubles per sample of the
    // whole record (only steady running and standing still qualify).
    const Buf = travelM instanceof Float32Array ? Float32Array : Float64Array;
    let steady: Float32Array | Float64Array = new Buf(Math.min(n, 4096));
    let stopped: Float32Array | Float64Array = new Buf(Math.min(n, 4096));
    const grow = (a: Float32Array | Float64Array): Float32Array | Float64Array => {
      const b = new Buf(Math.min(n, 2 * a.length));
      b.set(a);
      return b;
    };
    let ns = 0, nz = 0;
    const half = Math.max(1, Math.round(0.25 / dtS));
    const lean = opts.leanDeg;
    for (let i = 0; i < n; i++) {
      const x = travelM[i]!;
      const v = speed[i]!;
      if (!Number.isFinite(x) || !Number.isFinite(v)) continue;
      if (v < 0.5) {
        if (nz === stopped.length) stopped = grow(stopped);
        stopped[nz++] = x;
        continue;
      }
      if (v <= 10 || i < half || i + half >= n) continue;
      if (lean && !(Math.abs(lean[i]!) < 5)) continue;
      const accel = (speed[i + half]! - speed[i - half]!) / (timeS[i + half]! - timeS[i - half]!);
      if (Math.abs(accel) < 0.5) {
        if (ns === steady.length) steady = grow(steady);
        steady[ns++] = x;
      }
    }
    // 1 s of the channel's own samples (a slow pot has fewer samples per second than the clock).
    const minCount = Math.ceil(1 / (Number.isFinite(own.dtS) && own.dtS > 0 ? own.dtS : dtS));
    if (ns >= minCount) steadySpeedM = median(steady, ns);
    if (nz >= minCount) stoppedM = median(stopped, nz);
  }

  const events = bottomingEvents(travelM, timeS, strokeM, opts.bottoming);
  return {
    strokeM,
    sampleCount: pCount,
    position: { edges: posEdges, timePct: posCounts },
    velocity: { edges: vEdges, timePct: vCounts },
    split: {
      boundaryMs: lowHighBoundaryMs,
      compressionLowPct: pctOf(cLow),
      compressionHighPct: pctOf(cHigh),
      reboundLowPct: pctOf(rLow),
      reboundHighPct: pctOf(rHigh),
    },
    velocityMps,
    sag: { steadySpeedM, stoppedM },
    maxTravelM: pCount ? maxTravelM : NaN,
    maxTravelPct: pCount ? (100 * maxTravelM) / strokeM : NaN,
    bottoming: { count: events.length, events },
    channelRateHz: Number.isFinite(own.dtS) && own.dtS > 0 ? 1 / own.dtS : null,
    velocityWindowSamples: own.window,
  };
}
