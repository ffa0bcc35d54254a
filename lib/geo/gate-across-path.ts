import { gateFromPoints } from "./gate-from-points";
import { toLocalMetres } from "./to-local-metres";
import type { Gate, LatLon } from "./types";

/**
 * A gate centred on `at`, square to the direction of travel `at → next` (two consecutive points
 * of the recorded outline), `widthM` long, oriented so that riding from `at` towards `next`
 * crosses it forward (`a` on the rider's right, `b` on the left). For the gate editor: the user
 * clicks a point on the outline and the gate follows the track's heading there.
 */
export function gateAcrossPath(at: LatLon, next: LatLon, widthM = 30): Gate {
  const proj = toLocalMetres(at);
  const hx = proj.xM(next.lon);
  const hy = proj.yM(next.lat);
  const len = Math.hypot(hx, hy);
  if (!(len > 0)) throw new RangeError("gateAcrossPath: the two path points coincide");
  // Right-hand normal of the heading (x east, y north): (hy, −hx) / |h|.
  const rx = hy / len;
  const ry = -hx / len;
  const half = widthM / 2;
  return gateFromPoints(proj.toLatLon(rx * half, ry * half), proj.toLatLon(-rx * half, -ry * half));
}
