import type { LatLon } from "./types";

/**
 * Even–odd ray casting in plain lat/lon: fine for a pit-lane polygon a few hundred metres
 * across, where the degree grid is as good as flat.
 */
export function pointInPolygon(lat: number, lon: number, polygon: readonly LatLon[]): boolean {
  let inside = false;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
    const a = polygon[i];
    const b = polygon[j];
    if (a.lat > lat !== b.lat > lat && lon < ((b.lon - a.lon) * (lat - a.lat)) / (b.lat - a.lat) + a.lon) inside = !inside;
  }
  return inside;
}
