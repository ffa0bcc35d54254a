import type { ChannelRole, SampleArray } from "@/lib/channels/roles";

/** One channel of a parsed log, on the shared master clock. */
export interface ParsedChannel {
  /** Channel name (the column name without unit, or a role label for GPS files). */
  name: string;
  role: Exclude<ChannelRole, "time">;
  /** Unit of `values`: the role's SI unit (ROLE_SI_UNIT), or the raw unit for unknown "other" units. */
  unit: string;
  /** One value per row of `timeS`; NaN where this channel has no sample. Float64 for latitude and longitude (FLOAT64_ROLES), Float32 otherwise. */
  values: SampleArray;
  /** Number of non-NaN values. */
  sampleCount: number;
  /** NaN when sampleCount is 0. */
  min: number;
  max: number;
}

/** What every parser returns: the master clock, the channels, and the file's metadata. */
export interface ParsedSeries {
  /** Seconds from the first row, strictly increasing. */
  timeS: Float64Array;
  channels: ParsedChannel[];
  /**
   * The file's own `# key: value` lines (CSV), plus what the parser derived: source_format,
   * time_format, start_time_iso (when the file gives absolute times), and per-format notes.
   */
  metadata: Record<string, string>;
  /** Number of rows (= timeS.length). */
  rows: number;
  /** What the reader skipped or corrected, one sentence each, for the session page. */
  notes?: string[];
  /** Satellites in use and HDOP per row, where the file gives them (NaN where not). */
  fixQuality?: { sats?: Float32Array; hdop?: Float32Array };
}

export interface IngestProgress {
  bytesRead: number;
  rows: number;
}
