import type { NumericArray, SeriesLike } from "./types";

/** Reference speed above which a working wheel sensor must read something (m/s): 36 km/h (Lapbench default). */
const MOVING_MS = 10;
/** A wheel reading below this (m/s) while the reference moves counts as reading nothing. */
const DEAD_BELOW_MS = 1;
/** Dead when it reads nothing for at least this share of the moving time… */
const DEAD_SHARE = 0.8;
/** …and the reference moved for at least this long (s). */
const MIN_MOVING_S = 10;

export interface WheelSensorCheck {
  role: "speed_front" | "speed_rear";
  /** Reads (near) zero or nothing while GPS or the other wheel says the bike moves. */
  dead: boolean;
  /** Time the reference said the bike was moving (s), and the share of it the wheel read nothing. */
  movingS: number;
  deadShare: number;
  /** The reference's top speed meanwhile (m/s), for the message. */
  referenceMaxMps: number;
  referenceName: "GPS" | "rear wheel" | "front wheel";
}

/** Carry each finite sample forward over the NaNs after it (GPS is logged slower than the clock). */
function held(x: NumericArray): Float64Array {
  const out = new Float64Array(x.length);
  let last = NaN;
  for (let i = 0; i < x.length; i++) {
    if (Number.isFinite(x[i]!)) last = x[i]!;
    out[i] = last;
  }
  return out;
}

/**
 * The most common sensor fault: a wheel-speed sensor that reads 0 (or nothing) while the bike
 * moves. Judged against GPS speed, else the other wheel. Null when there is no reference or the
 * bike did not move long enough to tell.
 */
export function checkWheelSensor(series: SeriesLike, role: "speed_front" | "speed_rear"): WheelSensorCheck | null {
  const w = series.channels[role];
  if (!w) return null;
  const other = series.channels[role === "speed_front" ? "speed_rear" : "speed_front"];
  const gps = series.channels.gps_speed;
  const ref = gps ? held(gps) : other;
  if (!ref) return null;
  const referenceName = gps ? "GPS" : role === "speed_front" ? "rear wheel" : "front wheel";
  const t = series.timeS;
  let moving = 0;
  let nothing = 0;
  let refMax = 0;
  for (let i = 0; i + 1 < t.length; i++) {
    const r = ref[i]!;
    if (!(r > MOVING_MS)) continue;
    const dt = t[i + 1]! - t[i]!;
    moving += dt;
    if (r > refMax) refMax = r;
    if (!(Math.abs(w[i]!) >= DEAD_BELOW_MS)) nothing += dt;
  }
  if (moving < MIN_MOVING_S) return null;
  const share = nothing / moving;
  return { role, dead: share >= DEAD_SHARE, movingS: moving, deadShare: share, referenceMaxMps: refMax, referenceName };
}

/** The ground speed to use and where it came from: front wheel, else rear wheel, else GPS — skipping a dead wheel. */
export function liveGroundSpeed(series: SeriesLike): { speedMps: NumericArray | Float64Array | undefined; source: "speed_front" | "speed_rear" | "gps_speed" | "none" } {
  const c = series.channels;
  if (c.speed_front && !checkWheelSensor(series, "speed_front")?.dead) return { speedMps: c.speed_front, source: "speed_front" };
  if (c.speed_rear && !checkWheelSensor(series, "speed_rear")?.dead) return { speedMps: c.speed_rear, source: "speed_rear" };
  if (c.gps_speed) return { speedMps: held(c.gps_speed), source: "gps_speed" };
  return { speedMps: undefined, source: "none" };
}

/**
 * The wheel to integrate for distance: the front (the free-rolling ground reference) unless it is
 * dead; then GPS when there are fixes (`hasGps`), else the rear wheel unless it is dead too.
 */
export function distanceWheel(series: SeriesLike, hasGps: boolean): { speedMps: NumericArray; role: "speed_front" | "speed_rear" } | undefined {
  const c = series.channels;
  if (c.speed_front && !checkWheelSensor(series, "speed_front")?.dead) return { speedMps: c.speed_front, role: "speed_front" };
  if (c.speed_front && !hasGps && c.speed_rear && !checkWheelSensor(series, "speed_rear")?.dead) return { speedMps: c.speed_rear, role: "speed_rear" };
  return undefined;
}
