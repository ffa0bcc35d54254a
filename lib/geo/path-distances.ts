import { toLocalMetres } from "./to-local-metres";

/**
 * Cumulative distance along a [lat, lon] polyline (m), first entry 0, on the local flat frame of
 * the first point (a circuit spans a few km, where that frame is within 0.05 % of the ellipsoid).
 */
export function pathDistances(points: readonly (readonly [number, number])[]): Float64Array {
  const out = new Float64Array(points.length);
  if (points.length === 0) return out;
  const proj = toLocalMetres({ lat: points[0][0], lon: points[0][1] });
  let px = 0;
  let py = 0;
  for (let i = 1; i < points.length; i++) {
    const x = proj.xM(points[i][1]);
    const y = proj.yM(points[i][0]);
    out[i] = out[i - 1] + Math.hypot(x - px, y - py);
    px = x;
    py = y;
  }
  return out;
}
