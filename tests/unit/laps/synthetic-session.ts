/**
 * A synthetic session on an invented oval, with ground truth computed from the path itself
 * (not from the code under test): positions are analytic, speed is constant within each route
 * piece, so the time at any arc length is exact, and gate crossings are found by bisection on
 * the analytic x(s) — no segment intersection involved.
 *
 * Local frame, metres, x east, y north; origin at an invented point in the open Atlantic.
 * Oval: main straight y = −R from x = −500 to 500 (ridden east), semicircles of radius R,
 * back straight y = +R ridden west. Start/finish gate at x = 0 across the main straight.
 * Pit lane parallel to the main straight at y = −R + 25, outside the start/finish gate.
 */
import { toLocalMetres } from "@/lib/geo/to-local-metres";
import type { Gate } from "@/lib/geo/types";
import type { TrackGates } from "@/lib/laps/types";
import { at } from "../../fixtures/at";

export const ORIGIN = { lat: 44.5, lon: -30.0 };
export const proj = toLocalMetres(ORIGIN);
export const R = 100;
export const LOOP_M = 2000 + 2 * Math.PI * R;
const PIT_Y = -R + 25;

/** Loop position at loop arc length sigma (wraps). */
function loopXY(sigma: number): [number, number] {
  const s = ((sigma % LOOP_M) + LOOP_M) % LOOP_M;
  if (s < 500) return [s, -R];
  if (s < 500 + Math.PI * R) {
    const th = -Math.PI / 2 + (s - 500) / R;
    return [500 + R * Math.cos(th), R * Math.sin(th)];
  }
  if (s < 1500 + Math.PI * R) return [500 - (s - 500 - Math.PI * R), R];
  if (s < 1500 + 2 * Math.PI * R) {
    const th = Math.PI / 2 + (s - 1500 - Math.PI * R) / R;
    return [-500 + R * Math.cos(th), R * Math.sin(th)];
  }
  return [-500 + (s - 1500 - 2 * Math.PI * R), -R];
}

export interface Piece {
  lengthM: number;
  speedMps: number;
  at(s: number): [number, number];
}

export function loop(fromSigma: number, toSigma: number, speedMps: number): Piece {
  return { lengthM: toSigma - fromSigma, speedMps, at: (s) => loopXY(fromSigma + s) };
}
export function line(x0: number, y0: number, x1: number, y1: number, speedMps: number): Piece {
  const len = Math.hypot(x1 - x0, y1 - y0);
  return { lengthM: len, speedMps, at: (s) => [x0 + ((x1 - x0) * s) / len, y0 + ((y1 - y0) * s) / len] };
}

/** Gate across a vertical line x = gx from y0 to y1; `east` = riding east crosses it forward. */
export function verticalGate(gx: number, y0: number, y1: number, east: boolean): Gate {
  // Forward = from left of a→b to right: riding east needs a south (rider's right), b north.
  const south = proj.toLatLon(gx, Math.min(y0, y1));
  const north = proj.toLatLon(gx, Math.max(y0, y1));
  return east ? { a: south, b: north } : { a: north, b: south };
}

export const GATES = {
  startFinish: verticalGate(0, -R - 15, -R + 15, true),
  sector1: verticalGate(0, R - 15, R + 15, false), // back straight, ridden west
  sector2: verticalGate(-250, -R - 15, -R + 15, true), // main straight before the line
  pitEntry: verticalGate(-300, PIT_Y - 8, PIT_Y + 8, true),
  pitExit: verticalGate(250, PIT_Y - 8, PIT_Y + 8, true),
};
export const TRACK: TrackGates = {
  startFinish: GATES.startFinish,
  sectors: [GATES.sector1, GATES.sector2],
  pitEntry: GATES.pitEntry,
  pitExit: GATES.pitExit,
};

/** Route pieces for: out of the pits, `lapSpeeds.length` laps (one with a pit pass), into the pits. */
export function buildRoute(lapSpeedsMs: number[], pitPassLap = -1): Piece[] {
  const pit = 16; // m/s in the pit lane
  const r: Piece[] = [line(-200, PIT_Y, 300, PIT_Y, pit), line(300, PIT_Y, 400, -R, pit)];
  // Each lap piece runs from loop σ = 400 (x = 400 on the main straight) once round.
  lapSpeedsMs.forEach((v, i) => {
    if (i === pitPassLap) {
      r.push(loop(400, LOOP_M - 450, v), line(-450, -R, -350, PIT_Y, pit), line(-350, PIT_Y, 300, PIT_Y, pit));
      r.push(line(300, PIT_Y, 400, -R, pit));
    } else {
      r.push(loop(400, LOOP_M + 400, v));
    }
  });
  // In: once more past the line, then into the pit lane and stop at the box.
  const vIn = 30;
  r.push(loop(400, LOOP_M + LOOP_M - 450, vIn), line(-450, -R, -350, PIT_Y, pit), line(-350, PIT_Y, -100, PIT_Y, pit));
  return r;
}

/** Time at which the route reaches arc length sRoute (exact: constant speed per piece). */
export function routeTime(route: Piece[], sRoute: number): number {
  let t = 0;
  let s = sRoute;
  for (const p of route) {
    if (s <= p.lengthM) return t + s / p.speedMps;
    s -= p.lengthM;
    t += p.lengthM / p.speedMps;
  }
  return t;
}

export function routePosition(route: Piece[], sRoute: number): [number, number] {
  let s = sRoute;
  for (const p of route) {
    if (s <= p.lengthM) return p.at(s);
    s -= p.lengthM;
  }
  const last = at(route, route.length - 1);
  return last.at(last.lengthM);
}

export function routeLength(route: Piece[]): number {
  return route.reduce((a, p) => a + p.lengthM, 0);
}

/** Route arc length at time t (inverse of routeTime). */
export function routeS(route: Piece[], t: number): number {
  let s0 = 0;
  let t0 = 0;
  for (const p of route) {
    const dt = p.lengthM / p.speedMps;
    if (t <= t0 + dt) return s0 + (t - t0) * p.speedMps;
    s0 += p.lengthM;
    t0 += dt;
  }
  return s0;
}

/**
 * Ground-truth forward crossing times of a vertical gate x = gx, y in [y0, y1]: scan the route
 * every 0.5 m for x(s) passing gx in the gate's direction, refine s by bisection to 1e-9 m.
 */
export function truthCrossings(route: Piece[], gx: number, y0: number, y1: number, east: boolean): number[] {
  const out: number[] = [];
  const L = routeLength(route);
  const f = (s: number) => (routePosition(route, s)[0] - gx) * (east ? 1 : -1);
  const step = 0.5;
  for (let s = 0; s + step <= L; s += step) {
    if (f(s) < 0 && f(s + step) >= 0) {
      let lo = s;
      let hi = s + step;
      for (let k = 0; k < 60; k++) {
        const mid = (lo + hi) / 2;
        if (f(mid) < 0) lo = mid;
        else hi = mid;
      }
      const y = routePosition(route, hi)[1];
      if (y >= Math.min(y0, y1) && y <= Math.max(y0, y1)) out.push(routeTime(route, hi));
    }
  }
  return out;
}

export interface SyntheticSeries {
  timeS: Float64Array;
  channels: {
    gps_lat: Float64Array;
    gps_lon: Float64Array;
    gps_speed: Float64Array;
    speed_front: Float64Array;
  };
}

/**
 * Master clock at `clockHz`, GPS fixes every `gpsEvery` samples (NaN between), front wheel speed
 * at every sample multiplied by `wheelScale` (a wrong rolling circumference). Clock starts at
 * `phaseS` so fixes do not line up with piece boundaries.
 */
export function sampleSeries(route: Piece[], clockHz: number, gpsEvery: number, wheelScale = 1, phaseS = 0.0137): SyntheticSeries {
  const tEnd = routeTime(route, routeLength(route));
  const n = Math.floor((tEnd - phaseS) * clockHz) + 1;
  const timeS = new Float64Array(n);
  const lat = new Float64Array(n).fill(NaN);
  const lon = new Float64Array(n).fill(NaN);
  const spd = new Float64Array(n).fill(NaN);
  const wheel = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = phaseS + i / clockHz;
    timeS[i] = t;
    const s = routeS(route, t);
    // Speed of the piece the bike is on at time t.
    let acc = 0;
    let v = at(route, route.length - 1).speedMps;
    for (const p of route) {
      if (s <= acc + p.lengthM) {
        v = p.speedMps;
        break;
      }
      acc += p.lengthM;
    }
    wheel[i] = v * wheelScale;
    if (i % gpsEvery === 0) {
      const [x, y] = routePosition(route, s);
      const ll = proj.toLatLon(x, y);
      lat[i] = ll.lat;
      lon[i] = ll.lon;
      spd[i] = v;
    }
  }
  return { timeS, channels: { gps_lat: lat, gps_lon: lon, gps_speed: spd, speed_front: wheel } };
}
