/**
 * The invented demo circuit: "Pellorin Island Circuit", on an invented island in the mid-Atlantic
 * (no real land or circuit is there). The centreline is built from straights and constant-radius
 * corners joined by linear curvature ramps (clothoids), so curvature — and therefore the bike
 * model's lean angle — changes smoothly. Two straights take whatever length closes the loop.
 *
 * Local frame: metres, x east, y north, origin on the start/finish line. Travel is
 * anticlockwise (mostly left-hand corners). Curvature is positive for a left-hand bend.
 */

export interface LatLon {
  lat: number;
  lon: number;
}

export interface Gate {
  name: "start_finish" | "sector_1" | "sector_2" | "pit_entry" | "pit_exit";
  /** Right-hand end, looking in the direction of travel. */
  a: LatLon;
  /** Left-hand end. */
  b: LatLon;
  /** Distance from the start/finish line along the track centreline. */
  trackDistanceM: number;
  /** Compass bearing of travel across the gate, degrees clockwise from north. */
  travelBearingDeg: number;
  widthM: number;
}

export interface Corner {
  name: string;
  direction: "left" | "right";
  /** Distance of the apex (middle of the bend) from the start/finish line along the centreline. */
  apexDistanceM: number;
  radiusM: number;
  angleDeg: number;
  startDistanceM: number;
  endDistanceM: number;
}

type Piece =
  | { kind: "straight"; lengthM: number; closes?: 0 | 1 }
  | { kind: "corner"; name: string; angleDeg: number; radiusM: number };

// Layout, from the start/finish line. Angles: + left, − right; they sum to +360 (one loop).
const LAYOUT: Piece[] = [
  { kind: "straight", lengthM: 380 },
  { kind: "corner", name: "Turn 1", angleDeg: 90, radiusM: 60 },
  { kind: "straight", lengthM: 120 },
  { kind: "corner", name: "Turn 2", angleDeg: -35, radiusM: 260 },
  { kind: "straight", lengthM: 60 },
  { kind: "corner", name: "Turn 3", angleDeg: 65, radiusM: 200 },
  { kind: "straight", lengthM: 0, closes: 0 },
  { kind: "corner", name: "Turn 4", angleDeg: 60, radiusM: 90 },
  { kind: "straight", lengthM: 0, closes: 1 },
  { kind: "corner", name: "Turn 5", angleDeg: -90, radiusM: 45 },
  { kind: "straight", lengthM: 80 },
  { kind: "corner", name: "Turn 6", angleDeg: 160, radiusM: 20 },
  { kind: "straight", lengthM: 700 },
  { kind: "corner", name: "Turn 7", angleDeg: 50, radiusM: 300 },
  { kind: "straight", lengthM: 150 },
  { kind: "corner", name: "Turn 8", angleDeg: 60, radiusM: 75 },
  { kind: "straight", lengthM: 520 },
];

/** Nominal table resolution of the centreline (the actual step divides the lap length exactly). */
const NOMINAL_STEP_M = 0.5;

/**
 * Sphere radius for the local projection: the equatorial radius, the same sphere geolib's
 * getDistance uses, so distances measured with it on our lat/lon match the local metres.
 */
export const EARTH_RADIUS_M = 6378137;

const ORIGIN: LatLon = { lat: 46.0, lon: -35.0 };

interface Span {
  s0: number;
  len: number;
  k0: number;
  k1: number;
}

function rampLengthM(angleRad: number, radiusM: number): number {
  return Math.min(30, 0.4 * Math.abs(angleRad) * radiusM);
}

function buildSpans(closeLengths: [number, number]): { spans: Span[]; corners: Corner[] } {
  const spans: Span[] = [];
  const corners: Corner[] = [];
  let s = 0;
  for (const p of LAYOUT) {
    if (p.kind === "straight") {
      const len = p.closes === undefined ? p.lengthM : closeLengths[p.closes];
      if (len > 0) spans.push({ s0: s, len, k0: 0, k1: 0 });
      s += len;
      continue;
    }
    const angle = (p.angleDeg * Math.PI) / 180;
    const k = Math.sign(angle) / p.radiusM;
    const ramp = rampLengthM(angle, p.radiusM);
    // Heading change of ramp + flat + ramp = k·(flat + ramp), so flat = angle·R − ramp.
    const flat = Math.abs(angle) * p.radiusM - ramp;
    const start = s;
    spans.push({ s0: s, len: ramp, k0: 0, k1: k });
    s += ramp;
    spans.push({ s0: s, len: flat, k0: k, k1: k });
    s += flat;
    spans.push({ s0: s, len: ramp, k0: k, k1: 0 });
    s += ramp;
    corners.push({
      name: p.name,
      direction: angle > 0 ? "left" : "right",
      apexDistanceM: (start + s) / 2,
      radiusM: p.radiusM,
      angleDeg: Math.abs(p.angleDeg),
      startDistanceM: start,
      endDistanceM: s,
    });
  }
  return { spans, corners };
}

function kappaAt(spans: Span[], s: number): number {
  for (const sp of spans) {
    if (s <= sp.s0 + sp.len) return sp.k0 + ((sp.k1 - sp.k0) * (s - sp.s0)) / Math.max(sp.len, 1e-9);
  }
  return 0;
}

interface Table {
  lengthM: number;
  step: number;
  x: Float64Array;
  y: Float64Array;
  heading: Float64Array;
  kappa: Float64Array;
}

/** Integrates heading and position; fine sub-steps keep the closure error well under a centimetre. */
function integrate(spans: Span[], lengthM: number): Table & { ends: number[] } {
  const n = Math.round(lengthM / NOMINAL_STEP_M) + 1;
  const step = lengthM / (n - 1);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const heading = new Float64Array(n);
  const kappa = new Float64Array(n);
  const sub = 10;
  const h = step / sub;
  let px = 0;
  let py = 0;
  let th = 0;
  kappa[0] = kappaAt(spans, 0);
  for (let i = 1; i < n; i++) {
    for (let j = 0; j < sub; j++) {
      const sMid = (i - 1) * step + (j + 0.5) * h;
      const k = kappaAt(spans, sMid);
      const thMid = th + (k * h) / 2;
      px += h * Math.cos(thMid);
      py += h * Math.sin(thMid);
      th += k * h;
    }
    x[i] = px;
    y[i] = py;
    heading[i] = th;
    kappa[i] = kappaAt(spans, i * step);
  }
  return { lengthM, step, x, y, heading, kappa, ends: [px, py] };
}

function totalLength(spans: Span[]): number {
  const last = spans[spans.length - 1];
  return last.s0 + last.len;
}

function headingBeforeClosing(which: 0 | 1): number {
  let th = 0;
  for (const p of LAYOUT) {
    if (p.kind === "straight" && p.closes === which) return th;
    if (p.kind === "corner") th += (p.angleDeg * Math.PI) / 180;
  }
  throw new Error("closing straight missing");
}

function solveClosure(): { table: Table; corners: Corner[]; closeLengths: [number, number] } {
  // With both closing straights at zero length the loop ends at P0; the straights only translate
  // what follows them, so L0·u0 + L1·u1 = −P0 is linear in the two lengths.
  const probe = buildSpans([0, 0]);
  const t0 = integrate(probe.spans, totalLength(probe.spans));
  const [ex, ey] = t0.ends;
  const a0 = headingBeforeClosing(0);
  const a1 = headingBeforeClosing(1);
  const det = Math.cos(a0) * Math.sin(a1) - Math.sin(a0) * Math.cos(a1);
  const l0 = (-ex * Math.sin(a1) + ey * Math.cos(a1)) / det;
  const l1 = (-ey * Math.cos(a0) + ex * Math.sin(a0)) / det;
  if (!(l0 > 20 && l1 > 20)) throw new Error(`circuit layout does not close (${l0}, ${l1})`);
  const closeLengths: [number, number] = [l0, l1];
  const built = buildSpans(closeLengths);
  const len = totalLength(built.spans);
  const t = integrate(built.spans, len);
  return { table: t, corners: built.corners, closeLengths };
}

const SOLVED = solveClosure();
const TABLE = SOLVED.table;

export const TRACK_LENGTH_M = TABLE.lengthM;

function wrap(s: number): number {
  const L = TRACK_LENGTH_M;
  return ((s % L) + L) % L;
}

export interface LocalPoint {
  x: number;
  y: number;
  /** Direction of travel, radians anticlockwise from east. */
  heading: number;
  kappa: number;
}

/** Centreline point at a distance from the start/finish line (wraps around the lap). */
export function trackPointAt(sM: number): LocalPoint {
  const s = wrap(sM);
  const f = s / TABLE.step;
  const n = TABLE.x.length;
  const i = Math.min(Math.floor(f), n - 2);
  const u = f - i;
  // The table's last row is the loop's end (≈ the origin); its heading is 2π more than row 0.
  return {
    x: TABLE.x[i] + (TABLE.x[i + 1] - TABLE.x[i]) * u,
    y: TABLE.y[i] + (TABLE.y[i + 1] - TABLE.y[i]) * u,
    heading: TABLE.heading[i] + (TABLE.heading[i + 1] - TABLE.heading[i]) * u,
    kappa: TABLE.kappa[i] + (TABLE.kappa[i + 1] - TABLE.kappa[i]) * u,
  };
}

/** Gap between the loop's computed end and its start, metres (integration error only). */
export const CLOSURE_ERROR_M = Math.hypot(TABLE.x[TABLE.x.length - 1], TABLE.y[TABLE.y.length - 1]);

// ---- projection ------------------------------------------------------------------------------

const DEG = 180 / Math.PI;
const COS_LAT0 = Math.cos(ORIGIN.lat / DEG);

/**
 * Local metres → lat/lon by an equirectangular projection about the origin. Over a 2 km site the
 * scale error against the sphere is below 0.02 %, far under GPS noise.
 */
export function toLatLon(x: number, y: number): LatLon {
  return {
    lat: ORIGIN.lat + (y / EARTH_RADIUS_M) * DEG,
    lon: ORIGIN.lon + (x / (EARTH_RADIUS_M * COS_LAT0)) * DEG,
  };
}

export function toLocal(p: LatLon): { x: number; y: number } {
  return {
    x: ((p.lon - ORIGIN.lon) / DEG) * EARTH_RADIUS_M * COS_LAT0,
    y: ((p.lat - ORIGIN.lat) / DEG) * EARTH_RADIUS_M,
  };
}

// ---- pit lane --------------------------------------------------------------------------------

const T8 = SOLVED.corners.find((c) => c.name === "Turn 8")!;
const T1 = SOLVED.corners.find((c) => c.name === "Turn 1")!;

/** Pit lane runs on the inside (left) of the main straight, from before Turn 8 to after Turn 1. */
const PIT = {
  offsetM: 25,
  rampM: 70,
  branchS: T8.startDistanceM - 60,
  mergeS: T1.endDistanceM + 140,
  /** Where the team's pit box is: 100 m before the start/finish line, in the lane. */
  boxS: TRACK_LENGTH_M - 100,
};

/** Distance along the pit lane measured in track-distance units from the branch point. */
function pitProgress(sM: number): number {
  return wrap(sM - PIT.branchS);
}

const PIT_SPAN_M = wrap(PIT.mergeS - PIT.branchS);

export function isInPitRegion(sM: number): boolean {
  return pitProgress(sM) <= PIT_SPAN_M;
}

/** Sideways offset of the pit lane from the centreline (left positive): cosine ramps in and out. */
export function pitOffsetAt(sM: number): number {
  const p = pitProgress(sM);
  if (p > PIT_SPAN_M) return 0;
  const r = PIT.rampM;
  if (p < r) return (PIT.offsetM * (1 - Math.cos((Math.PI * p) / r))) / 2;
  if (p > PIT_SPAN_M - r) return (PIT.offsetM * (1 - Math.cos((Math.PI * (PIT_SPAN_M - p)) / r))) / 2;
  return PIT.offsetM;
}

/** Pit-lane point beside the centreline point at track distance s. */
export function pitPointAt(sM: number): { x: number; y: number } {
  const c = trackPointAt(sM);
  const d = pitOffsetAt(sM);
  return { x: c.x - d * Math.sin(c.heading), y: c.y + d * Math.cos(c.heading) };
}

// ---- gates -----------------------------------------------------------------------------------

function gateAt(name: Gate["name"], sM: number, lateralM: number, widthM: number): Gate {
  const c = trackPointAt(sM);
  const nx = -Math.sin(c.heading);
  const ny = Math.cos(c.heading);
  const cx = c.x + lateralM * nx;
  const cy = c.y + lateralM * ny;
  const h = widthM / 2;
  const bearing = ((90 - c.heading * DEG) % 360 + 360) % 360;
  return {
    name,
    a: toLatLon(cx - h * nx, cy - h * ny),
    b: toLatLon(cx + h * nx, cy + h * ny),
    trackDistanceM: wrap(sM),
    travelBearingDeg: bearing,
    widthM,
  };
}

const T3 = SOLVED.corners.find((c) => c.name === "Turn 3")!;
const T4 = SOLVED.corners.find((c) => c.name === "Turn 4")!;
const T6 = SOLVED.corners.find((c) => c.name === "Turn 6")!;
const T7 = SOLVED.corners.find((c) => c.name === "Turn 7")!;

const SECTOR_1_S = (T3.endDistanceM + T4.startDistanceM) / 2;
const SECTOR_2_S = (T6.endDistanceM + T7.startDistanceM) / 2;
const PIT_ENTRY_S = wrap(PIT.branchS + PIT.rampM + 10);
const PIT_EXIT_S = wrap(PIT.mergeS - PIT.rampM - 10);

/** Track gates 30 m wide; pit gates 20 m wide centred on the lane so they never reach the track. */
const GATES: Gate[] = [
  gateAt("start_finish", 0, 0, 30),
  gateAt("sector_1", SECTOR_1_S, 0, 30),
  gateAt("sector_2", SECTOR_2_S, 0, 30),
  gateAt("pit_entry", PIT_ENTRY_S, PIT.offsetM, 20),
  gateAt("pit_exit", PIT_EXIT_S, PIT.offsetM, 20),
];

function polylineLatLon(fromS: number, spanM: number, point: (s: number) => { x: number; y: number }, stepM: number): LatLon[] {
  const out: LatLon[] = [];
  for (let d = 0; d <= spanM + 1e-9; d += stepM) {
    const p = point(fromS + d);
    out.push(toLatLon(p.x, p.y));
  }
  return out;
}

export const CIRCUIT = {
  name: "Pellorin Island Circuit",
  note: "Invented circuit on an invented island; no real place, track or data.",
  origin: ORIGIN,
  lengthM: TRACK_LENGTH_M,
  direction: "anticlockwise" as const,
  /** Closed centreline every 5 m (first point repeated at the end). */
  centreline: polylineLatLon(0, TRACK_LENGTH_M, (s) => trackPointAt(s), 5).concat([toLatLon(0, 0)]),
  pitLane: {
    /** From the branch off the track before Turn 8 to the merge after Turn 1, every 5 m. */
    polyline: polylineLatLon(PIT.branchS, PIT_SPAN_M, pitPointAt, 5),
    speedLimitKmh: 60,
    speedLimitMps: 60 / 3.6,
    offsetM: PIT.offsetM,
    branchDistanceM: PIT.branchS,
    mergeDistanceM: PIT.mergeS,
    entryGateDistanceM: PIT_ENTRY_S,
    exitGateDistanceM: PIT_EXIT_S,
    boxDistanceM: PIT.boxS,
  },
  gates: GATES,
  sectorGateDistancesM: [SECTOR_1_S, SECTOR_2_S] as const,
  corners: SOLVED.corners,
  /** Invented elevation: the site rises and falls gently (metres above sea level). */
  elevationAt(sM: number): number {
    const u = (2 * Math.PI * wrap(sM)) / TRACK_LENGTH_M;
    return 34 + 6 * Math.sin(u) + 2.5 * Math.sin(3 * u + 1);
  },
};

export type Circuit = typeof CIRCUIT;
