import { toLocalMetres } from "./to-local-metres";
import type { Gate, LatLon } from "./types";

/** Shortest and longest gate we accept, in metres: shorter is a misclick, longer spans the infield. */
export const GATE_MIN_LENGTH_M = 1;
export const GATE_MAX_LENGTH_M = 200;

function checkPoint(p: LatLon, name: string): void {
  if (!Number.isFinite(p.lat) || !Number.isFinite(p.lon) || Math.abs(p.lat) > 90 || Math.abs(p.lon) > 180) {
    throw new RangeError(`gate point ${name} is not a valid position: ${p.lat}, ${p.lon}`);
  }
}

/**
 * A gate from its two end points (degrees). Orientation follows the Gate convention: seen by the
 * rider approaching the line, `a` is on the right and `b` on the left (see `Gate`). Throws when a
 * point is not a position or the gate is shorter than 1 m or longer than 200 m.
 */
export function gateFromPoints(a: LatLon, b: LatLon): Gate {
  checkPoint(a, "a");
  checkPoint(b, "b");
  const proj = toLocalMetres(a);
  const lengthM = Math.hypot(proj.xM(b.lon), proj.yM(b.lat));
  if (lengthM < GATE_MIN_LENGTH_M || lengthM > GATE_MAX_LENGTH_M) {
    throw new RangeError(
      `gate length ${lengthM.toFixed(1)} m is outside ${GATE_MIN_LENGTH_M}–${GATE_MAX_LENGTH_M} m`,
    );
  }
  return { a: { lat: a.lat, lon: a.lon }, b: { lat: b.lat, lon: b.lon } };
}
