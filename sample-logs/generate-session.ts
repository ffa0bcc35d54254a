/**
 * Builds one invented riding session on the demo circuit: pit-box start, out-lap, flying laps,
 * in-lap into the pit lane, stop. Returns columnar samples (SI units, NaN = no sample) plus the
 * ground truth taken from the model's continuous path, for tests and for checking the app.
 */
import type { ChannelRole } from "@/lib/channels/roles";
import { CIRCUIT, TRACK_LENGTH_M, pitPointAt, trackPointAt, toLatLon } from "./circuit";
import {
  BIKE,
  G,
  GearSelector,
  engineRpm,
  forkTravelTargetMm,
  frontBrakeBar,
  leanAngleDeg,
  overallRatio,
  rearSlip,
  shockTravelTargetMm,
  speedProfile,
  throttleFromDemand,
} from "./bike-model";
import { gaussian, rngStream, type Rng } from "./prng";
import { DEMO_ROSTER } from "./demo-roster";

export interface RiderProfile {
  name: string;
  /** Cornering grip the rider uses, in g (lean = atan of this at the limit). */
  lateralG: number;
  brakingG: number;
  /** Front brake pressure per g of brake deceleration, bar. */
  brakeGainBarPerG: number;
  /** Rear brake pressure as a share of the front. */
  rearBrakeShare: number;
  /** Lap-to-lap scatter: 1 = normal; larger = less consistent. */
  scatter: number;
}

/** Invented riders. */
export const RIDERS: Record<"a" | "b", RiderProfile> = {
  a: { name: DEMO_ROSTER.riders.a.name, lateralG: 1.27, brakingG: 1.17, brakeGainBarPerG: 10.5, rearBrakeShare: 0.12, scatter: 1 },
  b: { name: DEMO_ROSTER.riders.b.name, lateralG: 1.21, brakingG: 1.1, brakeGainBarPerG: 10.0, rearBrakeShare: 0.2, scatter: 1.6 },
};

export interface SessionOptions {
  seed: number;
  flyingLaps: number;
  sampleRateHz: number;
  /** Must divide the sample rate so each fix falls on a row. */
  gpsRateHz: number;
  gpsNoiseM: number;
  rider: RiderProfile;
  /** ISO 8601 start of the log. */
  startedAt: string;
  /** Flying laps (1-based) with brake pressure planted on the main straight. */
  brakeOnStraightLaps: number[];
  brakeOnStraightPeakBar: number;
  /** Flying lap with one rev-ceiling touch, or null. */
  revCeilingLap: number | null;
  /** Pit-lane overspeed on the in-lap or out-lap, or none. */
  pitOverspeed: "in" | "out" | null;
  pitOverspeedKmh: number;
  /** Add tyre, coolant, lambda, accelerations and filler channels (40 channels in all). */
  extendedChannels: boolean;
  team: string;
  bike: string;
  sessionKind: "practice" | "qualifying" | "race" | "test";
}

export const DEFAULT_OPTIONS: SessionOptions = {
  seed: 7,
  flyingLaps: 3,
  sampleRateHz: 100,
  gpsRateHz: 20,
  gpsNoiseM: 0.3,
  rider: RIDERS.a,
  startedAt: "2031-05-17T10:02:00.000Z",
  brakeOnStraightLaps: [2],
  brakeOnStraightPeakBar: 4.5,
  revCeilingLap: 3,
  pitOverspeed: "in",
  pitOverspeedKmh: 72,
  extendedChannels: false,
  team: DEMO_ROSTER.team.name,
  bike: DEMO_ROSTER.bikes.a.name,
  sessionKind: "practice",
};

export interface ChannelColumn {
  /** Plain English name as written in the header. */
  name: string;
  role: ChannelRole;
  /** Unit of `data` (SI, as lib/channels/roles.ts). */
  siUnit: string;
  /** Unit written to files, with the factor and offset from SI: file = si·scale + offset. */
  fileUnit: string;
  scale: number;
  offset: number;
  decimals: number;
  /** Float64 for latitude/longitude: Float32 steps are ≈0.4 m at these magnitudes. */
  data: Float32Array | Float64Array;
}

export interface CornerTruth {
  name: string;
  apexDistanceM: number;
  /** When the bike passes the apex (model path). */
  apexS: number;
  minSpeedMps: number;
  /** Where front brake pressure first reaches the onset threshold before this corner. */
  brakeOnsetDistanceM: number | null;
  brakeOnsetS: number | null;
}

export interface LapTruth {
  number: number;
  kind: "out" | "flying" | "in";
  flags: { outLap: boolean; inLap: boolean };
  startS: number;
  endS: number;
  lapTimeMs: number;
  /** Three sectors, flying laps only. */
  sectorTimesMs: number[] | null;
  distanceM: number;
  topSpeedMps: number;
  corners: CornerTruth[];
}

export type EventKind = "brake_on_straight" | "rev_ceiling" | "pit_overspeed";

export interface EventTruth {
  kind: EventKind;
  lap: number;
  startS: number;
  endS: number;
  measured: { value: number; unit: string };
  limit: { value: number; unit: string };
  /** Track distance from the start/finish line at the start of the event. */
  trackDistanceM: number;
  rule: string;
}

export interface SessionTruth {
  schema: "lapbench-sample-truth/1";
  seed: number;
  sampleRateHz: number;
  gpsRateHz: number;
  trackLengthM: number;
  pitLaneLimitMps: number;
  revCeilingRpm: number;
  brakeOnsetThresholdBar: number;
  movingFromS: number;
  stoppedAtS: number;
  laps: LapTruth[];
  gateCrossings: { gate: string; timeS: number; lap: number }[];
  pitLane: { lap: number; fromS: number; toS: number }[];
  events: EventTruth[];
}

export interface SessionMetadata {
  team: string;
  rider: string;
  bike: string;
  track: string;
  sessionKind: string;
  startedAt: string;
  generator: string;
  seed: number;
}

export interface GeneratedSession {
  metadata: SessionMetadata;
  timeS: Float64Array;
  channels: ChannelColumn[];
  truth: SessionTruth;
}

const KMH = 1 / 3.6;
const BRAKE_ONSET_BAR = 2;
const STATION_STEP_M = 0.5;
const IDLE_BEFORE_S = 4;
const IDLE_AFTER_S = 5;
const PIT_TARGET_KMH = 56; // riders use the pit limiter a little under the 60 km/h limit

interface LapVariation {
  grip: number[];
  brake: number[];
  spinPeak: number[];
}

/** Session path: stations in "unwrapped track distance" u; u = k·L is the k-th start/finish line. */
interface SessionPath {
  u: Float64Array;
  x: Float64Array;
  y: Float64Array;
  kappa: Float64Array;
  ds: Float64Array;
  dist: Float64Array;
  inPit: Uint8Array;
  limitZone: Uint8Array;
  lap: Int16Array;
  corner: Int16Array;
}

function wrapS(s: number): number {
  return ((s % TRACK_LENGTH_M) + TRACK_LENGTH_M) % TRACK_LENGTH_M;
}

function nearestCorner(s: number): number {
  let best = 0;
  let bestD = Infinity;
  CIRCUIT.corners.forEach((c, i) => {
    const d = Math.abs(wrapS(s - c.apexDistanceM + TRACK_LENGTH_M / 2) - TRACK_LENGTH_M / 2);
    if (d < bestD) {
      bestD = d;
      best = i;
    }
  });
  return best;
}

function buildPath(n: number): SessionPath & { uStart: number; uEnd: number } {
  const L = TRACK_LENGTH_M;
  const pit = CIRCUIT.pitLane;
  const uStart = pit.boxDistanceM - L;
  const uEnd = (n + 1) * L + pit.boxDistanceM;
  const count = Math.ceil((uEnd - uStart) / STATION_STEP_M) + 1;
  const step = (uEnd - uStart) / (count - 1);
  const p: SessionPath = {
    u: new Float64Array(count),
    x: new Float64Array(count),
    y: new Float64Array(count),
    kappa: new Float64Array(count),
    ds: new Float64Array(count - 1),
    dist: new Float64Array(count),
    inPit: new Uint8Array(count),
    limitZone: new Uint8Array(count),
    lap: new Int16Array(count),
    corner: new Int16Array(count),
  };
  const inLapBranchU = (n + 1) * L + pit.branchDistanceM;
  for (let i = 0; i < count; i++) {
    const u = uStart + i * step;
    const s = wrapS(u);
    const pitMode = u < pit.mergeDistanceM || u > inLapBranchU;
    const q = pitMode ? pitPointAt(s) : trackPointAt(s);
    p.u[i] = u;
    p.x[i] = q.x;
    p.y[i] = q.y;
    p.inPit[i] = pitMode ? 1 : 0;
    p.limitZone[i] = u <= pit.exitGateDistanceM || u >= (n + 1) * L + pit.entryGateDistanceM ? 1 : 0;
    p.lap[i] = u < L ? 0 : Math.min(n + 1, Math.floor(u / L));
    p.corner[i] = nearestCorner(s);
    if (!pitMode) p.kappa[i] = trackPointAt(s).kappa;
  }
  for (let i = 0; i < count - 1; i++) {
    p.ds[i] = Math.hypot(p.x[i + 1] - p.x[i], p.y[i + 1] - p.y[i]);
    p.dist[i + 1] = p.dist[i] + p.ds[i];
  }
  // Pit-lane curvature from the points: circle through neighbours 2 m either side.
  const k = 4;
  for (let i = 0; i < count; i++) {
    if (!p.inPit[i]) continue;
    const a = Math.max(0, i - k);
    const c = Math.min(count - 1, i + k);
    if (c - a < 2) continue;
    const ax = p.x[i] - p.x[a], ay = p.y[i] - p.y[a];
    const bx = p.x[c] - p.x[i], by = p.y[c] - p.y[i];
    const cross = ax * by - ay * bx;
    const la = Math.hypot(ax, ay), lb = Math.hypot(bx, by), lc = Math.hypot(p.x[c] - p.x[a], p.y[c] - p.y[a]);
    p.kappa[i] = la * lb * lc > 1e-9 ? (2 * cross) / (la * lb * lc) : 0;
  }
  return { ...p, uStart, uEnd };
}

function lapVariations(opts: SessionOptions, rng: Rng): LapVariation[] {
  const out: LapVariation[] = [];
  const sc = opts.rider.scatter;
  for (let lap = 0; lap <= opts.flyingLaps + 1; lap++) {
    const v: LapVariation = { grip: [], brake: [], spinPeak: [] };
    for (let c = 0; c < CIRCUIT.corners.length; c++) {
      v.grip.push(1 - 0.03 * sc * rng());
      v.brake.push(1 - 0.07 * sc * rng());
      v.spinPeak.push(0.05 + 0.055 * rng());
    }
    out.push(v);
  }
  return out;
}

/** Elevation noise, GPS noise: first-order (AR(1)) so fixes wander slowly as receivers do. */
class Ar1 {
  value = 0;
  constructor(private sigma: number, private rho: number, private rng: Rng) {
    this.value = sigma * gaussian(rng);
  }
  next(): number {
    this.value = this.rho * this.value + this.sigma * Math.sqrt(1 - this.rho * this.rho) * gaussian(this.rng);
    return this.value;
  }
}

/** Road bumps as a function of track position, so they repeat in the same place every lap. */
function bumpMm(s: number): number {
  return 1.4 * Math.sin((2 * Math.PI * s) / 7.3) + 0.9 * Math.sin((2 * Math.PI * s) / 12.9 + 1) + 1.6 * Math.sin((2 * Math.PI * s) / 31.7 + 2);
}

export function generateSession(partial: Partial<SessionOptions> = {}): GeneratedSession {
  const opts: SessionOptions = { ...DEFAULT_OPTIONS, ...partial };
  const fs = opts.sampleRateHz;
  const gpsEvery = fs / opts.gpsRateHz;
  if (!Number.isInteger(gpsEvery) || gpsEvery < 1) throw new Error(`GPS rate ${opts.gpsRateHz} Hz must divide the sample rate ${fs} Hz`);
  const L = TRACK_LENGTH_M;
  const N = opts.flyingLaps;
  const rider = opts.rider;

  // ---- path and speed profile ----------------------------------------------------------------
  const path = buildPath(N);
  const n = path.u.length;
  const variation = lapVariations(opts, rngStream(opts.seed, "laps"));
  const lapScale = (lap: number) =>
    lap === 0 ? { grip: 0.82, brake: 0.75, power: 0.75 } : lap === N + 1 ? { grip: 0.8, brake: 0.7, power: 0.6 } : { grip: 1, brake: 1, power: 1 };
  // Top gear at a safe margin under the shift rpm, allowing straight-line drive slip.
  const vTopMps = ((13_650 / overallRatio(6) / 60) * BIKE.rearCircumferenceM) / 1.02;
  const overspeedLap = opts.pitOverspeed === "in" ? N + 1 : opts.pitOverspeed === "out" ? 0 : -1;
  const aLatMax = new Float64Array(n);
  const aBrakeMax = new Float64Array(n);
  const aDriveMax = new Float64Array(n);
  const powerW = new Float64Array(n);
  const vCapMps = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const lap = path.lap[i];
    const sc = lapScale(lap);
    const c = path.corner[i];
    const vr = variation[lap];
    aLatMax[i] = rider.lateralG * G * sc.grip * vr.grip[c];
    aBrakeMax[i] = rider.brakingG * G * sc.brake * vr.brake[c];
    powerW[i] = BIKE.rearWheelPowerW * sc.power;
    aDriveMax[i] = path.inPit[i] ? 0.3 * G : BIKE.wheelieLimitG * G;
    vCapMps[i] = vTopMps;
    if (path.limitZone[i]) {
      vCapMps[i] = PIT_TARGET_KMH * KMH;
      const u = path.u[i];
      const planted =
        lap === overspeedLap &&
        (lap === 0 ? u > path.uStart + 60 : u < path.uEnd - 140);
      if (planted) vCapMps[i] = opts.pitOverspeedKmh * KMH;
    }
  }
  const v = speedProfile({ dsM: path.ds, kappa: path.kappa, aLatMax, aBrakeMax, aDriveMax, powerW, vCapMps, v0Ms: 0, vEndMps: 0 });

  // Time along the path (trapezoid on speed).
  const tPath = new Float64Array(n);
  tPath[0] = IDLE_BEFORE_S;
  for (let i = 0; i < n - 1; i++) tPath[i + 1] = tPath[i] + path.ds[i] / Math.max((v[i] + v[i + 1]) / 2, 1e-3);
  const aSeg = new Float64Array(n);
  for (let i = 0; i < n - 1; i++) aSeg[i] = (v[i + 1] * v[i + 1] - v[i] * v[i]) / (2 * path.ds[i]);
  aSeg[n - 1] = aSeg[n - 2];
  const timeAtU = (u: number): number => {
    let lo = 0, hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (path.u[mid] <= u) lo = mid;
      else hi = mid;
    }
    const f = (u - path.u[lo]) / (path.u[hi] - path.u[lo]);
    // Within a 0.5 m step speed is near constant; interpolate time on distance.
    return tPath[lo] + f * (tPath[hi] - tPath[lo]);
  };

  // ---- sampling --------------------------------------------------------------------------------
  const durationS = tPath[n - 1] + IDLE_AFTER_S;
  const ns = Math.floor(durationS * fs) + 1;
  const timeS = new Float64Array(ns);
  const sU = new Float64Array(ns);
  const sV = new Float64Array(ns);
  const sA = new Float64Array(ns);
  const sK = new Float64Array(ns);
  const sX = new Float64Array(ns);
  const sY = new Float64Array(ns);
  const sIdx = new Int32Array(ns);
  let seg = 0;
  for (let j = 0; j < ns; j++) {
    const t = j / fs;
    timeS[j] = t;
    while (seg < n - 2 && tPath[seg + 1] <= t) seg++;
    const f = Math.min(1, Math.max(0, (t - tPath[seg]) / (tPath[seg + 1] - tPath[seg])));
    sIdx[j] = seg;
    sU[j] = path.u[seg] + f * (path.u[seg + 1] - path.u[seg]);
    sV[j] = t < tPath[0] || t > tPath[n - 1] ? 0 : v[seg] + f * (v[seg + 1] - v[seg]);
    sA[j] = t < tPath[0] || t > tPath[n - 1] ? 0 : aSeg[seg];
    sK[j] = path.kappa[seg] + f * (path.kappa[seg + 1] - path.kappa[seg]);
    sX[j] = path.x[seg] + f * (path.x[seg + 1] - path.x[seg]);
    sY[j] = path.y[seg] + f * (path.y[seg + 1] - path.y[seg]);
  }

  // Raw driver inputs from the longitudinal acceleration the profile asks for.
  const rawThrottle = new Float64Array(ns);
  const rawBrake = new Float64Array(ns);
  for (let j = 0; j < ns; j++) {
    if (sV[j] <= 0) continue;
    rawThrottle[j] = throttleFromDemand(sA[j], sV[j], powerW[sIdx[j]]);
    rawBrake[j] = frontBrakeBar(sA[j], sV[j], rider.brakeGainBarPerG);
  }
  // The rider rolls off 0.12 s before the brake comes on.
  const lookahead = Math.round(0.12 * fs);
  let nextBrake = Infinity;
  for (let j = ns - 1; j >= 0; j--) {
    if (rawBrake[j] > 0.3) nextBrake = j;
    if (nextBrake - j <= lookahead) rawThrottle[j] = 0;
  }
  const dt = 1 / fs;
  const lag = (tau: number) => 1 - Math.exp(-dt / tau);
  const throttle = new Float32Array(ns);
  const brakeF = new Float32Array(ns);
  const brakeR = new Float32Array(ns);
  let thr = 0, brk = 0;
  for (let j = 0; j < ns; j++) {
    thr += (rawThrottle[j] - thr) * lag(0.05);
    brk += (rawBrake[j] - brk) * lag(0.06);
    const b = brk < 0.15 ? 0 : brk; // sensor deadband
    throttle[j] = b > 0.3 ? Math.min(thr, 2) : thr;
    brakeF[j] = b;
    brakeR[j] = b > 1 ? b * rider.rearBrakeShare : 0;
  }

  // Planted: brake pressure on the main straight with the throttle open.
  const noise = rngStream(opts.seed, "noise");
  const plantedBrake: { lap: number; t0: number; t1: number }[] = [];
  for (const lap of opts.brakeOnStraightLaps) {
    if (lap < 1 || lap > N) continue;
    const t0 = timeAtU(lap * L + L - 330);
    const dur = 1.4;
    const peak = opts.brakeOnStraightPeakBar * (0.95 + 0.1 * noise());
    for (let j = Math.ceil(t0 * fs); j <= Math.floor((t0 + dur) * fs); j++) {
      const ph = (timeS[j] - t0) / dur;
      brakeF[j] = Math.max(brakeF[j], peak * Math.sin(Math.PI * ph) ** 2);
    }
    plantedBrake.push({ lap, t0, t1: t0 + dur });
  }

  // Lean, wheel speeds, gear, rpm, suspension.
  const lean = new Float32Array(ns);
  const front = new Float32Array(ns);
  const rear = new Float32Array(ns);
  const gear = new Float32Array(ns);
  const rpm = new Float32Array(ns);
  const fork = new Float32Array(ns);
  const shock = new Float32Array(ns);
  const selector = new GearSelector();
  const mainStraightFromS = L - 420;
  let revState: "wait" | "hold" | "done" = opts.revCeilingLap ? "wait" : "done";
  let aboveS = 0;
  let peakSeen = 0;
  let forkMm = BIKE.forkSagMm, shockMm = BIKE.shockSagMm;
  for (let j = 0; j < ns; j++) {
    const vj = sV[j];
    const lapJ = path.lap[sIdx[j]];
    const s = wrapS(sU[j]);
    const leanDeg = leanAngleDeg(vj, sK[j]);
    lean[j] = leanDeg;
    const decelG = Math.max(0, -sA[j]) / G;
    const moving = vj > 0.05;
    const spinPeak = variation[lapJ].spinPeak[path.corner[sIdx[j]]] * lapScale(lapJ).power;
    const slip = vj > 3 ? rearSlip({ throttlePct: throttle[j], leanDeg, decelG, spinPeak, timeS: timeS[j] }) : 0;
    const frontSlip = decelG > 0.2 ? -0.004 * decelG : 0;
    front[j] = moving ? Math.max(0, vj * (1 + frontSlip) + 0.02 * gaussian(noise)) : 0;
    rear[j] = moving ? Math.max(0, vj * (1 + slip) + 0.02 * gaussian(noise)) : 0;
    const driving = moving && brakeF[j] <= 0.3 && sA[j] > -1.5;
    let hold = false;
    if (revState === "wait" && lapJ === opts.revCeilingLap && s >= mainStraightFromS && selector.gear >= 3) {
      if (rear[j] > 0 && (rear[j] / BIKE.rearCircumferenceM) * 60 * overallRatio(selector.gear) >= BIKE.shiftRpm) revState = "hold";
    }
    if (revState === "hold") {
      const r = engineRpm(rear[j], selector.gear, throttle[j]);
      if (r > BIKE.revCeilingRpm) aboveS += dt;
      peakSeen = Math.max(peakSeen, r);
      if ((aboveS >= 0.3 && peakSeen >= 14_300) || !driving) revState = "done";
      else hold = true;
    }
    const g = moving ? selector.update(rear[j], driving, hold) : (selector.gear = 0);
    gear[j] = g;
    rpm[j] = g === 0 ? BIKE.idleRpm + 15 * gaussian(noise) : engineRpm(rear[j], g, throttle[j]);
    forkMm += (forkTravelTargetMm(sA[j], leanDeg) + (moving ? bumpMm(s) : 0) - forkMm) * lag(0.04);
    shockMm += (shockTravelTargetMm(sA[j], leanDeg) + (moving ? 0.6 * bumpMm(s + 1.4) : 0) - shockMm) * lag(0.05);
    fork[j] = Math.min(BIKE.forkStrokeMm - 6, Math.max(3, forkMm + 0.2 * gaussian(noise)));
    shock[j] = Math.min(BIKE.shockStrokeMm - 4, Math.max(2, shockMm + 0.15 * gaussian(noise)));
  }

  // GPS fixes: correlated position noise, speed noise, invented elevation.
  const gpsRng = rngStream(opts.seed, "gps");
  const rho = Math.exp(-1 / opts.gpsRateHz / 2); // ~2 s correlation time
  const nE = new Ar1(opts.gpsNoiseM, rho, gpsRng);
  const nN = new Ar1(opts.gpsNoiseM, rho, gpsRng);
  const nH = new Ar1(0.6, rho, gpsRng);
  const lat = new Float64Array(ns).fill(NaN);
  const lon = new Float64Array(ns).fill(NaN);
  const gpsSpeed = new Float32Array(ns).fill(NaN);
  const alt = new Float32Array(ns).fill(NaN);
  for (let j = 0; j < ns; j += gpsEvery) {
    const ll = toLatLon(sX[j] + nE.next(), sY[j] + nN.next());
    lat[j] = ll.lat;
    lon[j] = ll.lon;
    gpsSpeed[j] = Math.max(0, sV[j] + 0.08 * gaussian(gpsRng));
    alt[j] = CIRCUIT.elevationAt(wrapS(sU[j])) + nH.next();
  }

  const ch = (name: string, role: ChannelRole, siUnit: string, fileUnit: string, scale: number, decimals: number, data: Float32Array | Float64Array, offset = 0): ChannelColumn => ({
    name, role, siUnit, fileUnit, scale, offset, decimals, data,
  });
  const pa = new Float32Array(ns);
  const pr = new Float32Array(ns);
  const forkM = new Float32Array(ns);
  const shockM = new Float32Array(ns);
  for (let j = 0; j < ns; j++) {
    pa[j] = brakeF[j] * 1e5;
    pr[j] = brakeR[j] * 1e5;
    forkM[j] = fork[j] / 1000;
    shockM[j] = shock[j] / 1000;
  }
  const channels: ChannelColumn[] = [
    ch("Front wheel speed", "speed_front", "m/s", "km/h", 3.6, 1, front),
    ch("Rear wheel speed", "speed_rear", "m/s", "km/h", 3.6, 1, rear),
    ch("Engine speed", "engine_rpm", "rpm", "rpm", 1, 0, rpm),
    ch("Gear", "gear", "", "", 1, 0, gear),
    ch("Throttle", "throttle", "%", "%", 1, 1, throttle),
    ch("Front brake pressure", "brake_front", "Pa", "bar", 1e-5, 2, pa),
    ch("Rear brake pressure", "brake_rear", "Pa", "bar", 1e-5, 2, pr),
    ch("Fork travel", "fork_travel", "m", "mm", 1000, 1, forkM),
    ch("Shock travel", "shock_travel", "m", "mm", 1000, 1, shockM),
    ch("Lean angle", "lean_angle", "deg", "deg", 1, 1, lean),
    ch("GPS latitude", "gps_lat", "deg", "deg", 1, 7, lat),
    ch("GPS longitude", "gps_lon", "deg", "deg", 1, 7, lon),
    ch("GPS speed", "gps_speed", "m/s", "km/h", 3.6, 1, gpsSpeed),
    ch("GPS altitude", "gps_alt", "m", "m", 1, 1, alt),
  ];
  if (opts.extendedChannels) channels.push(...extendedChannels(opts, ns, fs, sV, sA, sK, throttle));

  const truth = buildTruth({
    opts, path, v, tPath, timeAtU, timeS, sU, brakeF, throttle, rpm, plantedBrake, overspeedLap,
  });

  return {
    metadata: {
      team: opts.team,
      rider: rider.name,
      bike: opts.bike,
      track: CIRCUIT.name,
      sessionKind: opts.sessionKind,
      startedAt: opts.startedAt,
      generator: "Lapbench sample-logs generator (invented data)",
      seed: opts.seed,
    },
    timeS,
    channels,
    truth,
  };
}

function extendedChannels(
  opts: SessionOptions, ns: number, fs: number, sV: Float64Array, sA: Float64Array, sK: Float64Array, throttle: Float32Array,
): ChannelColumn[] {
  const rng = rngStream(opts.seed, "extended");
  const tf = new Float32Array(ns), tr = new Float32Array(ns), water = new Float32Array(ns), lambda = new Float32Array(ns);
  const al = new Float32Array(ns), at = new Float32Array(ns);
  let tempF = 45, tempR = 50, tempW = 68, lam = 0.95;
  const dt = 1 / fs;
  for (let j = 0; j < ns; j++) {
    const v = sV[j];
    const work = Math.abs(sA[j]) + v * v * Math.abs(sK[j]); // tyre heating follows grip used
    // First-order heating toward a work-dependent temperature; tyre warmers start near 45 °C.
    tempF += ((62 + 3.2 * work) - tempF) * (dt / 60);
    tempR += ((70 + 3.6 * work + 0.1 * throttle[j]) - tempR) * (dt / 50);
    tempW += ((78 + 0.16 * throttle[j] + (v < 5 ? 12 : 0)) - tempW) * (dt / 90);
    const lamTarget = throttle[j] > 85 ? 0.88 : throttle[j] < 1 && v > 5 ? 1.6 : 0.98; // rich at full load, fuel cut on overrun
    lam += (lamTarget - lam) * (1 - Math.exp(-dt / 0.08));
    tf[j] = tempF + 0.2 * gaussian(rng);
    tr[j] = tempR + 0.2 * gaussian(rng);
    water[j] = tempW + 0.1 * gaussian(rng);
    lambda[j] = lam + 0.005 * gaussian(rng);
    al[j] = sA[j] + 0.15 * gaussian(rng);
    at[j] = v * v * sK[j] + 0.15 * gaussian(rng);
  }
  const cols: ChannelColumn[] = [
    { name: "Front tyre temperature", role: "tyre_temp_front", siUnit: "degC", fileUnit: "degC", scale: 1, offset: 0, decimals: 1, data: tf },
    { name: "Rear tyre temperature", role: "tyre_temp_rear", siUnit: "degC", fileUnit: "degC", scale: 1, offset: 0, decimals: 1, data: tr },
    { name: "Coolant temperature", role: "water_temp", siUnit: "degC", fileUnit: "degC", scale: 1, offset: 0, decimals: 1, data: water },
    { name: "Lambda", role: "lambda", siUnit: "", fileUnit: "", scale: 1, offset: 0, decimals: 3, data: lambda },
    { name: "Longitudinal acceleration", role: "accel_long", siUnit: "m/s2", fileUnit: "m/s2", scale: 1, offset: 0, decimals: 2, data: al },
    { name: "Lateral acceleration", role: "accel_lat", siUnit: "m/s2", fileUnit: "m/s2", scale: 1, offset: 0, decimals: 2, data: at },
  ];
  // Filler channels so benchmarks see a realistic column count.
  for (let k = 1; k <= 20; k++) {
    const d = new Float32Array(ns);
    let x = 2.5;
    for (let j = 0; j < ns; j++) {
      x = Math.min(5, Math.max(0, x + 0.01 * gaussian(rng)));
      d[j] = x;
    }
    cols.push({ name: `Aux ${k}`, role: "other", siUnit: "V", fileUnit: "V", scale: 1, offset: 0, decimals: 3, data: d });
  }
  return cols;
}

function runs(mask: (j: number) => boolean, from: number, to: number): [number, number][] {
  const out: [number, number][] = [];
  let start = -1;
  for (let j = from; j <= to; j++) {
    if (mask(j)) {
      if (start < 0) start = j;
    } else if (start >= 0) {
      out.push([start, j - 1]);
      start = -1;
    }
  }
  if (start >= 0) out.push([start, to]);
  return out;
}

function buildTruth(c: {
  opts: SessionOptions;
  path: ReturnType<typeof buildPath>;
  v: Float64Array;
  tPath: Float64Array;
  timeAtU: (u: number) => number;
  timeS: Float64Array;
  sU: Float64Array;
  brakeF: Float32Array;
  throttle: Float32Array;
  rpm: Float32Array;
  plantedBrake: { lap: number; t0: number; t1: number }[];
  overspeedLap: number;
}): SessionTruth {
  const { opts, path, v, tPath, timeAtU, timeS, sU, brakeF, throttle, rpm } = c;
  const L = TRACK_LENGTH_M;
  const N = opts.flyingLaps;
  const pit = CIRCUIT.pitLane;
  const [s1, s2] = CIRCUIT.sectorGateDistancesM;
  const fs = opts.sampleRateHz;
  const n = path.u.length;
  const ns = timeS.length;
  const distAtU = (u: number) => {
    const i = Math.min(n - 2, Math.max(0, Math.floor((u - path.u[0]) / (path.u[1] - path.u[0]))));
    const f = (u - path.u[i]) / (path.u[i + 1] - path.u[i]);
    return path.dist[i] + f * (path.dist[i + 1] - path.dist[i]);
  };
  const movingFromS = tPath[0];
  const stoppedAtS = tPath[n - 1];
  const sampleIndex = (t: number) => Math.min(ns - 1, Math.max(0, Math.round(t * fs)));
  const plantedWindows = c.plantedBrake.map((p) => [p.t0 - 0.05, p.t1 + 0.05]);

  const laps: LapTruth[] = [];
  for (let k = 0; k <= N + 1; k++) {
    const uFrom = k === 0 ? path.uStart : k * L;
    const uTo = k === N + 1 ? path.uEnd : (k + 1) * L;
    const startS = k === 0 ? 0 : timeAtU(uFrom);
    const endS = k === N + 1 ? stoppedAtS : timeAtU(uTo);
    let top = 0;
    for (let i = 0; i < n; i++) if (path.u[i] >= uFrom && path.u[i] <= uTo) top = Math.max(top, v[i]);
    const corners: CornerTruth[] = [];
    CIRCUIT.corners.forEach((corner, ci) => {
      const uApex = k * L + corner.apexDistanceM;
      if (uApex < uFrom || uApex > uTo) return;
      const apexIdx = Math.round((uApex - path.u[0]) / (path.u[1] - path.u[0]));
      if (path.inPit[apexIdx]) return; // this corner was passed in the pit lane
      let minV = Infinity;
      for (let i = 0; i < n; i++) if (path.u[i] >= uApex - 150 && path.u[i] <= uApex + 60) minV = Math.min(minV, v[i]);
      // Brake onset: search back from the apex to the previous corner's apex.
      const prev = CIRCUIT.corners[(ci + CIRCUIT.corners.length - 1) % CIRCUIT.corners.length];
      const uPrev = uApex - wrapS(corner.apexDistanceM - prev.apexDistanceM);
      const jFrom = sampleIndex(timeAtU(Math.max(uPrev, path.uStart)));
      const jTo = sampleIndex(timeAtU(uApex));
      let onsetS: number | null = null;
      let onsetU: number | null = null;
      for (let j = Math.max(1, jFrom); j <= jTo; j++) {
        const inPlanted = plantedWindows.some(([a, b]) => timeS[j] >= a && timeS[j] <= b);
        if (inPlanted) continue;
        if (brakeF[j] >= BRAKE_ONSET_BAR && brakeF[j - 1] < BRAKE_ONSET_BAR) {
          const f = (BRAKE_ONSET_BAR - brakeF[j - 1]) / (brakeF[j] - brakeF[j - 1]);
          onsetS = timeS[j - 1] + f / fs;
          onsetU = sU[j - 1] + f * (sU[j] - sU[j - 1]);
          break;
        }
      }
      corners.push({
        name: corner.name,
        apexDistanceM: corner.apexDistanceM,
        apexS: timeAtU(uApex),
        minSpeedMps: minV,
        brakeOnsetDistanceM: onsetU === null ? null : wrapS(onsetU),
        brakeOnsetS: onsetS,
      });
    });
    laps.push({
      number: k,
      kind: k === 0 ? "out" : k === N + 1 ? "in" : "flying",
      flags: { outLap: k === 0, inLap: k === N + 1 },
      startS,
      endS,
      lapTimeMs: (endS - startS) * 1000,
      sectorTimesMs:
        k === 0 || k === N + 1
          ? null
          : [
              (timeAtU(k * L + s1) - startS) * 1000,
              (timeAtU(k * L + s2) - timeAtU(k * L + s1)) * 1000,
              (endS - timeAtU(k * L + s2)) * 1000,
            ],
      distanceM: distAtU(uTo) - distAtU(uFrom),
      topSpeedMps: top,
      corners,
    });
  }

  const gateCrossings: SessionTruth["gateCrossings"] = [];
  const addGate = (gate: string, u: number) => {
    if (u < path.uStart || u > path.uEnd) return;
    const lap = u < L ? 0 : Math.min(N + 1, Math.floor(u / L));
    gateCrossings.push({ gate, timeS: timeAtU(u), lap });
  };
  addGate("pit_exit", pit.exitGateDistanceM);
  for (let k = 0; k <= N + 1; k++) {
    if (k >= 1) addGate("start_finish", k * L);
    if (k <= N) {
      addGate("sector_1", k * L + s1);
      addGate("sector_2", k * L + s2);
    }
  }
  addGate("pit_entry", (N + 1) * L + pit.entryGateDistanceM);
  gateCrossings.sort((a, b) => a.timeS - b.timeS);

  const pitLane = [
    { lap: 0, fromS: movingFromS, toS: timeAtU(pit.exitGateDistanceM) },
    { lap: N + 1, fromS: timeAtU((N + 1) * L + pit.entryGateDistanceM), toS: stoppedAtS },
  ];

  const events: EventTruth[] = [];
  for (const p of c.plantedBrake) {
    const r = runs((j) => brakeF[j] >= 1 && throttle[j] > 80, sampleIndex(p.t0), sampleIndex(p.t1));
    if (!r.length) continue;
    const a = r[0][0], b = r[r.length - 1][1];
    let peak = 0;
    for (let j = a; j <= b; j++) peak = Math.max(peak, brakeF[j]);
    events.push({
      kind: "brake_on_straight", lap: p.lap, startS: timeS[a], endS: timeS[b],
      measured: { value: Math.fround(peak * 1e5), unit: "Pa" }, limit: { value: 1e5, unit: "Pa" },
      trackDistanceM: wrapS(sU[a]),
      rule: "front brake pressure ≥ 1 bar while throttle > 80 %",
    });
  }
  for (const [a, b] of runs((j) => rpm[j] > BIKE.revCeilingRpm, 0, ns - 1)) {
    let peak = 0;
    for (let j = a; j <= b; j++) peak = Math.max(peak, rpm[j]);
    const lap = path.lap[Math.max(0, Math.min(n - 1, Math.round((sU[a] - path.u[0]) / (path.u[1] - path.u[0]))))];
    events.push({
      kind: "rev_ceiling", lap, startS: timeS[a], endS: timeS[b],
      measured: { value: peak, unit: "rpm" }, limit: { value: BIKE.revCeilingRpm, unit: "rpm" },
      trackDistanceM: wrapS(sU[a]),
      rule: "engine speed above the rev ceiling",
    });
  }
  // Pit overspeed from the continuous model path inside the speed-limit zone.
  const limit = pit.speedLimitMps;
  const zoneRuns = runs((i) => path.limitZone[i] === 1 && v[i] > limit, 0, n - 1);
  for (const [a, b] of zoneRuns) {
    let peak = 0;
    for (let i = a; i <= b; i++) peak = Math.max(peak, v[i]);
    // Interpolate the moments speed crosses the limit (or the gate, if already above there).
    const tA = a > 0 && path.limitZone[a - 1] && v[a - 1] <= limit ? tPath[a - 1] + ((limit - v[a - 1]) / (v[a] - v[a - 1])) * (tPath[a] - tPath[a - 1]) : tPath[a];
    const tB = b < n - 1 && v[b + 1] <= limit ? tPath[b] + ((v[b] - limit) / (v[b] - v[b + 1])) * (tPath[b + 1] - tPath[b]) : tPath[b];
    events.push({
      kind: "pit_overspeed", lap: path.lap[a], startS: tA, endS: tB,
      measured: { value: peak, unit: "m/s" }, limit: { value: limit, unit: "m/s" },
      trackDistanceM: wrapS(path.u[a]),
      rule: "ground speed above the pit-lane limit between the pit entry and pit exit gates",
    });
  }
  events.sort((x, y) => x.startS - y.startS);

  return {
    schema: "lapbench-sample-truth/1",
    seed: opts.seed,
    sampleRateHz: opts.sampleRateHz,
    gpsRateHz: opts.gpsRateHz,
    trackLengthM: L,
    pitLaneLimitMps: limit,
    revCeilingRpm: BIKE.revCeilingRpm,
    brakeOnsetThresholdBar: BRAKE_ONSET_BAR,
    movingFromS,
    stoppedAtS,
    laps,
    gateCrossings,
    pitLane,
    events,
  };
}
