/** Where two segments meet: parameters along each, 0 at the first end point and 1 at the second. */
export interface SegmentHit {
  /** Fraction along segment P (p0 → p1), 0..1. */
  u: number;
  /** Fraction along segment Q (q0 → q1), 0..1. */
  v: number;
  /** +1 when P passes from the left of q0→q1 to its right, −1 for right to left. */
  direction: 1 | -1;
}

/**
 * z component of (b − a) × (p − a): positive when p lies left of the directed line a→b
 * (x east, y north), negative right of it, zero on it. Units: m² for inputs in metres.
 */
export function sideOfLine(ax: number, ay: number, bx: number, by: number, px: number, py: number): number {
  return (bx - ax) * (py - ay) - (by - ay) * (px - ax);
}

/**
 * Intersection of segment P = p0→p1 with segment Q = q0→q1 in a plane (any consistent unit).
 * Returns null when they do not cross (parallel, collinear, or the crossing lies outside either
 * segment). Allocates only on a hit, so a scan over thousands of fixes stays cheap.
 *
 * u comes from the signed distances of p0 and p1 to the line through Q: u = d0 / (d0 − d1), which
 * is the interpolation fraction of the gate-crossing arithmetic (2.000 m before, 3.556 m after →
 * u = 2 / 5.556). Ends touching the other segment count (closed intervals); a point exactly on Q's
 * line counts on the right side, so a path that touches the line and turns back is not a crossing.
 */
export function segmentIntersection(
  p0x: number, p0y: number, p1x: number, p1y: number,
  q0x: number, q0y: number, q1x: number, q1y: number,
): SegmentHit | null {
  const d0 = sideOfLine(q0x, q0y, q1x, q1y, p0x, p0y);
  const d1 = sideOfLine(q0x, q0y, q1x, q1y, p1x, p1y);
  // Both strictly on one side, or p0 on the line (counted as the right side) with p1 right of it.
  if ((d0 > 0 && d1 > 0) || (d0 <= 0 && d1 <= 0)) return null;
  const u = d0 / (d0 - d1);
  // Where along Q: project the crossing point onto Q.
  const qx = q1x - q0x;
  const qy = q1y - q0y;
  const qLen2 = qx * qx + qy * qy;
  if (qLen2 === 0) return null;
  const cx = p0x + u * (p1x - p0x);
  const cy = p0y + u * (p1y - p0y);
  const v = ((cx - q0x) * qx + (cy - q0y) * qy) / qLen2;
  if (v < 0 || v > 1) return null;
  return { u, v, direction: d0 > 0 ? 1 : -1 };
}
