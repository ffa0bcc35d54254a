import { toLocalMetres } from "./to-local-metres";
import { thinFixes } from "./thin-fixes";

/** A track outline in local metres (x east, y north) around `origin`, ready to draw. */
export interface Outline {
  origin: { lat: number; lon: number };
  /** [x, y] in metres. */
  points: [number, number][];
}

/**
 * Outline from GPS positions: usable fixes thinned (thinFixes) so no two kept points are closer
 * than `minStepM` (an outline needs shape, not every fix), projected to local metres around the
 * first kept fix.
 */
export function outlineFromFixes(lat: ArrayLike<number>, lon: ArrayLike<number>, minStepM = 8, maxPoints = 1500): Outline | null {
  const kept = thinFixes(lat, lon, minStepM, maxPoints);
  const first = kept[0];
  if (!first) return null;
  const origin = { lat: first[0], lon: first[1] };
  const proj = toLocalMetres(origin);
  return { origin, points: kept.map(([la, lo]): [number, number] => [proj.xM(lo), proj.yM(la)]) };
}

/** A point given in degrees, in the outline's local metres. */
export function projectOnOutline(outline: Outline, lat: number, lon: number): [number, number] {
  const proj = toLocalMetres(outline.origin);
  return [proj.xM(lon), proj.yM(lat)];
}
