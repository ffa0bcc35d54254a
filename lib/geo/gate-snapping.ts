/**
 * Geometry of the gate editor: the outline in local metres, snapping a click to the path, distance
 * along the lap, and gate shapes for drawing. Plain functions (no React, no database); they run in
 * the browser.
 */
import { toLocalMetres, type LocalProjection } from "./to-local-metres";
import { gateAcrossPath } from "./gate-across-path";
import type { Gate } from "./types";

export interface Path {
  x: Float64Array;
  y: Float64Array;
  /** Cumulative distance (m). */
  d: Float64Array;
}

export function toPath(proj: LocalProjection, pts: readonly (readonly [number, number])[]): Path {
  const n = pts.length;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const d = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = proj.xM(pts[i][1]);
    y[i] = proj.yM(pts[i][0]);
    if (i > 0) d[i] = d[i - 1] + Math.hypot(x[i] - x[i - 1], y[i] - y[i - 1]);
  }
  return { x, y, d };
}

export interface Snap {
  /** Segment index (i → i+1). */
  i: number;
  x: number;
  y: number;
  /** Unit heading of the segment. */
  hx: number;
  hy: number;
  /** Distance along the path (m). */
  along: number;
  /** Distance from the query point (m). */
  off: number;
}

/** Nearest point on the path to (px, py). */
export function snapToPath(p: Path, px: number, py: number): Snap | null {
  let best: Snap | null = null;
  for (let i = 0; i + 1 < p.x.length; i++) {
    const ax = p.x[i], ay = p.y[i];
    const dx = p.x[i + 1] - ax, dy = p.y[i + 1] - ay;
    const len2 = dx * dx + dy * dy;
    if (len2 === 0) continue;
    const t = Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / len2));
    const x = ax + t * dx, y = ay + t * dy;
    const off = Math.hypot(px - x, py - y);
    if (!best || off < best.off) {
      const len = Math.sqrt(len2);
      best = { i, x, y, hx: dx / len, hy: dy / len, along: p.d[i] + t * len, off };
    }
  }
  return best;
}

/** Point on the path at a distance along it (m), wrapping round a closed lap. */
export function pointAt(p: Path, along: number): { x: number; y: number } | null {
  const n = p.x.length;
  if (n < 2) return null;
  const L = p.d[n - 1];
  const s = L > 0 ? ((along % L) + L) % L : 0;
  let lo = 0, hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (p.d[mid] <= s) lo = mid;
    else hi = mid;
  }
  const seg = p.d[hi] - p.d[lo];
  const t = seg > 0 ? (s - p.d[lo]) / seg : 0;
  return { x: p.x[lo] + t * (p.x[hi] - p.x[lo]), y: p.y[lo] + t * (p.y[hi] - p.y[lo]) };
}

/** A gate across the path at a snapped point, square to the heading, forward along the path. */
export function gateAtSnap(proj: LocalProjection, s: Snap, widthM: number): Gate {
  const at = proj.toLatLon(s.x, s.y);
  const next = proj.toLatLon(s.x + 5 * s.hx, s.y + 5 * s.hy);
  return gateAcrossPath(at, next, widthM);
}

export interface GateShape {
  ax: number; ay: number; bx: number; by: number;
  cx: number; cy: number;
  /** Unit direction of forward travel across the gate (left of a→b to right). */
  tx: number; ty: number;
}

export function gateShape(proj: LocalProjection, g: Gate): GateShape {
  const ax = proj.xM(g.a.lon), ay = proj.yM(g.a.lat);
  const bx = proj.xM(g.b.lon), by = proj.yM(g.b.lat);
  const dx = bx - ax, dy = by - ay;
  const len = Math.hypot(dx, dy) || 1;
  // Right-hand normal of a→b: the forward crossing goes from its left to its right (lib/geo/types.ts).
  return { ax, ay, bx, by, cx: (ax + bx) / 2, cy: (ay + by) / 2, tx: dy / len, ty: -dx / len };
}

export function flipGate(g: Gate): Gate {
  return { a: g.b, b: g.a };
}

export function projectionFor(pts: readonly (readonly [number, number])[]): LocalProjection {
  const o = pts[0] ?? [0, 0];
  return toLocalMetres({ lat: o[0], lon: o[1] });
}
