import { gateAcrossPath } from "./gate-across-path";
import { toLocalMetres } from "./to-local-metres";
import type { Gate, LatLon } from "./types";

/**
 * A start/finish gate where a lap beacon fired: the beacon's rising edges (0 → 1) while moving,
 * each placed at the GPS position recorded nearest in time, and the gate put at the pulse
 * position nearest the median of them all (so one stray pulse in the pit lane does not move it),
 * square to the direction of travel there. Series share one clock (`timeS`); GPS fixes may be
 * sparse (NaN between fixes). Null without at least two pulses with a position nearby.
 */
export function beaconGate(
  timeS: ArrayLike<number>,
  beacon: ArrayLike<number>,
  latDeg: ArrayLike<number>,
  lonDeg: ArrayLike<number>,
  { maxFixGapS = 0.5, widthM = 30 }: { maxFixGapS?: number; widthM?: number } = {},
): { gate: Gate; at: LatLon; pulses: number } | null {
  const n = Math.min(timeS.length, beacon.length, latDeg.length, lonDeg.length);
  const fix = (k: number) => Number.isFinite(latDeg[k]) && Number.isFinite(lonDeg[k]) && !(latDeg[k] === 0 && lonDeg[k] === 0);
  const pulses: { i: number; j: number }[] = [];
  let prev = 0;
  for (let k = 0; k < n; k++) {
    const b = beacon[k];
    if (!Number.isFinite(b)) continue;
    const high = b >= 0.5;
    if (high && !(prev >= 0.5)) {
      // Nearest fix in time, then the next fix at least 3 m further on for the heading.
      let best = -1;
      let bestDt = Infinity;
      for (let c = k; c >= 0 && timeS[k] - timeS[c] <= maxFixGapS; c--) {
        if (fix(c)) {
          best = c;
          bestDt = timeS[k] - timeS[c];
          break;
        }
      }
      for (let c = k + 1; c < n && timeS[c] - timeS[k] <= maxFixGapS; c++) {
        if (fix(c)) {
          if (timeS[c] - timeS[k] < bestDt) best = c;
          break;
        }
      }
      if (best >= 0) {
        const proj = toLocalMetres({ lat: latDeg[best], lon: lonDeg[best] });
        for (let c = best + 1; c < n && timeS[c] - timeS[best] < 5; c++) {
          if (fix(c) && Math.hypot(proj.xM(lonDeg[c]), proj.yM(latDeg[c])) >= 3) {
            pulses.push({ i: best, j: c });
            break;
          }
        }
      }
    }
    prev = b;
  }
  if (pulses.length < 2) return null;
  const med = (xs: number[]) => {
    const a = [...xs].sort((p, q) => p - q);
    const h = a.length >> 1;
    return a.length % 2 ? a[h] : (a[h - 1] + a[h]) / 2;
  };
  const mLat = med(pulses.map((p) => latDeg[p.i]));
  const mLon = med(pulses.map((p) => lonDeg[p.i]));
  const proj = toLocalMetres({ lat: mLat, lon: mLon });
  const pick = pulses.reduce((a, b) => (Math.hypot(proj.xM(lonDeg[b.i]), proj.yM(latDeg[b.i])) < Math.hypot(proj.xM(lonDeg[a.i]), proj.yM(latDeg[a.i])) ? b : a));
  const at = { lat: latDeg[pick.i], lon: lonDeg[pick.i] };
  return { gate: gateAcrossPath(at, { lat: latDeg[pick.j], lon: lonDeg[pick.j] }, widthM), at, pulses: pulses.length };
}
