import type { ChannelRole } from "@/lib/channels/roles";
import type { DriveSlipOptions } from "@/lib/slip/drive-slip";
import type { ThresholdKey } from "./thresholds";

export const FINDING_KINDS = [
  "brake_on_straight",
  "rev_ceiling",
  "pit_overspeed",
  "wheel_spin",
  "bottoming",
  "sensor_flat",
  "gps_dropout",
  "gps_jump",
  "clock_gap",
] as const;
export type FindingKind = (typeof FINDING_KINDS)[number];

export type FindingSeverity = "info" | "warning" | "critical";

export interface Finding {
  kind: FindingKind;
  /** Lap the event starts in; null before the first or outside any lap. */
  lapNumber: number | null;
  startTimeS: number;
  endTimeS: number;
  /** Sample indices of the event (inclusive), for looking up distance and drawing. */
  startIndex: number;
  endIndex: number;
  severity: FindingSeverity;
  /** The worst value of the event, in `unit` (SI). */
  measuredValue: number;
  thresholdValue: number;
  unit: string;
  message: string;
  /** The channel concerned, where one is (sensor_flat, bottoming). */
  channel?: ChannelRole;
  /** CAUTION_TEXT on brake, suspension and engine findings. */
  caution?: string;
}

/** The part of a lap the findings read; a lib/laps `Lap` fits. */
export interface LapSpan {
  number: number;
  startTimeS: number;
  endTimeS: number;
}

export interface LatLon {
  lat: number;
  lon: number;
}

export interface TrackInfo {
  /** The track's pit-lane limit (m/s); overrides the default threshold. */
  pitSpeedLimitMps?: number;
  corners?: { name: string; distanceM: number }[];
  /** Where the pit lane is, by one of: a predicate on sample index, time ranges, or a polygon of GPS points. */
  inPitLane?: (i: number) => boolean;
  pitLaneTimes?: { startTimeS: number; endTimeS: number }[];
  pitLane?: LatLon[];
}

export interface BikeLimits {
  /** The bike's class rev ceiling (rpm); overrides the default threshold. */
  revCeilingRpm?: number;
  forkStrokeM?: number;
  shockStrokeM?: number;
  /** How Drive slip is computed for wheel_spin (zero ratio, lean correction). */
  slip?: DriveSlipOptions;
}

export interface FindingsContext {
  laps?: readonly LapSpan[];
  track?: TrackInfo;
  bike?: BikeLimits;
  /** Team settings overriding DEFAULT_THRESHOLDS. */
  thresholds?: Partial<Record<ThresholdKey, number>>;
}
