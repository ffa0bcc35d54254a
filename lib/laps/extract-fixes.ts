import type { GpsFixes } from "@/lib/geo/types";
import type { SeriesLike } from "./types";

/** GPS fixes pulled out of a series, with the master-clock sample each came from. */
export interface SeriesFixes extends GpsFixes {
  latDeg: Float64Array;
  lonDeg: Float64Array;
  /** Index into series.timeS of each fix. */
  sampleIndex: Int32Array;
  /** GPS speed at each fix in m/s, NaN where the log has none. */
  speedMps: Float64Array;
}

/** A usable position: finite, within ±90° / ±180°, and not the (0, 0) a receiver writes without a fix. */
export function validFix(lat: number, lon: number): boolean {
  return Number.isFinite(lat) && Number.isFinite(lon) && Math.abs(lat) <= 90 && Math.abs(lon) <= 180 && !(lat === 0 && lon === 0);
}

/**
 * The samples where both gps_lat and gps_lon hold a usable value (validFix) (the fixes of a GPS logged slower than
 * the master clock), as compact Float64 arrays. Two passes: count, then fill, no growing arrays.
 */
export function extractFixes(series: SeriesLike): SeriesFixes {
  const lat = series.channels.gps_lat;
  const lon = series.channels.gps_lon;
  const spd = series.channels.gps_speed;
  const t = series.timeS;
  let n = 0;
  if (lat && lon) {
    for (let i = 0; i < t.length; i++) if (validFix(lat[i]!, lon[i]!)) n++;
  }
  const out: SeriesFixes = {
    timeS: new Float64Array(n),
    latDeg: new Float64Array(n),
    lonDeg: new Float64Array(n),
    sampleIndex: new Int32Array(n),
    speedMps: new Float64Array(n),
  };
  if (!lat || !lon) return out;
  // The output arrays as locals: the loop runs once per sample of the session.
  const { timeS, latDeg, lonDeg, sampleIndex, speedMps } = out;
  let k = 0;
  for (let i = 0; i < t.length; i++) {
    const la = lat[i]!;
    const lo = lon[i]!;
    if (!validFix(la, lo)) continue;
    timeS[k] = t[i]!;
    latDeg[k] = la;
    lonDeg[k] = lo;
    sampleIndex[k] = i;
    speedMps[k] = spd ? spd[i]! : NaN;
    k++;
  }
  return out;
}
