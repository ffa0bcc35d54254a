import { toLocalMetres } from "./to-local-metres";
import { thinFixes } from "./thin-fixes";

export interface LapOutlineOptions {
  /** Keep a point only when it is this far from the last kept one (m): thins 25 Hz fixes. */
  spacingM?: number;
  /** A loop shorter than this is not a lap (m): stops a wobble in the pit box counting. */
  minLapM?: number;
  /** The path must come back within this distance of its start (m): about a track's width. */
  closeM?: number;
}

/**
 * One lap of a recorded GPS trace as the track outline, [lat, lon] in travel order, closed
 * (first point repeated at the end). The trace of a session runs several laps, pit passes and
 * standstills; we try starts spread over the session, follow each until the path comes back
 * past it, and keep the loop of median length, so an odd lap (pit lane, cut chicane) is not
 * the one chosen. Null when no loop closes (a drive from A to B, or too few fixes).
 */
export function lapOutline(
  latDeg: ArrayLike<number>,
  lonDeg: ArrayLike<number>,
  { spacingM = 3, minLapM = 400, closeM = 20 }: LapOutlineOptions = {},
): [number, number][] | null {
  const pts = thinFixes(latDeg, lonDeg, spacingM);
  if (pts.length < 20) return null;
  const proj = toLocalMetres({ lat: pts[0][0], lon: pts[0][1] });
  const x = pts.map((p) => proj.xM(p[1]));
  const y = pts.map((p) => proj.yM(p[0]));
  const loops: { from: number; to: number; lengthM: number }[] = [];
  for (const f of [0.2, 0.35, 0.5, 0.65, 0.8]) {
    const from = Math.floor(f * (pts.length - 1));
    const loop = closeFrom(x, y, from, minLapM, closeM);
    if (loop) loops.push({ from, ...loop });
  }
  if (loops.length === 0) return null;
  loops.sort((a, b) => a.lengthM - b.lengthM);
  const pick = loops[Math.floor((loops.length - 1) / 2)];
  const out = pts.slice(pick.from, pick.to + 1);
  out.push([out[0][0], out[0][1]]);
  return out;
}

function closeFrom(x: number[], y: number[], from: number, minLapM: number, closeM: number): { to: number; lengthM: number } | null {
  let run = 0;
  let best = -1;
  let bestD = Infinity;
  for (let i = from + 1; i < x.length; i++) {
    run += Math.hypot(x[i] - x[i - 1], y[i] - y[i - 1]);
    if (run < minLapM) continue;
    const d = Math.hypot(x[i] - x[from], y[i] - y[from]);
    if (d <= closeM && d < bestD) {
      best = i;
      bestD = d;
    } else if (best >= 0 && d > closeM) {
      // Left the start's neighbourhood again: the closest pass is the end of the lap.
      return { to: best - 1 > from ? best - 1 : best, lengthM: run };
    }
  }
  return best >= 0 ? { to: best, lengthM: run } : null;
}
