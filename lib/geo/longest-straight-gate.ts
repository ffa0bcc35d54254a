import { gateAcrossPath } from "./gate-across-path";
import { toLocalMetres } from "./to-local-metres";
import type { Gate, LatLon } from "./types";

export interface StraightGate {
  gate: Gate;
  /** Where the gate's centre is. */
  at: LatLon;
  /** Length of the straight it sits on, m. */
  straightM: number;
  /** Distance along the outline (from its first point) to the gate, m. */
  distanceM: number;
}

/**
 * A start/finish gate suggested in the middle of the longest straight of a lap outline
 * ([lat, lon] in travel order, closed, as lapOutline returns it). Start/finish lines usually sit
 * on the main straight (common practice), and a gate square to a straight is crossed cleanly even
 * with sparse GPS. A point counts as straight when the heading over ±`halfWindowM` turns less
 * than one radian per `minRadiusM` metres (radius above 500 m: flat-out kinks of 300 m radius are
 * corners here). The run may wrap past the outline's first point. Null when the outline is too
 * short or has no straight of at least `minStraightM`.
 */
export function longestStraightGate(
  outline: readonly (readonly [number, number])[],
  { minRadiusM = 500, halfWindowM = 30, minStraightM = 60, widthM = 30 }: { minRadiusM?: number; halfWindowM?: number; minStraightM?: number; widthM?: number } = {},
): StraightGate | null {
  if (outline.length < 10) return null;
  const proj = toLocalMetres({ lat: outline[0][0], lon: outline[0][1] });
  // Drop the closing point: the outline is treated as a loop.
  const closed = Math.hypot(proj.xM(outline[outline.length - 1][1]), proj.yM(outline[outline.length - 1][0])) < 1;
  const pts = closed ? outline.slice(0, -1) : outline;
  const n = pts.length;
  const x = pts.map((p) => proj.xM(p[1]));
  const y = pts.map((p) => proj.yM(p[0]));
  // Cumulative distance around the loop.
  const s = new Float64Array(n + 1);
  for (let i = 1; i <= n; i++) s[i] = s[i - 1] + Math.hypot(x[i % n] - x[i - 1], y[i % n] - y[i - 1]);
  const lapM = s[n];
  if (!(lapM > 4 * halfWindowM)) return null;
  // Index at distance d around the loop (wrapping).
  const at = (d: number): number => {
    const w = ((d % lapM) + lapM) % lapM;
    let lo = 0;
    let hi = n;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (s[mid] <= w) lo = mid;
      else hi = mid;
    }
    return lo % n;
  };
  const heading = (i: number, j: number) => Math.atan2(y[j] - y[i], x[j] - x[i]);
  const straight = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const b0 = at(s[i] - halfWindowM);
    const b1 = i;
    const f0 = i;
    const f1 = at(s[i] + halfWindowM);
    if (b0 === b1 || f0 === f1) continue;
    let turn = heading(f0, f1) - heading(b0, b1);
    turn = Math.atan2(Math.sin(turn), Math.cos(turn));
    // The two half-chords' headings are ~halfWindowM apart along the path.
    straight[i] = Math.abs(turn) / halfWindowM < 1 / minRadiusM ? 1 : 0;
  }
  if (straight.every((v) => v === 1)) return null; // not a circuit: a line or a noise-free oval of huge radius
  // Longest run of straight points around the loop: start just after a non-straight point.
  const start = straight.findIndex((v) => v === 0);
  let best = { from: -1, lengthM: 0 };
  let runFrom = -1;
  for (let k = 1; k <= n; k++) {
    const i = (start + k) % n;
    if (straight[i] && runFrom < 0) runFrom = start + k;
    if ((!straight[i] || k === n) && runFrom >= 0) {
      const endK = straight[i] ? start + k : start + k - 1;
      const fromD = s[runFrom % n] + (runFrom >= n ? lapM : 0);
      const endD = s[endK % n] + (endK >= n ? lapM : 0);
      const len = endD - fromD;
      if (len > best.lengthM) best = { from: fromD, lengthM: len };
      runFrom = -1;
    }
  }
  if (best.lengthM < minStraightM) return null;
  const midD = best.from + best.lengthM / 2;
  const i = at(midD);
  // The next point at least a few metres on (10 Hz fixes on a straight are ~8 m apart: never the same point).
  let j = at(s[i] + Math.max(5, Math.min(20, best.lengthM / 4)));
  if (j === i) j = (i + 1) % n;
  const p: LatLon = { lat: pts[i][0], lon: pts[i][1] };
  const q: LatLon = { lat: pts[j][0], lon: pts[j][1] };
  return { gate: gateAcrossPath(p, q, widthM), at: p, straightM: Math.round(best.lengthM), distanceM: ((midD % lapM) + lapM) % lapM };
}
