import { toLocalMetres } from "@/lib/geo/to-local-metres";
import type { BrakingPoint } from "./braking-points";

/** One lap's path: distance from its start (m) per sample, and the GPS position (NaN between fixes). */
export interface LapPath {
  distanceM: ArrayLike<number>;
  lat?: ArrayLike<number>;
  lon?: ArrayLike<number>;
}

/**
 * How far (m) around the distance expected from the lap-length ratio the reference path is
 * searched for the nearest point, so a point on one straight is not matched to a parallel one
 * (Lapbench default: several times the few metres two laps' lengths differ by).
 */
const SEARCH_WINDOW_M = 150;
/** A projection farther than this from the reference path is not the same place (Lapbench default: a track's width and GPS error). */
const MAX_OFF_PATH_M = 40;

interface RefPath {
  x: Float64Array;
  y: Float64Array;
  d: Float64Array;
}

function fixesOf(path: LapPath, proj: ReturnType<typeof toLocalMetres>): RefPath | null {
  const { distanceM: dist, lat, lon } = path;
  if (!lat || !lon) return null;
  const x: number[] = [];
  const y: number[] = [];
  const d: number[] = [];
  for (let i = 0; i < dist.length; i++) {
    if (!Number.isFinite(lat[i]) || !Number.isFinite(lon[i]) || !Number.isFinite(dist[i])) continue;
    x.push(proj.xM(lon[i]));
    y.push(proj.yM(lat[i]));
    d.push(dist[i]);
  }
  return d.length >= 2 ? { x: Float64Array.from(x), y: Float64Array.from(y), d: Float64Array.from(d) } : null;
}

function lastIndexAtOrBelow(d: Float64Array, v: number): number {
  let lo = 0;
  let hi = d.length - 1;
  if (v < d[0]) return -1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (d[mid] <= v) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Position (local metres) of a distance on a lap, interpolated between the fixes around it. */
function positionAt(p: RefPath, dM: number): [number, number] | null {
  const i = lastIndexAtOrBelow(p.d, dM);
  if (i < 0 || i >= p.d.length - 1) {
    if (i === p.d.length - 1 && dM === p.d[i]) return [p.x[i], p.y[i]];
    return null;
  }
  const span = p.d[i + 1] - p.d[i];
  const u = span > 0 ? (dM - p.d[i]) / span : 0;
  return [p.x[i] + u * (p.x[i + 1] - p.x[i]), p.y[i] + u * (p.y[i + 1] - p.y[i])];
}

/** Distance on the reference path of the point nearest to (px, py), searched within ± SEARCH_WINDOW_M of `expectM`. */
function projectOnPath(ref: RefPath, px: number, py: number, expectM: number): number | null {
  let best = Infinity;
  let bestD: number | null = null;
  for (let i = 0; i < ref.d.length - 1; i++) {
    if (ref.d[i + 1] < expectM - SEARCH_WINDOW_M || ref.d[i] > expectM + SEARCH_WINDOW_M) continue;
    const ax = ref.x[i];
    const ay = ref.y[i];
    const bx = ref.x[i + 1] - ax;
    const by = ref.y[i + 1] - ay;
    const len2 = bx * bx + by * by;
    const u = len2 > 0 ? Math.min(1, Math.max(0, ((px - ax) * bx + (py - ay) * by) / len2)) : 0;
    const dist = Math.hypot(px - (ax + u * bx), py - (ay + u * by));
    if (dist < best) {
      best = dist;
      bestD = ref.d[i] + u * (ref.d[i + 1] - ref.d[i]);
    }
  }
  return best <= MAX_OFF_PATH_M ? bestD : null;
}

/**
 * A lap's braking points moved onto the reference lap's distance scale, so that braking at the
 * same place on the track reads as the same distance even when the two laps' lengths differ (a
 * wider line, GPS noise in the per-lap rescale): 0.3 % of a 3 km lap is 9 m at its end.
 *
 * Each onset, release and apex is placed on this lap's GPS path (interpolated between fixes at
 * its distance) and projected onto the reference lap's path (the nearest point on the polyline of
 * its fixes, searched near the distance the lap-length ratio predicts); the reference distance
 * there is the aligned distance. Without GPS on either lap, or where a point is farther than
 * 40 m from the reference path, the distance is scaled by the ratio of the two laps' lengths.
 */
export function alignToReference(points: readonly BrakingPoint[], lap: LapPath, reference: LapPath): BrakingPoint[] {
  const lapLen = lastFinite(lap.distanceM);
  const refLen = lastFinite(reference.distanceM);
  const ratio = lapLen > 0 && refLen > 0 ? refLen / lapLen : 1;
  let origin: { lat: number; lon: number } | null = null;
  if (reference.lat && reference.lon) {
    for (let i = 0; i < reference.lat.length; i++) {
      if (Number.isFinite(reference.lat[i]) && Number.isFinite(reference.lon[i])) {
        origin = { lat: reference.lat[i], lon: reference.lon[i] };
        break;
      }
    }
  }
  const proj = origin ? toLocalMetres(origin) : null;
  const refPath = proj ? fixesOf(reference, proj) : null;
  const lapPath = proj ? fixesOf(lap, proj) : null;
  const align = (dM: number | null): number | null => {
    if (dM === null || !Number.isFinite(dM)) return dM;
    const expect = dM * ratio;
    if (refPath && lapPath) {
      const at = positionAt(lapPath, dM);
      const onRef = at ? projectOnPath(refPath, at[0], at[1], expect) : null;
      if (onRef !== null) return onRef;
    }
    return expect;
  };
  return points.map((p) => {
    // onsetToApexM stays the lap's own braking distance: it is measured along this lap's path.
    return { ...p, onsetDistanceM: align(p.onsetDistanceM), releaseDistanceM: align(p.releaseDistanceM), apexDistanceM: align(p.apexDistanceM)! };
  });
}

function lastFinite(a: ArrayLike<number>): number {
  for (let i = a.length - 1; i >= 0; i--) if (Number.isFinite(a[i])) return a[i];
  return NaN;
}
