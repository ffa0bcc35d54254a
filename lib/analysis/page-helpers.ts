/**
 * Small helpers the page computations (slip, suspension, gears, brief) share: a threshold as
 * the findings engine resolves it, the lap and corner a moment lies in, and rounding for JSON.
 */
import { DEFAULT_THRESHOLDS } from "@/lib/findings/thresholds";
import { resolveThreshold } from "@/lib/findings/resolve-thresholds";
import type { AnalysisBase } from "./analysis-base";

/** A threshold as the findings engine resolves it (resolveThreshold: track over bike over default). */
export function thresholdOf(base: AnalysisBase, key: keyof typeof DEFAULT_THRESHOLDS): { value: number; source: "bike" | "track" | "default" } {
  return resolveThreshold(key, base.bike?.thresholds, base.trackThresholds);
}

export function lapAt(base: AnalysisBase, timeS: number): number {
  for (let k = 0; k < base.laps.length; k++) if (timeS >= base.laps[k].startTimeS && timeS < base.laps[k].endTimeS) return k;
  return -1;
}

/** The corner whose exit a lap distance lies in: the last apex at or before it. */
export function cornerAt(corners: { name: string; distanceM: number }[], d: number): string | null {
  if (corners.length === 0 || !Number.isFinite(d)) return null;
  const sorted = [...corners].sort((a, b) => a.distanceM - b.distanceM);
  let c = sorted[sorted.length - 1];
  for (const x of sorted) if (x.distanceM <= d) c = x;
  return c.name;
}

export const arr = (a: ArrayLike<number>): (number | null)[] => Array.from(a, (x) => (Number.isFinite(x) ? Math.round(x * 1e4) / 1e4 : null));
