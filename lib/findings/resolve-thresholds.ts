import { DEFAULT_THRESHOLDS, type ThresholdKey } from "./thresholds";

type Layer = Record<string, unknown> | null | undefined;

const usable = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);

/**
 * The one threshold rule: the track's setting over the bike's over DEFAULT_THRESHOLDS. A setting
 * that is not a finite number counts as not set. Findings (mergeThresholds) and the pages that
 * show a threshold beside their figures (resolveThreshold) both go through here.
 */
export function resolveThreshold(key: ThresholdKey, bike: Layer, track: Layer): { value: number; source: "bike" | "track" | "default" } {
  const t = track?.[key];
  if (usable(t)) return { value: t, source: "track" };
  const b = bike?.[key];
  if (usable(b)) return { value: b, source: "bike" };
  return { value: DEFAULT_THRESHOLDS[key].value, source: "default" };
}

/** The team's settings of every known key, later layers over earlier ones (defaults left out). */
export function mergeThresholds(...layers: Layer[]): Partial<Record<ThresholdKey, number>> {
  const out: Partial<Record<ThresholdKey, number>> = {};
  for (const layer of layers) {
    if (!layer) continue;
    for (const key of Object.keys(DEFAULT_THRESHOLDS) as ThresholdKey[]) {
      const v = layer[key];
      if (usable(v)) out[key] = v;
    }
  }
  return out;
}
