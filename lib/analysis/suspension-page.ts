/**
 * Suspension use (travel and velocity histograms, sag, bottoming) computed from an AnalysisBase
 * for the whole session or one lap. Pure (no database).
 */
import { suspensionUse, DEFAULT_LOW_HIGH_BOUNDARY_MS, DEFAULT_VELOCITY_WINDOW_MS } from "@/lib/suspension/suspension-use";
import { lapRange, type AnalysisBase, type LapInfo } from "./analysis-base";

export interface SuspensionSide {
  label: "Fork" | "Shock";
  strokeMm: number;
  strokeFromBike: boolean;
  position: { edgesPct: number[]; timePct: number[] };
  velocity: { edgesMms: number[]; timePct: number[] };
  split: { boundaryMs: number; compressionLowPct: number; compressionHighPct: number; reboundLowPct: number; reboundHighPct: number };
  sagMm: { rolling: number | null; standing: number | null };
  maxTravelMm: number | null;
  maxTravelPct: number | null;
  bottomingCount: number;
  /** The travel channel's own sample rate (Hz) and the velocity window in its own samples. */
  channelRateHz: number | null;
  windowSamples: number;
  /** Why the velocity histogram is empty, when it is (too few of the channel's own samples in a row). */
  velocityNote: string | null;
}

export interface SuspensionAnalysis {
  scope: string;
  lap: number | null;
  laps: LapInfo[];
  /** Velocity window (ms). */
  window: number;
  boundaryMs: number;
  fork: SuspensionSide | null;
  shock: SuspensionSide | null;
  sampleRateHz: number | null;
}

/**
 * Savitzky–Golay windows offered, in milliseconds (each becomes an odd count of the travel
 * channel's own samples): at 100 Hz these are the 5- to 21-sample windows.
 */
export const SG_WINDOWS = [50, 70, 90, 110, 150, 210] as const;
/** The Savitzky–Golay window the page starts with (ms; a Lapbench default). */
export const DEFAULT_SG_WINDOW = DEFAULT_VELOCITY_WINDOW_MS;

/** The settings as computeSuspension reads them: a window not offered, or a boundary ≤ 0, falls back to the default. */
export function suspensionSettings(opts: { window?: number; boundaryMs?: number }): { window: number; boundaryMs: number } {
  const window = SG_WINDOWS.includes(opts.window as (typeof SG_WINDOWS)[number]) ? opts.window! : DEFAULT_SG_WINDOW;
  const boundaryMs = opts.boundaryMs && opts.boundaryMs > 0 ? opts.boundaryMs : DEFAULT_LOW_HIGH_BOUNDARY_MS;
  return { window, boundaryMs };
}

/** Fork and shock over samples [from, to) (the whole session or one lap). */
export function suspensionSides(base: AnalysisBase, from: number, to: number, window: number, boundaryMs: number): { fork: SuspensionSide | null; shock: SuspensionSide | null } {
  const { series } = base;
  const t = series.timeS.subarray(from, to);
  const speed = series.channels.speed_front ?? series.channels.speed_rear;
  const side = (label: "Fork" | "Shock", travel: Float32Array | undefined, strokeMm: number | null): SuspensionSide | null => {
    if (!travel) return null;
    const x = travel.subarray(from, to);
    let observed = 0;
    for (let i = 0; i < x.length; i++) if (x[i] > observed) observed = x[i];
    // Without the bike's stroke, the deepest travel seen stands in (bottoming then means nothing).
    const strokeM = strokeMm ? strokeMm / 1000 : observed || 1;
    const u = suspensionUse(x, t, { strokeM, lowHighBoundaryMs: boundaryMs, velocityWindowMs: window, velocityOrder: 2, speedMps: speed?.subarray(from, to), leanDeg: series.channels.lean_angle?.subarray(from, to) });
    const mm = (v: number | null) => (v == null || !Number.isFinite(v) ? null : Math.round(v * 10000) / 10);
    return {
      label,
      strokeMm: strokeM * 1000,
      strokeFromBike: !!strokeMm,
      position: { edgesPct: Array.from(u.position.edges), timePct: Array.from(u.position.timePct) },
      velocity: { edgesMms: Array.from(u.velocity.edges, (e) => Math.round(e * 1000)), timePct: Array.from(u.velocity.timePct) },
      split: u.split,
      sagMm: { rolling: mm(u.sag.steadySpeedM), standing: mm(u.sag.stoppedM) },
      maxTravelMm: mm(u.maxTravelM),
      maxTravelPct: Number.isFinite(u.maxTravelPct) ? u.maxTravelPct : null,
      bottomingCount: strokeMm ? u.bottoming.count : 0,
      channelRateHz: u.channelRateHz,
      windowSamples: u.velocityWindowSamples,
      velocityNote:
        u.sampleCount > 0 && u.velocity.timePct.every((p) => p === 0)
          ? `No velocity: the ${label.toLowerCase()} channel has no run of ${u.velocityWindowSamples} samples in a row${u.channelRateHz ? ` at its own ${Math.round(u.channelRateHz)} Hz` : ""} to fit the ${window} ms window.`
          : null,
    };
  };
  return { fork: side("Fork", series.channels.fork_travel, base.bike?.forkStrokeMm ?? null), shock: side("Shock", series.channels.shock_travel, base.bike?.shockStrokeMm ?? null) };
}

export function sampleRateHz(timeS: Float64Array): number | null {
  const n = timeS.length;
  return n > 1 ? (n - 1) / (timeS[n - 1] - timeS[0]) : null;
}

export function computeSuspension(base: AnalysisBase, opts: { lap?: number | null; window?: number; boundaryMs?: number } = {}): SuspensionAnalysis {
  const { series } = base;
  const { window, boundaryMs } = suspensionSettings(opts);
  const lap = opts.lap != null ? base.laps.find((l) => l.number === opts.lap) ?? null : null;
  const [from, to] = lap ? lapRange(series.timeS, lap) : [0, series.timeS.length];
  return {
    scope: lap ? `Lap ${lap.number}` : "Whole session",
    lap: lap?.number ?? null,
    laps: base.lapInfo,
    window,
    boundaryMs,
    ...suspensionSides(base, from, to, window, boundaryMs),
    sampleRateHz: sampleRateHz(series.timeS),
  };
}
