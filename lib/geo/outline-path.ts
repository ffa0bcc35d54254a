import { toLocalMetres } from "./to-local-metres";

/** A track outline in local metres (x east, y north) around `origin`, ready to draw. */
export interface Outline {
  origin: { lat: number; lon: number };
  /** [x, y] in metres. */
  points: [number, number][];
}

/**
 * Outline from GPS positions: finite fixes only, projected to local metres and thinned so no
 * two kept points are closer than `minStepM` (an outline needs shape, not every fix).
 */
export function outlineFromFixes(lat: ArrayLike<number>, lon: ArrayLike<number>, minStepM = 8, maxPoints = 1500): Outline | null {
  let first = -1;
  for (let i = 0; i < lat.length; i++) if (Number.isFinite(lat[i]) && Number.isFinite(lon[i])) { first = i; break; }
  if (first < 0) return null;
  const proj = toLocalMetres({ lat: lat[first], lon: lon[first] });
  const points: [number, number][] = [];
  let px = NaN, py = NaN;
  for (let i = first; i < lat.length; i++) {
    if (!Number.isFinite(lat[i]) || !Number.isFinite(lon[i])) continue;
    const x = proj.xM(lon[i]);
    const y = proj.yM(lat[i]);
    if (points.length && Math.hypot(x - px, y - py) < minStepM) continue;
    points.push([x, y]);
    px = x;
    py = y;
  }
  const stride = Math.ceil(points.length / maxPoints);
  const thinned = stride > 1 ? points.filter((_, k) => k % stride === 0) : points;
  return { origin: { lat: lat[first], lon: lon[first] }, points: thinned };
}

/** A point given in degrees, in the outline's local metres. */
export function projectOnOutline(outline: Outline, lat: number, lon: number): [number, number] {
  const proj = toLocalMetres(outline.origin);
  return [proj.xM(lon), proj.yM(lat)];
}
