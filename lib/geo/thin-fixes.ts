import { validFix } from "@/lib/laps/extract-fixes";
import { toLocalMetres } from "./to-local-metres";

/**
 * The one way GPS positions are thinned for drawing and outlines: only usable fixes (validFix —
 * finite, in range, not the (0, 0) a receiver writes without a fix), each kept one at least
 * `spacingM` from the last kept one (local metres around the first), then at most `maxPoints`
 * by an even stride. [lat, lon] in travel order.
 */
export function thinFixes(latDeg: ArrayLike<number>, lonDeg: ArrayLike<number>, spacingM: number, maxPoints = Infinity): [number, number][] {
  const out: [number, number][] = [];
  let proj: ReturnType<typeof toLocalMetres> | null = null;
  let lx = 0;
  let ly = 0;
  const n = Math.min(latDeg.length, lonDeg.length);
  for (let i = 0; i < n; i++) {
    const la = latDeg[i] as number;
    const lo = lonDeg[i] as number;
    if (!validFix(la, lo)) continue;
    if (!proj) {
      proj = toLocalMetres({ lat: la, lon: lo });
      out.push([la, lo]);
      continue;
    }
    const px = proj.xM(lo);
    const py = proj.yM(la);
    if (Math.hypot(px - lx, py - ly) >= spacingM) {
      out.push([la, lo]);
      lx = px;
      ly = py;
    }
  }
  const stride = Math.ceil(out.length / Math.max(1, maxPoints));
  return stride > 1 ? out.filter((_, k) => k % stride === 0) : out;
}
