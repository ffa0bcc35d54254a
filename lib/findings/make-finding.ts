import type { DetectorContext } from "./detector-context";
import type { Finding } from "./types";

/** A Finding for the samples start…end, with the lap looked up from the start time. */
export function makeFinding(
  dc: DetectorContext,
  start: number,
  end: number,
  fields: Omit<Finding, "lapNumber" | "startTimeS" | "endTimeS" | "startIndex" | "endIndex">,
): Finding {
  const t = dc.series.timeS;
  return { ...fields, lapNumber: dc.lapOf(t[start]), startTimeS: t[start], endTimeS: t[end], startIndex: start, endIndex: end };
}

export const kmh = (ms: number) => `${(ms * 3.6).toFixed(1)} km/h`;
export const bar = (pa: number) => `${(pa / 1e5).toFixed(1)} bar`;
export const onLap = (dc: DetectorContext, i: number) => {
  const lap = dc.lapOf(dc.series.timeS[i]);
  return lap === null ? "" : ` on lap ${lap}`;
};
