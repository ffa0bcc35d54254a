/**
 * Channel roles: our own identifiers for what a logged column means, and the SI unit each role is
 * stored in. Everything inside Lapbench is SI (speeds in m/s, distances and travel in metres,
 * pressures in pascals); conversion happens once at import and once at display.
 */
export const CHANNEL_ROLES = [
  "time",
  "speed_front",
  "speed_rear",
  "gps_speed",
  "gps_lat",
  "gps_lon",
  "gps_alt",
  "engine_rpm",
  "throttle",
  "brake_front",
  "brake_rear",
  "fork_travel",
  "shock_travel",
  "lean_angle",
  "gear",
  "lap_beacon",
  "tyre_temp_front",
  "tyre_temp_rear",
  "water_temp",
  "lambda",
  "accel_long",
  "accel_lat",
  "other",
] as const;

export type ChannelRole = (typeof CHANNEL_ROLES)[number];

/** The unit each role is stored in (SI or SI-accepted). */
export const ROLE_SI_UNIT: Record<ChannelRole, string> = {
  time: "s",
  speed_front: "m/s",
  speed_rear: "m/s",
  gps_speed: "m/s",
  gps_lat: "deg",
  gps_lon: "deg",
  gps_alt: "m",
  engine_rpm: "rpm",
  throttle: "%",
  brake_front: "Pa",
  brake_rear: "Pa",
  fork_travel: "m",
  shock_travel: "m",
  lean_angle: "deg",
  gear: "",
  lap_beacon: "",
  tyre_temp_front: "degC",
  tyre_temp_rear: "degC",
  water_temp: "degC",
  lambda: "",
  accel_long: "m/s2",
  accel_lat: "m/s2",
  other: "",
};

export const ROLE_LABEL: Record<ChannelRole, string> = {
  time: "Time",
  speed_front: "Front wheel speed",
  speed_rear: "Rear wheel speed",
  gps_speed: "GPS speed",
  gps_lat: "GPS latitude",
  gps_lon: "GPS longitude",
  gps_alt: "GPS altitude",
  engine_rpm: "Engine speed",
  throttle: "Throttle",
  brake_front: "Front brake pressure",
  brake_rear: "Rear brake pressure",
  fork_travel: "Fork travel",
  shock_travel: "Shock travel",
  lean_angle: "Lean angle",
  gear: "Gear",
  lap_beacon: "Lap beacon",
  tyre_temp_front: "Front tyre temperature",
  tyre_temp_rear: "Rear tyre temperature",
  water_temp: "Coolant temperature",
  lambda: "Lambda",
  accel_long: "Longitudinal acceleration",
  accel_lat: "Lateral acceleration",
  other: "Other",
};

/**
 * Roles stored as Float64: latitude and longitude. Float32 keeps ~7 significant digits, which at
 * mid latitudes rounds a position to ~0.4 m — about 7 ms of gate timing at 200 km/h.
 */
export const FLOAT64_ROLES: ReadonlySet<ChannelRole> = new Set<ChannelRole>(["gps_lat", "gps_lon"]);

export type SampleArray = Float32Array | Float64Array;

/** A NaN-free zeroed array of the storage type of a role. */
export function sampleArrayFor(role: ChannelRole, length: number): SampleArray {
  return FLOAT64_ROLES.has(role) ? new Float64Array(length) : new Float32Array(length);
}

export function isChannelRole(s: string): s is ChannelRole {
  return (CHANNEL_ROLES as readonly string[]).includes(s);
}

/**
 * A session's samples in memory. All arrays share the session's master clock `timeS`
 * (seconds from the start of the log, strictly increasing); a channel sampled slower than the
 * clock (GPS at 10–25 Hz in a 100 Hz file) holds NaN where it has no sample.
 * Values are in the role's SI unit (ROLE_SI_UNIT).
 */
export interface SessionSeries {
  timeS: Float64Array;
  channels: Partial<Record<Exclude<ChannelRole, "time" | "other" | "gps_lat" | "gps_lon">, Float32Array>> & {
    gps_lat?: SampleArray;
    gps_lon?: SampleArray;
  };
  /** Channels with role "other", by name. */
  others?: Record<string, Float32Array>;
}
