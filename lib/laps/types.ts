import type { ChannelRole } from "@/lib/channels/roles";
import type { Gate } from "@/lib/geo/types";

/** Float32 as stored, Float64 where a caller keeps full precision (e.g. GPS degrees). */
export type NumericArray = Float32Array | Float64Array;

/**
 * The part of a session's samples the lap functions read: the master clock (s) and channels by
 * role on that clock, NaN where a slower channel has no sample. `SessionSeries` fits this shape.
 */
export interface SeriesLike {
  timeS: Float64Array;
  channels: Partial<Record<Exclude<ChannelRole, "time" | "other">, NumericArray>>;
}

/** The gates of a track that lap detection uses. */
export interface TrackGates {
  startFinish: Gate;
  /** Sector-end gates in riding order, excluding the finish line itself. */
  sectors: Gate[];
  pitEntry?: Gate;
  pitExit?: Gate;
  /** Shortest believable lap in seconds; a start/finish crossing sooner than this is ignored. */
  minLapTimeS?: number;
}

/** One lap of a session. Times in seconds on the session clock; durations in whole ms. */
export interface Lap {
  /** 1-based, in session order; the out-lap is lap 1 when the log begins before the line. */
  number: number;
  startTimeS: number;
  endTimeS: number;
  /** round((endTimeS − startTimeS) · 1000). */
  lapTimeMs: number;
  /**
   * One entry per sector (sector gates + 1), ms; null where a boundary was not crossed or the
   * lap is partial at that end. Sectors of a lap add up to lapTimeMs exactly.
   */
  sectorTimesMs: (number | null)[];
  /** Began in the pit lane or before the first start/finish crossing of the log. */
  outLap: boolean;
  /** Ended in the pit lane (entered the pit lane and did not leave it) or the log ended first. */
  inLap: boolean;
  /** Went through the pit lane and back out within the lap (drive-through or stop). */
  pitPass: boolean;
  /** Starts and ends on a start/finish crossing (or beacon edge). */
  complete: boolean;
  /** Set by a person or a later check (track limits, red flag); detection never sets it. */
  invalid?: boolean;
  /** Over 1.5 × the session's median flying lap: likely two laps merged by a missed crossing (markSuspectLaps). */
  suspect?: boolean;
}

/** A flying lap: complete and not out, in, pit-pass, marked invalid or suspect. */
export function isFlyingLap(lap: Pick<Lap, "complete" | "outLap" | "inLap" | "pitPass" | "invalid" | "suspect">): boolean {
  return lap.complete && !lap.outLap && !lap.inLap && !lap.pitPass && !lap.invalid && !lap.suspect;
}
