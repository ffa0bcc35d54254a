import { ROLE_LABEL, ROLE_SI_UNIT } from "@/lib/channels/roles";
import { channelFromValues } from "./channel-from-values";
import type { ParsedChannel } from "./parsed-series";

/** One GPS fix as the GPX and NMEA parsers read it (absolute time in ms; SI otherwise). */
export interface GpsFix {
  ms: number;
  lat: number;
  lon: number;
  altM: number;
}

/**
 * The master clock (seconds from the first fix) and the position/altitude/speed channels of a
 * GPS-only log. Latitude and longitude stay Float64 (FLOAT64_ROLES: sub-centimetre precision).
 * `speedMps` is filled by the caller (read from the file, or derived from positions).
 * Channels with no sample at all are left out.
 */
export function gpsFixSeries(fixes: readonly GpsFix[], fillSpeed: (out: Float32Array) => void): { timeS: Float64Array; channels: ParsedChannel[] } {
  const n = fixes.length;
  const t0 = fixes[0].ms;
  const timeS = new Float64Array(n);
  const lat = new Float64Array(n);
  const lon = new Float64Array(n);
  const alt = new Float32Array(n);
  const speed = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    const f = fixes[i];
    timeS[i] = (f.ms - t0) / 1000;
    lat[i] = f.lat;
    lon[i] = f.lon;
    alt[i] = f.altM;
  }
  fillSpeed(speed);
  const channels = [
    channelFromValues(ROLE_LABEL.gps_lat, "gps_lat", ROLE_SI_UNIT.gps_lat, lat),
    channelFromValues(ROLE_LABEL.gps_lon, "gps_lon", ROLE_SI_UNIT.gps_lon, lon),
    channelFromValues(ROLE_LABEL.gps_speed, "gps_speed", ROLE_SI_UNIT.gps_speed, speed),
    channelFromValues(ROLE_LABEL.gps_alt, "gps_alt", ROLE_SI_UNIT.gps_alt, alt),
  ].filter((c) => c.sampleCount > 0);
  return { timeS, channels };
}
