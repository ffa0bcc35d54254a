import "server-only";
/**
 * Compare's series: the asked-for laps (any visible sessions of the team) × channel roles, cut
 * from the stored chunks that cover each lap, put on one x grid (1 m of distance, or one sample
 * period of time), with the Running gap against the reference lap, the reference lap's path,
 * sector bands and the track's corners with each lap's entry, braking, minimum and exit, all
 * min/max-decimated to the pixel width when points outnumber pixels 4 to 1. A window (from, to)
 * asks for one stretch only, at full resolution before decimation (zooming in).
 *
 * Per-lap distance arrays (and the reference path) are cached in this process, keyed by the
 * lap's session, number, times and the session's analysis version: a repeated or zoomed request
 * skips reading wheel speed and GPS and integrating distance again.
 */
import { QueryTypes, type Sequelize } from "sequelize";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import { ROLE_LABEL, ROLE_SI_UNIT, type ChannelRole } from "@/lib/channels/roles";
import { distanceChannel } from "@/lib/laps/distance-channel";
import type { SeriesLike } from "@/lib/laps/types";
import { lowerBound } from "@/lib/laps/lower-bound";
import { resampleOnDistance } from "@/lib/compare/resample-on-distance";
import { gather, gridColumns, keptIndices, markMinMax, resampleDecimate } from "@/lib/compare/resample-decimate";
import { brakingPoints } from "@/lib/braking/braking-points";
import { findCorners } from "@/lib/braking/find-corners";
import { toLocalMetres } from "@/lib/geo/to-local-metres";
import type { SeriesArray } from "@/lib/series/binary";
import type { LapRef, LapSeriesCorner, LapSeriesMeta, LapSeriesPane, SeriesX } from "@/lib/series/lap-series-meta";
import { jsonColumn } from "./json-column";
import { listChannels, type ChannelInfo } from "./samples";
import { readLapWindow } from "./lap-window";
import { findLaps, toLibLap, type LapRow } from "./laps";

export interface LapSeriesRequest {
  laps: LapRef[];
  roles: ChannelRole[];
  x: SeriesX;
  /** Pixel width of the chart's plotting area. */
  width: number;
  /** Optional window on the x axis (SI), for zooming in. */
  from?: number;
  to?: number;
  /** When given, filled with the milliseconds of each stage (benchmarks): lookup, reads, compute. */
  stages?: Partial<Record<"lookup" | "reads" | "compute", number>>;
}

export interface LapSeriesResult {
  meta: LapSeriesMeta;
  arrays: SeriesArray[];
}

/**
 * What one request may cost. Grid points: a 1 m grid of a 10 km lap is 10,000; a time grid of a
 * 15-minute lap at 100 Hz is 90,000. Samples read: every channel of every lap window (a flying
 * lap of 90 s at 100 Hz × 13 channels is ≈ 120,000). Above either the answer is 413.
 */
export const SERIES_LIMITS = { maxGridPoints: 250_000, maxSamplesRead: 6_000_000 };

/** Most points the track outline gets (a 4 km lap at 1 m would be 4000; 1500 draws the same shape). */
const TRACK_POINTS = 1500;
/** Front pressure that counts as braking in the corner view: the Rider brief's threshold (5 bar). */
const BRAKE_THRESHOLD_PA = 5e5;

/** One lap cut from storage: samples strictly inside the lap plus exact points at its start and end. */
interface LapTrace {
  row: LapRow;
  /** Time since the lap start, s (first = 0, last = lap time). */
  tRel: Float64Array;
  /** Distance since the lap start, m, scaled to the reference length later. */
  dRel: Float64Array;
  lengthM: number;
  values: Map<string, Float64Array>;
  /** Cache key of this lap's distance. */
  key: string;
}

interface CachedDistance {
  tRel: Float64Array;
  dRel: Float64Array;
  lengthM: number;
  hasDistance: boolean;
}
interface CachedPath {
  /** Distance along the lap (m) of each outline point, and its east/north in local metres. */
  dM: Float64Array;
  east: Float32Array;
  north: Float32Array;
}

/** A small least-recently-used map. */
class Lru<V> {
  private map = new Map<string, V>();
  constructor(private readonly max: number) {}
  get(k: string): V | undefined {
    const v = this.map.get(k);
    if (v !== undefined) {
      this.map.delete(k);
      this.map.set(k, v);
    }
    return v;
  }
  set(k: string, v: V) {
    this.map.delete(k);
    this.map.set(k, v);
    if (this.map.size > this.max) this.map.delete(this.map.keys().next().value!);
  }
  clear() {
    this.map.clear();
  }
}

// ≈ 140 kB per 90 s lap at 100 Hz: 64 laps ≈ 9 MB.
const distanceCache = new Lru<CachedDistance>(64);
const pathCache = new Lru<CachedPath | null>(64);

/** Empty both caches (benchmarks measure the first request this way). */
export function clearLapSeriesCaches() {
  distanceCache.clear();
  pathCache.clear();
}

/** y at time t by linear interpolation between the samples either side (NaN if one is missing). */
function valueAt(ts: ArrayLike<number>, ys: ArrayLike<number>, t: number): number {
  const k = lowerBound(ts, t);
  if (k < ts.length && ts[k] === t) return ys[k];
  if (k === 0 || k >= ts.length) return NaN;
  const y0 = ys[k - 1];
  const y1 = ys[k];
  return y0 + ((y1 - y0) * (t - ts[k - 1])) / (ts[k] - ts[k - 1]);
}

/** y at one x over ascending xs (NaN-aware, as the grid resampling). */
function at(xs: ArrayLike<number>, ys: ArrayLike<number>, x: number): number {
  const out = new Float64Array(1);
  resampleDecimate([x], xs, ys, out);
  return out[0];
}

const DISTANCE_ROLES = ["speed_front", "gps_lat", "gps_lon"] as const;

async function lapTrace(sequelize: Sequelize, channels: ChannelInfo[], lap: LapRow, version: number, roles: readonly ChannelRole[], needDistance: boolean, withPath: boolean, useCache = true): Promise<LapTrace> {
  const key = `${lap.sessionId}:${lap.number}:${version}:${lap.startTimeS}:${lap.endTimeS}`;
  const cached = useCache ? distanceCache.get(key) : undefined;
  const read = [...new Set<string>([...roles, ...(cached ? [] : DISTANCE_ROLES), ...(withPath ? ["gps_lat", "gps_lon"] : [])])];
  const { timeS, data } = await readLapWindow(sequelize, channels, lap, read);
  const first = lowerBound(timeS, lap.startTimeS);
  let last = lowerBound(timeS, lap.endTimeS); // first sample at or after the end
  if (last < timeS.length && timeS[last] === lap.endTimeS) last++; // keep an exact end sample out: appended below
  const inner0 = first < timeS.length && timeS[first] === lap.startTimeS ? first + 1 : first;
  const n = Math.max(0, last - inner0) + 2;

  let dist = cached && cached.tRel.length === n ? cached : null;
  if (!dist) {
    // A cached entry that no longer fits the stored samples: read everything again.
    if (cached) return lapTrace(sequelize, channels, lap, version, roles, needDistance, withPath, false);
    const series: SeriesLike = { timeS, channels: {} };
    for (const r of DISTANCE_ROLES) {
      const v = data.get(r);
      if (v) series.channels[r] = v;
    }
    const dc = distanceChannel(series, [toLibLap(lap)]);
    const dStart = dc.lapStartDistanceM[0];
    const lengthM = dc.lapLengthM[0];
    const tRel = new Float64Array(n);
    const dRel = new Float64Array(n);
    for (let i = inner0, o = 1; i < last && o < n - 1; i++, o++) {
      tRel[o] = timeS[i] - lap.startTimeS;
      dRel[o] = Math.min(lengthM, Math.max(0, dc.distanceM[i] - dStart));
    }
    tRel[n - 1] = lap.endTimeS - lap.startTimeS;
    dRel[n - 1] = lengthM;
    dist = { tRel, dRel, lengthM, hasDistance: dc.source !== "none" };
    distanceCache.set(key, dist);
  }
  if (needDistance && !dist.hasDistance) throw new HttpError(422, `Lap ${lap.number} of session ${lap.sessionId} has neither wheel speed nor GPS, so it has no distance; compare it by time.`);
  const values = new Map<string, Float64Array>();
  for (const role of new Set<string>([...roles, ...(withPath ? ["gps_lat", "gps_lon"] : [])])) {
    const v = data.get(role);
    if (!v) continue;
    const out = new Float64Array(n);
    out[0] = valueAt(timeS, v, lap.startTimeS);
    for (let i = inner0, o = 1; i < last && o < n - 1; i++, o++) out[o] = v[i];
    out[n - 1] = valueAt(timeS, v, lap.endTimeS);
    values.set(role, out);
  }
  return { row: lap, tRel: dist.tRel, dRel: dist.dRel, lengthM: dist.lengthM, values, key };
}

/** First speed channel a lap has, for the corners. */
const SPEED_ROLES = ["speed_front", "speed_rear", "gps_speed"] as const;

export async function loadLapSeries(ctx: TeamContext, request: LapSeriesRequest, sequelize: Sequelize = getSequelize()): Promise<LapSeriesResult> {
  const { x, stages } = request;
  let stageStart = stages ? performance.now() : 0;
  const stage = (name: "lookup" | "reads" | "compute") => {
    if (!stages) return;
    const now = performance.now();
    stages[name] = now - stageStart;
    stageStart = now;
  };
  // The same lap twice is one lap: colours and the reference follow the first mention.
  const seen = new Set<string>();
  const refs = request.laps.filter((r) => {
    const k = `${r.sessionId}:${r.lap}`;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
  const roles = [...new Set(request.roles)];
  const width = Math.max(1, Math.floor(request.width));
  // The laps (with the visibility check) and each session's channel list in one round trip. The
  // channel lists are used only after every lap has passed that check; an unseen session's list
  // is dropped with the 404.
  const sessionIds = [...new Set(refs.map((r) => r.sessionId))];
  const [found, channelLists] = await Promise.all([findLaps(ctx, refs), Promise.all(sessionIds.map((id) => listChannels(sequelize, id)))]);
  stage("lookup");
  const rows = refs.map((r) => {
    const row = found.laps.get(`${r.sessionId}:${r.lap}`);
    // Missing, another team's, or a session this rider may not see: all the same 404.
    if (!row) throw new HttpError(404, `Lap ${r.lap} of session ${r.sessionId} was not found in your team.`);
    return row;
  });
  const channelsBySession = new Map<number, ChannelInfo[]>(sessionIds.map((id, i) => [id, channelLists[i]]));

  // What the request would read, before reading it.
  let samples = 0;
  for (const r of rows) {
    const chs = channelsBySession.get(r.sessionId)!;
    const time = chs.find((c) => c.role === "time");
    const rate = time?.rateHz ?? 1;
    const present = new Set(chs.filter((c) => (roles as string[]).includes(c.role) || (DISTANCE_ROLES as readonly string[]).includes(c.role)).map((c) => c.role)).size + 1;
    samples += Math.ceil((r.endTimeS - r.startTimeS + 2) * rate) * present;
  }
  if (samples > SERIES_LIMITS.maxSamplesRead)
    throw new HttpError(413, `These laps and channels would read about ${samples.toLocaleString("en")} samples; the limit is ${SERIES_LIMITS.maxSamplesRead.toLocaleString("en")}. Compare fewer laps or channels.`);
  const refRow = rows[0];
  const refTime = channelsBySession.get(refRow.sessionId)!.find((c) => c.role === "time");
  const step = x === "distance" ? 1 : 1 / (refTime?.rateHz ?? 100);
  const expectedGrid = x === "distance" ? (refRow.distanceM ?? 0) / step : Math.max(...rows.map((r) => r.endTimeS - r.startTimeS)) / step;
  if (expectedGrid > SERIES_LIMITS.maxGridPoints)
    throw new HttpError(413, `These laps would need ${Math.round(expectedGrid).toLocaleString("en")} grid points; the limit is ${SERIES_LIMITS.maxGridPoints.toLocaleString("en")}. Compare shorter laps, or by distance.`);

  const refSession = found.sessions.get(refRow.sessionId)!;
  const traceRoles = roles.filter((r) => r !== "gps_lat" && r !== "gps_lon");
  const trackQuery = refSession.trackId != null
    ? sequelize.query<{ corners: unknown }>("SELECT corners FROM tracks WHERE id = ? AND team_id = ?", { replacements: [refSession.trackId, ctx.teamId], type: QueryTypes.SELECT })
    : Promise.resolve([]);
  const refPathKey = (r: LapRow, v: number) => `${r.sessionId}:${r.number}:${v}:${r.startTimeS}:${r.endTimeS}`;
  const refVersion = refSession.analysisVersion ?? 0;
  const needPath = pathCache.get(refPathKey(refRow, refVersion)) === undefined;
  const [traces, trackRows] = await Promise.all([
    Promise.all(rows.map((r, i) => lapTrace(sequelize, channelsBySession.get(r.sessionId)!, r, found.sessions.get(r.sessionId)!.analysisVersion ?? 0, traceRoles, x === "distance", i === 0 && needPath))),
    trackQuery,
  ]);

  stage("reads");
  const ref = traces[0];
  const refLengthM = ref.lengthM;
  const scaled = traces.map((t) => {
    const s = t.lengthM > 0 ? refLengthM / t.lengthM : 1;
    const d = new Float64Array(t.dRel.length);
    for (let i = 0; i < d.length; i++) d[i] = t.dRel[i] * s;
    if (d.length) d[d.length - 1] = refLengthM; // exactly the line, whatever the rounding
    return { d, scale: s };
  });

  // The common grid: 1 m up to the reference length (plus the exact end), or one sample period
  // of the reference session up to the longest lap.
  let fullGrid: Float64Array;
  if (x === "distance") {
    const whole = Math.floor(refLengthM + 1e-9);
    const exact = refLengthM - whole > 1e-6;
    fullGrid = new Float64Array(whole + 1 + (exact ? 1 : 0));
    for (let g = 0; g <= whole; g++) fullGrid[g] = g;
    if (exact) fullGrid[fullGrid.length - 1] = refLengthM;
  } else {
    const longest = Math.max(...traces.map((t) => t.tRel[t.tRel.length - 1]));
    fullGrid = new Float64Array(Math.floor(longest / step + 1e-9) + 1);
    for (let g = 0; g < fullGrid.length; g++) fullGrid[g] = g * step;
  }
  if (fullGrid.length > SERIES_LIMITS.maxGridPoints)
    throw new HttpError(413, `These laps would need ${fullGrid.length.toLocaleString("en")} grid points; the limit is ${SERIES_LIMITS.maxGridPoints.toLocaleString("en")}. Compare shorter laps, or by distance.`);
  // The window: the grid points inside [from, to], at least two.
  let g0 = 0;
  let g1 = fullGrid.length;
  if (request.from != null && request.to != null) {
    g0 = Math.min(fullGrid.length - 1, lowerBound(fullGrid, request.from));
    g1 = Math.max(g0 + 2, lowerBound(fullGrid, request.to + 1e-9));
    g1 = Math.min(fullGrid.length, g1);
    g0 = Math.max(0, Math.min(g0, g1 - 2));
  }
  const grid = g0 === 0 && g1 === fullGrid.length ? fullGrid : fullGrid.subarray(g0, g1);
  const m = grid.length;
  const hasEnd = g1 === fullGrid.length;
  const cols = gridColumns(grid, width);
  const xsOf = (i: number) => (x === "distance" ? scaled[i].d : traces[i].tRel);

  const arrays: SeriesArray[] = [];
  const push = (a: SeriesArray) => arrays.push(a) - 1;
  let sharedGridIndex = -1;
  const xColumn = (idx: Uint32Array | null) => {
    if (idx) {
      const xs = new Float64Array(idx.length);
      for (let i = 0; i < idx.length; i++) xs[i] = grid[idx[i]];
      return push(xs);
    }
    if (sharedGridIndex < 0) sharedGridIndex = push(grid === fullGrid ? grid : grid.slice());
    return sharedGridIndex;
  };

  /** Resample every lap's column on the grid, marking the decimation's points; then gather. */
  const onePane = (perLap: (Float64Array | null)[], resample: boolean) => {
    const keep = cols ? new Uint8Array(m) : null;
    const full = perLap.map((v, i) => {
      if (!v) return null;
      const out = resample ? resampleDecimate(grid, xsOf(i), v, new Float64Array(m), cols, keep) : v;
      if (resample && x === "distance" && hasEnd) out[m - 1] = v[v.length - 1];
      if (!resample && keep && cols) markMinMax(v, cols, keep);
      return out;
    });
    const idx = keep ? keptIndices(keep) : null;
    return { x: xColumn(idx), series: full.map((y) => (y ? push(gather(y, idx)) : null)), decimated: idx != null, full };
  };

  const panes: LapSeriesPane[] = [];
  const missing: string[] = [];
  const fullByRole = new Map<string, (Float64Array | null)[]>();
  for (const role of roles) {
    if (role === "gps_lat" || role === "gps_lon") continue; // shown as the track outline
    const perLap = traces.map((t) => t.values.get(role) ?? null);
    if (perLap.every((v) => v == null)) {
      missing.push(role);
      continue;
    }
    const p = onePane(perLap, true);
    fullByRole.set(role, p.full);
    panes.push({ role, label: ROLE_LABEL[role], unit: ROLE_SI_UNIT[role], x: p.x, series: p.series, decimated: p.decimated });
  }

  // Each lap's time at every grid distance (distance x), resampled once per lap.
  const timeAtGrid: (Float64Array | undefined)[] = [];
  const timeOnGrid = (i: number) => (timeAtGrid[i] ??= resampleDecimate(grid, scaled[i].d, traces[i].tRel, new Float64Array(m)));
  const timeAtMetre: (Float64Array | undefined)[] = [];
  const timeOnDistance = (i: number) => (timeAtMetre[i] ??= resampleOnDistance(traces[i].tRel, scaled[i].d, null, 1).timeS);

  // Running gap, time(B) − time(A) on the common grid (lib/compare runningGap's definition).
  let gap: LapSeriesMeta["gap"] = null;
  if (traces.length > 1 && x === "distance") {
    const gaps = traces.map((t, i) => {
      if (i === 0) return null;
      const a = timeOnGrid(0);
      const b = timeOnGrid(i);
      const out = new Float64Array(m);
      for (let g = 0; g < m; g++) out[g] = b[g] - a[g];
      // At the line both laps have covered the reference length: the gap is the lap-time difference.
      if (hasEnd) out[m - 1] = t.tRel[t.tRel.length - 1] - ref.tRel[ref.tRel.length - 1];
      return out;
    });
    const p = onePane(gaps, false);
    gap = { x: p.x, series: p.series, decimated: p.decimated };
  } else if (traces.length > 1) {
    // By time: the gap at each instant of the reference lap, i.e. at the distance it had reached.
    const gaps = traces.map((t, i) => {
      if (i === 0) return null;
      const a = timeOnDistance(0);
      const b = timeOnDistance(i);
      const k = Math.min(a.length, b.length);
      const ta = new Float64Array(k + 1);
      const gv = new Float64Array(k + 1);
      for (let g = 0; g < k; g++) { ta[g] = a[g]; gv[g] = b[g] - a[g]; }
      ta[k] = ref.tRel[ref.tRel.length - 1];
      gv[k] = t.tRel[t.tRel.length - 1] - ta[k];
      const onTime = resampleOnDistance(ta, ta, gv, step).values;
      const out = new Float64Array(fullGrid.length).fill(NaN);
      out.set(onTime.subarray(0, Math.min(onTime.length, fullGrid.length)));
      return out.slice(g0, g1);
    });
    const p = onePane(gaps, false);
    gap = { x: p.x, series: p.series, decimated: p.decimated };
  }

  // The reference lap's path for the outline: on its own 1 m grid, thinned to TRACK_POINTS, cached.
  const pathKey = refPathKey(ref.row, refVersion);
  let path = pathCache.get(pathKey);
  if (path === undefined) {
    path = null;
    const lat = ref.values.get("gps_lat");
    const lon = ref.values.get("gps_lon");
    if (lat && lon && refLengthM > 0) {
      const count = Math.min(TRACK_POINTS, Math.floor(refLengthM) + 1);
      const dM = Float64Array.from({ length: count }, (_, o) => (o * refLengthM) / (count - 1));
      const la = resampleDecimate(dM, ref.dRel, lat, new Float64Array(count));
      const lo = resampleDecimate(dM, ref.dRel, lon, new Float64Array(count));
      let origin = -1;
      for (let i = 0; i < count && origin < 0; i++) if (Number.isFinite(la[i]) && Number.isFinite(lo[i])) origin = i;
      if (origin >= 0) {
        const proj = toLocalMetres({ lat: la[origin], lon: lo[origin] });
        const east = new Float32Array(count);
        const north = new Float32Array(count);
        for (let o = 0; o < count; o++) {
          east[o] = Number.isFinite(lo[o]) ? proj.xM(lo[o]) : NaN;
          north[o] = Number.isFinite(la[o]) ? proj.yM(la[o]) : NaN;
        }
        path = { dM, east, north };
      }
    }
    pathCache.set(pathKey, path);
  }
  // Distance along the reference lap → its x (time since its start when x = time).
  const refX = (dM: number) => (x === "distance" ? dM : at(ref.dRel, ref.tRel, dM));
  let track: LapSeriesMeta["track"] = null;
  if (path) {
    const tx = x === "distance" ? path.dM : resampleDecimate(path.dM, ref.dRel, ref.tRel, new Float64Array(path.dM.length));
    track = { x: push(tx), eastM: push(path.east), northM: push(path.north) };
  }

  // Sector bands from the reference lap's sector times (time since its start → x).
  const sectors: LapSeriesMeta["sectors"] = [];
  const st = ref.row.sectorTimesMs;
  if (st.length > 1 && st.every((v) => v != null && v > 0)) {
    let t = 0;
    let prevX = 0;
    st.forEach((ms, i) => {
      t += ms! / 1000;
      const toX = i === st.length - 1 ? (x === "distance" ? refLengthM : ref.tRel[ref.tRel.length - 1]) : x === "distance" ? at(ref.tRel, ref.dRel, t) : t;
      if (Number.isFinite(toX)) {
        sectors.push({ name: `S${i + 1}`, fromX: prevX, toX });
        prevX = toX;
      }
    });
  }

  // Corners: the track's named ones, else the speed minima of the reference lap.
  let cornerSource: LapSeriesMeta["cornerSource"] = "none";
  let apexes: { name: string; distanceM: number }[] = [];
  const named = jsonColumn<{ name: string; distanceM: number }[]>(trackRows[0]?.corners) ?? [];
  const speedRole = SPEED_ROLES.find((r) => ref.values.has(r));
  if (named.length) {
    apexes = named.filter((c) => Number.isFinite(c.distanceM) && c.distanceM >= 0 && c.distanceM <= refLengthM).map((c) => ({ name: c.name, distanceM: c.distanceM }));
    cornerSource = apexes.length ? "track" : "none";
  } else if (speedRole) {
    apexes = findCorners(ref.values.get(speedRole)!, ref.dRel).map((c) => ({ name: c.name, distanceM: c.distanceM }));
    cornerSource = apexes.length ? "found" : "none";
  }
  apexes.sort((p, q) => p.distanceM - q.distanceM);
  const corners: LapSeriesCorner[] = [];
  const braking = traces.map((t, i) => {
    const v = speedRole ? t.values.get(speedRole) : undefined;
    const p = t.values.get("brake_front");
    return v && p ? brakingPoints({ distanceM: scaled[i].d, speedMps: v, brakeFrontPa: p }, apexes, { thresholdPa: BRAKE_THRESHOLD_PA }) : null;
  });
  apexes.forEach((c, k) => {
    const fromM = k === 0 ? 0 : (apexes[k - 1].distanceM + c.distanceM) / 2;
    const toM = k === apexes.length - 1 ? refLengthM : (c.distanceM + apexes[k + 1].distanceM) / 2;
    const refIn = at(scaled[0].d, ref.tRel, fromM);
    const refOut = at(scaled[0].d, ref.tRel, toM);
    corners.push({
      name: c.name,
      x: refX(c.distanceM),
      fromX: refX(fromM),
      toX: refX(toM),
      fromM,
      toM,
      laps: traces.map((t, i) => {
        const v = speedRole ? t.values.get(speedRole) : undefined;
        if (!v) return null;
        const d = scaled[i].d;
        const entry = at(d, v, fromM);
        const exit = at(d, v, toM);
        // The lowest speed over the stretch, its two ends included.
        let minV = Number.isFinite(entry) ? entry : Infinity;
        let apexM = fromM;
        for (let j = lowerBound(d, fromM); j < d.length && d[j] <= toM; j++) if (v[j] < minV) { minV = v[j]; apexM = d[j]; }
        if (exit < minV) { minV = exit; apexM = toM; }
        const tIn = at(d, t.tRel, fromM);
        const tOut = at(d, t.tRel, toM);
        return {
          entrySpeedMps: entry,
          brakingPointM: braking[i]?.find((b) => b.name === c.name)?.onsetDistanceM ?? null,
          minSpeedMps: Number.isFinite(minV) ? minV : NaN,
          apexM,
          exitSpeedMps: exit,
          timeS: tOut - tIn,
          gainedS: i === 0 ? 0 : (refOut - refIn) - (tOut - tIn),
        };
      }),
    });
  });

  stage("compute");
  return {
    meta: {
      x,
      xUnit: x === "distance" ? "m" : "s",
      reference: 0,
      laps: traces.map((t, i) => ({
        sessionId: t.row.sessionId,
        lap: t.row.number,
        sessionTitle: found.sessions.get(t.row.sessionId)!.title,
        riderName: found.sessions.get(t.row.sessionId)!.riderName,
        lapTimeMs: t.row.lapTimeMs,
        lengthM: t.lengthM,
        distanceScale: scaled[i].scale,
        outLap: t.row.outLap,
        inLap: t.row.inLap,
        pitPass: t.row.pitPass,
        invalid: t.row.invalid,
      })),
      gridPoints: m,
      gridStep: step,
      panes,
      missing,
      gap,
      track,
      window: [grid[0], grid[m - 1]],
      fullX: [fullGrid[0], fullGrid[fullGrid.length - 1]],
      sectors,
      corners,
      cornerSource,
    },
    arrays,
  };
}
