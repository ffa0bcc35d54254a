import { summarizeFinite, type FiniteSummary } from "@/lib/stats/summarize-finite";
import { lowerBound } from "./lower-bound";
import type { Lap, SeriesLike } from "./types";

type Role = keyof SeriesLike["channels"];

export interface LapStats {
  /** Highest and lowest speed in the lap, m/s; NaN when the log has no speed channel. */
  topSpeedMps: number;
  minSpeedMps: number;
  /** Which channel the speeds came from: the front wheel (ground speed; the rear spins), else GPS. */
  speedSource: "speed_front" | "gps_speed" | null;
  /** Summary of each requested channel over the lap, in the channel's SI unit. */
  channels: Partial<Record<Role, FiniteSummary>>;
}

/**
 * Per-lap statistics over the master-clock samples with startTimeS ≤ t ≤ endTimeS (found by binary
 * search): top and minimum speed, and mean / sample SD / min / max of the chosen channels
 * (NaN samples skipped; statistics from simple-statistics through lib/stats).
 */
export function lapStats(series: SeriesLike, lap: Lap, channels: readonly Role[] = []): LapStats {
  const from = lowerBound(series.timeS, lap.startTimeS);
  let to = lowerBound(series.timeS, lap.endTimeS, from);
  if (to < series.timeS.length && series.timeS[to] === lap.endTimeS) to++;

  const speedSource = series.channels.speed_front ? "speed_front" : series.channels.gps_speed ? "gps_speed" : null;
  let topSpeedMps = NaN;
  let minSpeedMps = NaN;
  if (speedSource) {
    const s = summarizeFinite(series.channels[speedSource]!, from, to);
    topSpeedMps = s.max;
    minSpeedMps = s.min;
  }
  const out: LapStats["channels"] = {};
  for (const role of channels) {
    const values = series.channels[role];
    if (values) out[role] = summarizeFinite(values, from, to);
  }
  return { topSpeedMps, minSpeedMps, speedSource, channels: out };
}
