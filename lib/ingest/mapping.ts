import type { ChannelRole } from "@/lib/channels/roles";

/** How the time column is written. */
export type TimeFormat = "seconds" | "milliseconds" | "iso8601";

/** One CSV column's place in a session. Saved in an Import profile and reused. */
export interface MappedColumn {
  /** 0-based field index. */
  index: number;
  /** Column name as in the header (without unit); becomes the channel name. */
  name: string;
  /** Role, or "ignore" to leave the column out. */
  role: ChannelRole | "ignore";
  /** Unit the (calibrated) values are in, e.g. "km/h"; converted to the role's SI unit. */
  unit: string;
  /** Calibration applied first, in `unit`: calibrated = raw × scale + offset. */
  scale: number;
  offset: number;
}

export interface Mapping {
  columns: MappedColumn[];
  timeFormat: TimeFormat;
  /**
   * Rows repeating the time stamp of the row before (a 1 kHz log exported with rounded times):
   * "refuse" the file (default) or "keepFirst" — keep the first row of each time stamp, drop and
   * count the others.
   */
  duplicateTimes?: "refuse" | "keepFirst";
}
