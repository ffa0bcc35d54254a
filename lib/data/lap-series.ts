import "server-only";
/**
 * Compare's series: the asked-for laps (any visible sessions of the team) × channel roles, cut
 * from the stored chunks that cover each lap, put on one x grid (1 m of distance, or one sample
 * period of time), with the Running gap against the reference lap and the reference lap's path,
 * min/max-decimated to the pixel width when points outnumber pixels 4 to 1.
 */
import type { Sequelize } from "sequelize";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import { ROLE_LABEL, ROLE_SI_UNIT, type ChannelRole } from "@/lib/channels/roles";
import { distanceChannel } from "@/lib/laps/distance-channel";
import type { SeriesLike } from "@/lib/laps/types";
import { resampleOnDistance } from "@/lib/compare/resample-on-distance";
import { decimateMinMax, DECIMATE_RATIO } from "@/lib/compare/decimate-min-max";
import { toLocalMetres } from "@/lib/geo/to-local-metres";
import type { SeriesArray } from "@/lib/series/binary";
import type { LapRef, LapSeriesMeta, LapSeriesPane, SeriesX } from "@/lib/series/lap-series-meta";
import { listChannels, type ChannelInfo } from "./samples";
import { readLapWindow } from "./lap-window";
import { findLaps, toLibLap, type LapRow } from "./laps";

export interface LapSeriesRequest {
  laps: LapRef[];
  roles: ChannelRole[];
  x: SeriesX;
  /** Pixel width of the chart's plotting area. */
  width: number;
}

export interface LapSeriesResult {
  meta: LapSeriesMeta;
  arrays: SeriesArray[];
}

/** Most points the track outline gets (a 4 km lap at 1 m would be 4000; 1500 draws the same shape). */
const TRACK_POINTS = 1500;

/** One lap cut from storage: samples strictly inside the lap plus exact points at its start and end. */
interface LapTrace {
  row: LapRow;
  /** Time since the lap start, s (first = 0, last = lap time). */
  tRel: Float64Array;
  /** Distance since the lap start, m, scaled to the reference length later. */
  dRel: Float64Array;
  lengthM: number;
  values: Map<string, Float64Array>;
}

/** Index of the first element ≥ v in an ascending array. */
function lowerBound(a: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
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

async function lapTrace(sequelize: Sequelize, channels: ChannelInfo[], lap: LapRow, roles: readonly ChannelRole[], needDistance: boolean): Promise<LapTrace> {
  const read = [...new Set<string>([...roles, "speed_front", "gps_lat", "gps_lon"])];
  const { timeS, data } = await readLapWindow(sequelize, channels, lap, read);
  const series: SeriesLike = { timeS, channels: {} };
  for (const r of ["speed_front", "gps_lat", "gps_lon"] as const) {
    const v = data.get(r);
    if (v) series.channels[r] = v;
  }
  const dist = distanceChannel(series, [toLibLap(lap)]);
  if (needDistance && dist.source === "none") throw new HttpError(422, `Lap ${lap.number} of session ${lap.sessionId} has neither wheel speed nor GPS, so it has no distance; compare it by time.`);
  const dStart = dist.lapStartDistanceM[0];
  const lengthM = dist.lapLengthM[0];
  const first = lowerBound(timeS, lap.startTimeS);
  let last = lowerBound(timeS, lap.endTimeS); // first sample at or after the end
  if (last < timeS.length && timeS[last] === lap.endTimeS) last++; // keep an exact end sample out: appended below
  const inner0 = first < timeS.length && timeS[first] === lap.startTimeS ? first + 1 : first;
  const n = Math.max(0, last - inner0) + 2;
  const tRel = new Float64Array(n);
  const dRel = new Float64Array(n);
  tRel[0] = 0;
  dRel[0] = 0;
  for (let i = inner0, o = 1; i < last && o < n - 1; i++, o++) {
    tRel[o] = timeS[i] - lap.startTimeS;
    dRel[o] = Math.min(lengthM, Math.max(0, dist.distanceM[i] - dStart));
  }
  tRel[n - 1] = lap.endTimeS - lap.startTimeS;
  dRel[n - 1] = lengthM;
  const values = new Map<string, Float64Array>();
  for (const role of roles) {
    const v = data.get(role);
    if (!v) continue;
    const out = new Float64Array(n);
    out[0] = valueAt(timeS, v, lap.startTimeS);
    for (let i = inner0, o = 1; i < last && o < n - 1; i++, o++) out[o] = v[i];
    out[n - 1] = valueAt(timeS, v, lap.endTimeS);
    values.set(role, out);
  }
  return { row: lap, tRel, dRel, lengthM, values };
}

/**
 * resampleOnDistance's `values` column only, written into `out` (pre-filled with NaN) for its
 * first min(out.length, grid points) entries. The loop is that function's, step for step, so the
 * numbers are the same; it skips the time and distance columns and the intermediate arrays
 * which Compare would otherwise build and drop for every channel of every lap. Returns the number
 * of grid points the lap reaches.
 */
function resampleValuesInto(xs: Float64Array, values: ArrayLike<number>, step: number, out: Float64Array): number {
  const n = xs.length; // values has one entry per x (a lap trace's columns)
  const dEnd = n > 0 ? xs[n - 1] : NaN;
  const m = n > 0 && dEnd >= 0 ? Math.floor(dEnd / step + 1e-9) + 1 : 0;
  const upTo = Math.min(m, out.length);
  let k = 0;
  let lastFinite = -1;
  let nextFinite = -1;
  for (let g = 0; g < upTo; g++) {
    const d = g * step;
    while (k < n && xs[k] < d) {
      if (Number.isFinite(values[k])) lastFinite = k;
      k++;
    }
    if (k >= n) continue; // stays NaN
    if (nextFinite < k) {
      nextFinite = k;
      while (nextFinite < n && !Number.isFinite(values[nextFinite])) nextFinite++;
    }
    if (nextFinite >= n) continue;
    if (xs[nextFinite] === d) out[g] = values[nextFinite];
    else if (lastFinite >= 0) {
      const da = xs[lastFinite];
      const db = xs[nextFinite];
      const va = values[lastFinite];
      out[g] = db === da ? va : va + ((values[nextFinite] - va) * (d - da)) / (db - da);
    }
  }
  return m;
}

/**
 * Put one lap's channel on the common grid. For distance: resampleOnDistance at 1 m, then the
 * exact end of the lap (the reference length) appended so the last point is the line itself.
 * For time: the same interpolation with time as its own "distance" (strictly ascending, so the
 * function's NaN-aware linear interpolation applies unchanged), NaN past the lap's end.
 */
function onGrid(x: SeriesX, trace: LapTrace, dScaled: Float64Array, values: Float64Array, grid: Float64Array, step: number): Float64Array {
  const m = grid.length;
  const v = new Float64Array(m).fill(NaN);
  if (x === "distance") {
    const k = Math.min(resampleValuesInto(dScaled, values, step, v), m);
    if (grid[m - 1] !== (m - 1) * step || k < m) v[m - 1] = values[values.length - 1];
  } else {
    resampleValuesInto(trace.tRel, values, step, v);
  }
  return v;
}

/**
 * Shared-x min/max decimation of several series over one grid: decimateMinMax per series, then
 * the union of the kept grid points, so every series keeps its own min and max (and first NaN)
 * in every pixel column and all series still share one x column for the chart.
 */
function decimateTogether(grid: Float64Array, ys: (Float64Array | null)[], width: number): { x: Float64Array; ys: (Float32Array | null)[]; decimated: boolean } {
  const present = ys.filter((y): y is Float64Array => y != null);
  if (grid.length < DECIMATE_RATIO * width || present.length === 0) {
    // The typed-array constructor copies with a native conversion (`from` iterates element by element).
    return { x: grid, ys: ys.map((y) => (y ? new Float32Array(y) : null)), decimated: false };
  }
  const keep = new Uint8Array(grid.length);
  for (const y of present) {
    const d = decimateMinMax(grid, y, width);
    // Kept x values are grid values in ascending order: walk the grid alongside them.
    let g = 0;
    for (let i = 0; i < d.x.length; i++) {
      while (g < grid.length && grid[g] < d.x[i]) g++;
      if (g < grid.length) keep[g] = 1;
    }
  }
  let count = 0;
  for (let g = 0; g < keep.length; g++) count += keep[g];
  const x = new Float64Array(count);
  const idx = new Uint32Array(count);
  for (let g = 0, o = 0; g < keep.length; g++) if (keep[g]) { x[o] = grid[g]; idx[o++] = g; }
  return {
    x,
    ys: ys.map((y) => {
      if (!y) return null;
      const out = new Float32Array(count);
      for (let i = 0; i < count; i++) out[i] = y[idx[i]];
      return out;
    }),
    decimated: true,
  };
}

export async function loadLapSeries(ctx: TeamContext, request: LapSeriesRequest, sequelize: Sequelize = getSequelize()): Promise<LapSeriesResult> {
  const { laps: refs, x } = request;
  const roles = [...new Set(request.roles)];
  const width = Math.max(1, Math.floor(request.width));
  // The laps (with the visibility check) and each session's channel list in one round trip. The
  // channel lists are used only after every lap has passed that check; an unseen session's list
  // is dropped with the 404.
  const sessionIds = [...new Set(refs.map((r) => r.sessionId))];
  const [found, channelLists] = await Promise.all([findLaps(ctx, refs), Promise.all(sessionIds.map((id) => listChannels(sequelize, id)))]);
  const rows = refs.map((r) => {
    const row = found.laps.get(`${r.sessionId}:${r.lap}`);
    // Missing, another team's, or a session this rider may not see: all the same 404.
    if (!row) throw new HttpError(404, `Lap ${r.lap} of session ${r.sessionId} was not found in your team.`);
    return row;
  });

  const channelsBySession = new Map<number, ChannelInfo[]>(sessionIds.map((id, i) => [id, channelLists[i]]));
  const traceRoles = [...new Set<ChannelRole>([...roles, "gps_lat", "gps_lon"])];
  const traces = await Promise.all(rows.map((r) => lapTrace(sequelize, channelsBySession.get(r.sessionId)!, r, traceRoles, x === "distance")));

  const ref = traces[0];
  const refLengthM = ref.lengthM;
  const scaled = traces.map((t) => {
    const s = t.lengthM > 0 ? refLengthM / t.lengthM : 1;
    const d = new Float64Array(t.dRel.length);
    for (let i = 0; i < d.length; i++) d[i] = t.dRel[i] * s;
    return { d, scale: s };
  });

  // The common grid: 1 m up to the reference length (plus the exact end), or one sample period
  // of the reference session up to the longest lap.
  const refTime = channelsBySession.get(ref.row.sessionId)!.find((c) => c.role === "time")!;
  const step = x === "distance" ? 1 : 1 / (refTime.rateHz ?? 100);
  let grid: Float64Array;
  if (x === "distance") {
    const whole = Math.floor(refLengthM + 1e-9);
    const exact = refLengthM - whole > 1e-6;
    grid = new Float64Array(whole + 1 + (exact ? 1 : 0));
    for (let g = 0; g <= whole; g++) grid[g] = g;
    if (exact) grid[grid.length - 1] = refLengthM;
  } else {
    const longest = Math.max(...traces.map((t) => t.tRel[t.tRel.length - 1]));
    grid = new Float64Array(Math.floor(longest / step + 1e-9) + 1);
    for (let g = 0; g < grid.length; g++) grid[g] = g * step;
  }

  const arrays: SeriesArray[] = [];
  const push = (a: SeriesArray) => arrays.push(a) - 1;
  let sharedGridIndex = -1;
  const xIndex = (xs: Float64Array) => {
    if (xs !== grid) return push(xs);
    if (sharedGridIndex < 0) sharedGridIndex = push(grid);
    return sharedGridIndex;
  };

  const panes: LapSeriesPane[] = [];
  const missing: string[] = [];
  for (const role of roles) {
    if (role === "gps_lat" || role === "gps_lon") continue; // shown as the track outline
    const perLap = traces.map((t, i) => {
      const v = t.values.get(role);
      return v ? onGrid(x, t, scaled[i].d, v, grid, step) : null;
    });
    if (perLap.every((v) => v == null)) {
      missing.push(role);
      continue;
    }
    const dec = decimateTogether(grid, perLap, width);
    panes.push({ role, label: ROLE_LABEL[role], unit: ROLE_SI_UNIT[role], x: xIndex(dec.x), series: dec.ys.map((y) => (y ? push(y) : null)), decimated: dec.decimated });
  }

  // Each lap's time at every metre of its scaled distance, resampled once per lap: every gap reads
  // the reference lap's column instead of resampling the reference again for each other lap.
  const timeAtMetre: (Float64Array | undefined)[] = [];
  const timeOnDistance = (i: number) => (timeAtMetre[i] ??= resampleOnDistance(traces[i].tRel, scaled[i].d, null, 1).timeS);

  // Running gap along distance, time(B) − time(A) on the common 1 m grid (lib/compare runningGap's
  // definition, over the shared per-lap columns).
  let gap: LapSeriesMeta["gap"] = null;
  if (traces.length > 1 && x === "distance") {
    const gaps = traces.map((t, i) => {
      if (i === 0) return null;
      const a = timeOnDistance(0);
      const b = timeOnDistance(i);
      const out = new Float64Array(grid.length).fill(NaN);
      const m = Math.min(a.length, b.length, grid.length);
      for (let g = 0; g < m; g++) out[g] = b[g] - a[g];
      // At the line both laps have covered the reference length: the gap is the lap-time difference.
      out[grid.length - 1] = t.tRel[t.tRel.length - 1] - ref.tRel[ref.tRel.length - 1];
      return out;
    });
    const dec = decimateTogether(grid, gaps, width);
    gap = { x: xIndex(dec.x), series: dec.ys.map((y) => (y ? push(y) : null)), decimated: dec.decimated };
  } else if (traces.length > 1) {
    // By time: the gap at each instant of the reference lap, i.e. at the distance it had reached.
    const gaps = traces.map((t, i) => {
      if (i === 0) return null;
      const a = timeOnDistance(0);
      const b = timeOnDistance(i);
      const m = Math.min(a.length, b.length);
      const ta = new Float64Array(m + 1);
      const gv = new Float64Array(m + 1);
      for (let g = 0; g < m; g++) { ta[g] = a[g]; gv[g] = b[g] - a[g]; }
      ta[m] = ref.tRel[ref.tRel.length - 1];
      gv[m] = t.tRel[t.tRel.length - 1] - ta[m];
      const onTime = resampleOnDistance(ta, ta, gv, step).values;
      const out = new Float64Array(grid.length).fill(NaN);
      out.set(onTime.subarray(0, Math.min(onTime.length, grid.length)));
      return out;
    });
    const dec = decimateTogether(grid, gaps, width);
    gap = { x: xIndex(dec.x), series: dec.ys.map((y) => (y ? push(y) : null)), decimated: dec.decimated };
  }

  // The reference lap's path for the outline, thinned to TRACK_POINTS.
  let track: LapSeriesMeta["track"] = null;
  const lat = ref.values.get("gps_lat");
  const lon = ref.values.get("gps_lon");
  if (lat && lon) {
    const la = onGrid(x, ref, scaled[0].d, lat, grid, step);
    const lo = onGrid(x, ref, scaled[0].d, lon, grid, step);
    let origin = -1;
    for (let i = 0; i < la.length && origin < 0; i++) if (Number.isFinite(la[i]) && Number.isFinite(lo[i])) origin = i;
    if (origin >= 0) {
      const proj = toLocalMetres({ lat: la[origin], lon: lo[origin] });
      const every = Math.max(1, Math.ceil(grid.length / TRACK_POINTS));
      const count = Math.ceil(grid.length / every);
      const tx = new Float64Array(count);
      const te = new Float32Array(count);
      const tn = new Float32Array(count);
      for (let o = 0; o < count; o++) {
        const g = Math.min(grid.length - 1, o * every);
        tx[o] = grid[g];
        te[o] = Number.isFinite(lo[g]) ? proj.xM(lo[g]) : NaN;
        tn[o] = Number.isFinite(la[g]) ? proj.yM(la[g]) : NaN;
      }
      track = { x: push(tx), eastM: push(te), northM: push(tn) };
    }
  }

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
      gridPoints: grid.length,
      gridStep: step,
      panes,
      missing,
      gap,
      track,
    },
    arrays,
  };
}
