import { toLocalMetres } from "@/lib/geo/to-local-metres";
import { extractFixes } from "./extract-fixes";
import { distanceWheel } from "./live-wheel-speed";
import { lowerBound } from "./lower-bound";
import type { Lap, NumericArray, SeriesLike } from "./types";

export interface DistanceChannel {
  /** Distance travelled since the start of the log at each master-clock sample, m. */
  distanceM: Float64Array;
  /** distanceM at each lap's start (same order as `laps`), so lap distance = distanceM − this. */
  lapStartDistanceM: Float64Array;
  /** Length of each lap, m (its GPS length when the wheel distance was rescaled to it). */
  lapLengthM: Float64Array;
  /** Per lap: GPS length ÷ integrated wheel distance (1 where not rescaled). */
  lapScale: Float64Array;
  source: "speed_front" | "speed_rear" | "gps" | "none";
  /**
   * Per lap: GPS length ÷ wheel distance where it was beyond MAX_RESCALE (then the wheel distance
   * is kept, as a GPS gap or a wrong circumference is likelier than the tyre); NaN elsewhere.
   */
  lapScaleRejected: Float64Array;
}

/** The largest per-lap rescale of wheel distance to GPS length believed: ±5 % (Lapbench default). */
export const MAX_RESCALE = 0.05;

/** Linear interpolation of y(t) at time t over ascending ts (binary search); clamps at the ends. */
function interpAt(ts: Float64Array, ys: Float64Array, t: number): number {
  const n = ts.length;
  if (n === 0) return NaN;
  if (t <= ts[0]!) return ys[0]!;
  if (t >= ts[n - 1]!) return ys[n - 1]!;
  const k = lowerBound(ts, t);
  const t0 = ts[k - 1]!;
  return ys[k - 1]! + ((ys[k]! - ys[k - 1]!) * (t - t0)) / (ts[k]! - t0);
}

/**
 * Cumulative trapezoid integral of speed (m/s) over time (s), m, at every sample. Between two
 * finite speed samples the speed is taken as linear (exact for the trapezoid rule), so samples in
 * between (a wheel channel slower than the clock, or a short dropout) get the partial area.
 * Before the first finite sample the distance is 0; after the last it stays constant.
 */
function integrateSpeed(timeS: Float64Array, speedMps: NumericArray): Float64Array {
  const n = timeS.length;
  const cum = new Float64Array(n);
  let j = -1; // last finite sample
  for (let i = 0; i < n; i++) {
    const v = speedMps[i]!;
    if (!Number.isFinite(v)) continue;
    if (j < 0) {
      j = i;
      continue; // cum[0..i] stay 0
    }
    const tj = timeS[j]!;
    const vj = speedMps[j]!;
    const dt = timeS[i]! - tj;
    for (let k = j + 1; k <= i; k++) {
      const tau = timeS[k]! - tj;
      const vk = vj + ((v - vj) * tau) / dt;
      cum[k] = cum[j]! + 0.5 * (vj + vk) * tau;
    }
    j = i;
  }
  for (let k = j + 1; k < n && j >= 0; k++) cum[k] = cum[j]!;
  return cum;
}

/**
 * Distance along the session.
 *
 * With a front wheel speed channel: the trapezoid integral of front wheel speed (the front wheel
 * is the ground reference; the rear spins under drive and skews distance), rescaled lap by lap so
 * each lap's length equals its GPS path length: this takes out the tyre's rolling-radius error
 * (wear, pressure, lean) while keeping the wheel's smooth short-range shape. Between laps and
 * where a lap has no usable GPS length the scale is 1.
 * Without wheel speed: the GPS path length (sum of straight lines between fixes in local metres,
 * toLocalMetres at the first fix), interpolated in time onto the master clock.
 * `laps` must be in time order and not overlap (as detectLaps returns them).
 */
export function distanceChannel(series: SeriesLike, laps: readonly Lap[]): DistanceChannel {
  const t = series.timeS;
  const n = t.length;
  const fixes = extractFixes(series);
  const nf = fixes.timeS.length;

  // GPS path length at each fix.
  const gpsCum = new Float64Array(nf);
  if (nf > 0) {
    const proj = toLocalMetres({ lat: fixes.latDeg[0]!, lon: fixes.lonDeg[0]! });
    let px = proj.xM(fixes.lonDeg[0]!);
    let py = proj.yM(fixes.latDeg[0]!);
    for (let i = 1; i < nf; i++) {
      const x = proj.xM(fixes.lonDeg[i]!);
      const y = proj.yM(fixes.latDeg[i]!);
      gpsCum[i] = gpsCum[i - 1]! + Math.hypot(x - px, y - py);
      px = x;
      py = y;
    }
  }
  const gpsAt = (time: number) => interpAt(fixes.timeS, gpsCum, time);

  // A dead front sensor (0 while the bike moves) is skipped: GPS, else the rear wheel, instead.
  const live = distanceWheel(series, nf > 1);
  const wheel = live?.speedMps;
  const nLaps = laps.length;
  const lapStartDistanceM = new Float64Array(nLaps);
  const lapLengthM = new Float64Array(nLaps);
  const lapScale = new Float64Array(nLaps).fill(1);
  const lapScaleRejected = new Float64Array(nLaps).fill(NaN);

  let hasWheel = false;
  if (wheel) for (let i = 0; i < n && !hasWheel; i++) hasWheel = Number.isFinite(wheel[i]);

  if (!hasWheel) {
    const distanceM = new Float64Array(n);
    if (nf === 0) return { distanceM, lapStartDistanceM, lapLengthM, lapScale, source: "none", lapScaleRejected };
    // Walk the fixes alongside the clock: both ascend, so no search per sample.
    let k = 0;
    for (let i = 0; i < n; i++) {
      const ti = t[i]!;
      while (k < nf && fixes.timeS[k]! < ti) k++;
      if (k === 0) distanceM[i] = 0;
      else if (k === nf) distanceM[i] = gpsCum[nf - 1]!;
      else {
        const t0 = fixes.timeS[k - 1]!;
        distanceM[i] = gpsCum[k - 1]! + ((gpsCum[k]! - gpsCum[k - 1]!) * (ti - t0)) / (fixes.timeS[k]! - t0);
      }
    }
    for (let l = 0; l < nLaps; l++) {
      lapStartDistanceM[l] = gpsAt(laps[l]!.startTimeS);
      lapLengthM[l] = gpsAt(laps[l]!.endTimeS) - lapStartDistanceM[l]!;
    }
    return { distanceM, lapStartDistanceM, lapLengthM, lapScale, source: "gps", lapScaleRejected };
  }

  const w = integrateSpeed(t, wheel!);
  // The wheel distance at every lap start and end, read before the loop below turns `w` into
  // the session distance in place (one session-length array fewer).
  const wheelStart = new Float64Array(nLaps);
  const wheelEnd = new Float64Array(nLaps);
  for (let l = 0; l < nLaps; l++) {
    wheelStart[l] = interpAt(t, w, laps[l]!.startTimeS);
    wheelEnd[l] = interpAt(t, w, laps[l]!.endTimeS);
  }
  for (let l = 0; l < nLaps; l++) {
    const wheelLen = wheelEnd[l]! - wheelStart[l]!;
    const gpsLen = nf > 1 ? gpsAt(laps[l]!.endTimeS) - gpsAt(laps[l]!.startTimeS) : NaN;
    // Rescale only when both lengths are real distances (a lap spent parked has neither).
    if (wheelLen > 1 && gpsLen > 1) {
      const ratio = gpsLen / wheelLen;
      if (Math.abs(ratio - 1) <= MAX_RESCALE) lapScale[l] = ratio;
      else lapScaleRejected[l] = ratio;
    }
    lapLengthM[l] = lapScale[l]! * wheelLen;
  }

  // Piecewise-linear map from wheel distance to session distance: anchor (time, wheel, distance)
  // moves at each lap start and end; the scale in force is the lap's, or 1 outside laps.
  let anchorW = 0;
  let anchorD = 0;
  let scale = 1;
  let lap = 0;
  let atStart = true; // next event is laps[lap].startTimeS, else its endTimeS
  for (let i = 0; i < n; i++) {
    const ti = t[i]!;
    while (lap < nLaps) {
      const ev = atStart ? laps[lap]!.startTimeS : laps[lap]!.endTimeS;
      if (ev > ti) break;
      const wt = atStart ? wheelStart[lap]! : wheelEnd[lap]!;
      anchorD += scale * (wt - anchorW);
      anchorW = wt;
      if (atStart) {
        scale = lapScale[lap]!;
        lapStartDistanceM[lap] = anchorD;
        atStart = false;
      } else {
        scale = 1;
        lap++;
        atStart = true;
      }
    }
    // In place: w[i] is read here for the last time.
    w[i] = anchorD + scale * (w[i]! - anchorW);
  }
  // Laps starting after the last sample (should not happen) still get an offset.
  for (; lap < nLaps; lap++) {
    if (atStart) lapStartDistanceM[lap] = anchorD + scale * (wheelStart[lap]! - anchorW);
    atStart = true;
  }
  return { distanceM: w, lapStartDistanceM, lapLengthM, lapScale, source: live!.role, lapScaleRejected };
}
