"use client";
/**
 * Compare: laps overlaid along the lap, anchored on the track's corners. Two ways in: by corner
 * (small multiples, the entry point from a lap table) and the whole lap (a continuous stack of
 * grouped panes — Inputs, Speed, Chassis, Engine speed — with sector bands behind the traces,
 * corner names on the x axis, a thin gained/lost band under it and the values at the cursor as
 * chips in each caption). The left rail holds the track outline (coloured by time gained or lost
 * by default) and stays in view. The view — laps, channels, x, zoom, mode — lives in the URL, so
 * a link reproduces it for a teammate. Zooming in fetches finer data for that stretch only.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { useRouter, useSearchParams } from "next/navigation";
import type uPlot from "uplot";
import { useLapSeries, type LapSeriesData } from "@/lib/client/lap-series";
import { useUnitSystem } from "@/lib/client/use-unit-system";
import type { PickerSession } from "@/lib/client/use-team-sessions";
import { formatLapRefs, parseLapRefs } from "@/lib/series/lap-series-query";
import type { LapRef, LapSeriesCorner, SeriesX } from "@/lib/series/lap-series-meta";
import type { DisplayUnit } from "@/lib/units/display";
import { formatDisplay } from "@/lib/units/display";
import { formatLapTime } from "@/lib/export/format-lap-time";
import { displayUnitIn, distanceUnitIn, type UnitSystem } from "@/lib/units/unit-system";
import { ROLE_LABEL, ROLE_SI_UNIT, type ChannelRole } from "@/lib/channels/roles";
import { UnitToggle } from "@/components/units/unit-toggle";
import { ChartPane, type GapBand, type PaneAxis, type PaneScale, type PaneSeries, type XMarks } from "./chart-pane";
import { ChannelPicker, COMPARE_ROLES, DEFAULT_ROLES } from "./channel-picker";
import { CornerView } from "./corner-view";
import { LapPicker } from "./lap-picker";
import { TrackMap } from "./track-map";
import { lapColour } from "./lap-colours";
import { interpolateAt } from "./series-lookup";

export const MARK_CHARTS_DRAWN = "lapbench:charts-drawn";
const SYNC_KEY = "lapbench-compare";
const SECONDS: DisplayUnit = { unit: "s", factor: 1, offset: 0, decimals: 3 };
const TIME_AXIS: DisplayUnit = { unit: "s", factor: 1, offset: 0, decimals: 2 };
/** y-axis gutter of a pane: the series is decimated to the plotting width, not the card's. */
const AXIS_GUTTER_PX = 134;
const OUTLINE_PX = 232;

/** Our default panes: which roles share one, and how each is drawn in it. */
const GROUPS: { key: string; title: string; roles: ChannelRole[] }[] = [
  { key: "inputs", title: "Inputs", roles: ["throttle", "brake_front", "brake_rear"] },
  { key: "speed", title: "Speed", roles: ["speed_front", "speed_rear", "gps_speed"] },
  { key: "chassis", title: "Chassis", roles: ["fork_travel", "shock_travel"] },
  { key: "engine", title: "Engine speed", roles: ["engine_rpm", "gear"] },
];
const SHORT: Partial<Record<ChannelRole, string>> = {
  throttle: "throttle", brake_front: "front brake", brake_rear: "rear brake", speed_front: "front", speed_rear: "rear", gps_speed: "GPS",
  fork_travel: "fork", shock_travel: "shock", engine_rpm: "rpm", gear: "gear",
};
/** Second and third channel of a pane: dashed, dotted. */
const DASHES: (number[] | undefined)[] = [undefined, [6, 4], [2, 3]];

function convert(a: ArrayLike<number>, d: DisplayUnit): Float64Array {
  const out = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i] * d.factor + d.offset;
  return out;
}

interface PaneView {
  key: string;
  title: string;
  unit: string;
  data: uPlot.AlignedData;
  series: PaneSeries[];
  scales?: Record<string, PaneScale>;
  axes?: PaneAxis[];
}

/** Panes from the served series: grouped by our defaults, the rest one per channel. */
function buildPanes(data: LapSeriesData, system: UnitSystem): { panes: PaneView[]; gap: PaneView | null; gapBand: GapBand | null; xDisplay: DisplayUnit } {
  const { meta, arrays } = data;
  const xd = meta.x === "distance" ? distanceUnitIn(system) : TIME_AXIS;
  const xCache = new Map<number, Float64Array>();
  const xOf = (i: number) => xCache.get(i) ?? (xCache.set(i, convert(arrays[i], xd)), xCache.get(i)!);
  const lapLabel = (i: number) => `Lap ${meta.laps[i].lap} · ${meta.laps[i].sessionTitle}`;
  const byRole = new Map(meta.panes.map((p) => [p.role, p]));
  const used = new Set<string>();
  const panes: PaneView[] = [];
  const groups = [...GROUPS, ...meta.panes.filter((p) => !GROUPS.some((g) => g.roles.includes(p.role as ChannelRole))).map((p) => ({ key: p.role, title: p.label, roles: [p.role as ChannelRole] }))];
  for (const g of groups) {
    const present = g.roles.filter((r) => byRole.has(r));
    if (present.length === 0) continue;
    // One x column per pane: roles of a group share the grid unless decimated apart; then each
    // role's values are put on the first role's x by interpolation (both are the same 1 m grid).
    const first = byRole.get(present[0])!;
    const xs = xOf(first.x);
    const xsSi = arrays[first.x];
    const cols: Float64Array[] = [];
    const series: PaneSeries[] = [];
    const units: string[] = [];
    let brakeMax = 0;
    let gearMax = 0;
    present.forEach((role, ri) => {
      const p = byRole.get(role)!;
      used.add(role);
      const du = displayUnitIn(system, role, p.unit ?? ROLE_SI_UNIT[role]);
      if (!units.includes(du.unit) && du.unit) units.push(du.unit);
      p.series.forEach((s, lap) => {
        let col: Float64Array;
        if (s == null) col = new Float64Array(xs.length).fill(NaN);
        else if (p.x === first.x) col = convert(arrays[s], du);
        else {
          const own = arrays[p.x];
          const ys = arrays[s];
          col = new Float64Array(xs.length);
          for (let i = 0; i < xs.length; i++) col[i] = interpolateAt(own, ys, xsSi[i]) * du.factor + du.offset;
        }
        if (role === "brake_front" || role === "brake_rear") for (const v of col) if (v > brakeMax) brakeMax = v;
        if (role === "gear") for (const v of col) if (v > gearMax) gearMax = v;
        cols.push(col);
        series.push({
          label: `${lapLabel(lap)} · ${ROLE_LABEL[role]}`,
          colour: lapColour(lap),
          dash: DASHES[ri],
          scale: g.key === "inputs" ? (role === "throttle" ? "thr" : "brk") : g.key === "engine" && role === "gear" ? "gear" : "y",
          stepped: role === "gear",
          chip: `L${meta.laps[lap].lap}${present.length > 1 ? ` ${SHORT[role] ?? ROLE_LABEL[role]}` : ""}`,
          format: (v) => `${formatDisplay((v - du.offset) / du.factor, du)}${du.unit && du.unit !== "" ? ` ${du.unit}` : ""}`,
          toSi: (v) => (v - du.offset) / du.factor,
        });
      });
    });
    let scales: Record<string, PaneScale> | undefined;
    let axes: PaneAxis[] | undefined;
    if (g.key === "inputs") {
      // Throttle up from the middle line, brake pressure mirrored down from it.
      const b = Math.max(1, brakeMax) * 1.05;
      scales = { thr: { range: [-105, 105] }, brk: { range: [-b, b], dir: -1 } };
      axes = [
        ...(present.includes("throttle") ? [{ scale: "thr", side: 3 as const, positiveOnly: true, label: "throttle %" }] : []),
        ...(present.some((r) => r !== "throttle") ? [{ scale: "brk", side: 1 as const, positiveOnly: true, label: `brake ${displayUnitIn(system, "brake_front", "Pa").unit}` }] : []),
      ];
    } else if (g.key === "engine" && present.includes("gear")) {
      scales = { gear: { range: [0, Math.max(6, Math.ceil(gearMax)) + 0.5] } };
      axes = [...(present.includes("engine_rpm") ? [{ scale: "y", side: 3 as const }] : []), { scale: "gear", side: 1 as const, label: "gear" }];
    }
    panes.push({ key: g.key, title: g.title, unit: units.join(", "), data: [xs, ...cols] as uPlot.AlignedData, series, scales, axes });
  }
  let gap: PaneView | null = null;
  let gapBand: GapBand | null = null;
  if (meta.gap) {
    const xs = xOf(meta.gap.x);
    const others = meta.gap.series.slice(1);
    gap = {
      key: "gap",
      title: `Running gap to lap ${meta.laps[0].lap} (${meta.laps[0].sessionTitle})`,
      unit: "s",
      data: [xs, ...others.map((s) => arrays[s!])] as uPlot.AlignedData,
      series: others.map((_, k) => ({ label: lapLabel(k + 1), colour: lapColour(k + 1), chip: `L${meta.laps[k + 1].lap}`, format: (v: number) => `${v >= 0 ? "+" : "−"}${Math.abs(v).toFixed(3)} s`, toSi: (v: number) => v })),
    };
    gapBand = { x: xs, gaps: others.map((s, k) => ({ label: lapLabel(k + 1), values: arrays[s!] })) };
  }
  return { panes, gap, gapBand, xDisplay: xd };
}

export function CompareView({ sessions, initialUnits }: { sessions: PickerSession[]; initialUnits: UnitSystem }) {
  const sp = useSearchParams();
  const router = useRouter();
  const system = useUnitSystem(initialUnits);

  const laps = useMemo(() => parseLapRefs(sp.get("laps")), [sp]);
  const roles = useMemo(() => {
    const asked = sp.get("roles");
    return asked == null ? DEFAULT_ROLES : asked.split(",").filter((r): r is ChannelRole => (COMPARE_ROLES as string[]).includes(r));
  }, [sp]);
  const x: SeriesX = sp.get("x") === "time" ? "time" : "distance";
  const mode: "corners" | "lap" = sp.get("view") === "lap" ? "lap" : "corners";
  const showGapPane = sp.get("gap") === "1";
  const zoomSi = useMemo<[number, number] | null>(() => {
    const f = Number(sp.get("from"));
    const t = Number(sp.get("to"));
    return sp.has("from") && sp.has("to") && Number.isFinite(f) && Number.isFinite(t) && t > f ? [f, t] : null;
  }, [sp]);
  const colourBy = sp.get("colour") ?? "gain";

  const setView = useCallback(
    (patch: Record<string, string | null>) => {
      const p = new URLSearchParams(window.location.search);
      for (const [k, v] of Object.entries(patch)) {
        if (v == null) p.delete(k);
        else p.set(k, v);
      }
      // ":" and "," stay readable in a shared link.
      router.replace(`/compare?${p.toString().replace(/%3A/gi, ":").replace(/%2C/gi, ",")}`, { scroll: false });
    },
    [router],
  );

  // The plotting width decides the decimation; measured, and bucketed so a resize by a few
  // pixels does not refetch.
  const chartsRef = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(0);
  useEffect(() => {
    const node = chartsRef.current;
    if (!node) return;
    const measure = () => setWidth(Math.max(200, Math.round((node.clientWidth - AXIS_GUTTER_PX) / 100) * 100));
    measure();
    const ro = new ResizeObserver(measure);
    ro.observe(node);
    return () => ro.disconnect();
  }, []);

  const q = useLapSeries(laps, roles, x, width);
  // Zoomed in on the whole lap: finer data for that stretch only.
  const zq = useLapSeries(laps, roles, x, width, zoomSi, mode === "lap" && zoomSi != null);
  const whole = q.data;
  // The previous window stays in the query while the next loads: use it only if it covers the zoom.
  const tol = x === "distance" ? 1.01 : 0.05;
  const windowed = zoomSi && zq.data && zq.data.meta.x === x && zq.data.meta.window[0] <= zoomSi[0] + tol && zq.data.meta.window[1] >= zoomSi[1] - tol ? zq.data : null;
  const shown = mode === "lap" && zoomSi ? (windowed ?? whole) : whole;

  const xUnit = x === "distance" ? distanceUnitIn(system) : TIME_AXIS;
  const view = useMemo(() => (shown ? buildPanes(shown, system) : null), [shown, system]);

  const marks = useMemo<XMarks | null>(() => {
    if (!whole) return null;
    const k = (v: number) => v * xUnit.factor + xUnit.offset;
    return { corners: whole.meta.corners.map((c) => ({ x: k(c.x), name: c.name })), sectors: whole.meta.sectors.map((s) => ({ fromX: k(s.fromX), toX: k(s.toX), name: s.name })) };
  }, [whole, xUnit.factor, xUnit.offset]);

  const track = useMemo(() => {
    if (!whole?.meta.track) return null;
    const { meta, arrays } = whole;
    const tx = arrays[meta.track!.x];
    let values: Float64Array | null = null;
    let label = "";
    let diverging = false;
    if (colourBy === "gain" && meta.gap && meta.gap.series[1] != null) {
      // Time lost (+) or gained (−) by the second lap over each stretch of the outline, s per m (or per s).
      const gx = arrays[meta.gap.x];
      const gy = arrays[meta.gap.series[1]!];
      values = new Float64Array(tx.length);
      for (let i = 0; i < tx.length; i++) {
        const a = interpolateAt(gx, gy, tx[Math.max(0, i - 1)]);
        const b = interpolateAt(gx, gy, tx[i]);
        values[i] = i === 0 ? 0 : (b - a) / Math.max(1e-9, tx[i] - tx[i - 1]);
      }
      label = `lap ${meta.laps[1].lap} against lap ${meta.laps[0].lap}`;
      diverging = true;
    } else {
      const p = meta.panes.find((pp) => pp.role === colourBy) ?? meta.panes.find((pp) => pp.role === "speed_front") ?? meta.panes[0];
      const ys = p?.series[0] != null ? arrays[p.series[0]] : null;
      if (p && ys) {
        const du = displayUnitIn(system, p.role, p.unit);
        values = new Float64Array(tx.length);
        for (let i = 0; i < tx.length; i++) values[i] = interpolateAt(arrays[p.x], ys, tx[i]) * du.factor + du.offset;
        label = `${p.label}${du.unit ? ` [${du.unit}]` : ""}, lap ${meta.laps[0].lap}`;
      }
    }
    return { x: tx, east: arrays[meta.track!.eastM], north: arrays[meta.track!.northM], values, label, diverging, corners: meta.corners.map((c) => ({ x: c.x, name: c.name })) };
  }, [whole, colourBy, system]);

  // Cursor in SI x, shared by the chips and the track outline; one React update per frame.
  const [cursorX, setCursorX] = useState<number | null>(null);
  const pendingCursor = useRef<number | null>(null);
  const frame = useRef(0);
  const onCursorX = useCallback(
    (xDisplay: number) => {
      pendingCursor.current = (xDisplay - xUnit.offset) / xUnit.factor;
      if (!frame.current)
        frame.current = requestAnimationFrame(() => {
          frame.current = 0;
          setCursorX(pendingCursor.current);
        });
    },
    [xUnit.factor, xUnit.offset],
  );
  useEffect(() => () => cancelAnimationFrame(frame.current), []);

  const xRange = useMemo<[number, number] | null>(() => (zoomSi ? [zoomSi[0] * xUnit.factor + xUnit.offset, zoomSi[1] * xUnit.factor + xUnit.offset] : null), [zoomSi, xUnit.factor, xUnit.offset]);
  const onXRange = useCallback(
    (r: [number, number] | null) => {
      if (!r) return setView({ from: null, to: null });
      const si = r.map((v) => (v - xUnit.offset) / xUnit.factor);
      const digits = x === "distance" ? 1 : 3;
      setView({ from: si[0].toFixed(digits), to: si[1].toFixed(digits) });
    },
    [setView, x, xUnit.factor, xUnit.offset],
  );

  // One performance mark when every pane has drawn the newest data (read by tests and the benchmark).
  const drawn = useRef(new Set<string>());
  const [drawnFor, setDrawnFor] = useState<string | null>(null);
  useEffect(() => {
    drawn.current = new Set();
  }, [view]);
  const paneCount = view && mode === "lap" ? view.panes.length + (view.gap && showGapPane ? 1 : 0) : 0;
  const onDrawn = useCallback(
    (key: string) => {
      if (!shown || drawn.current.has(key)) return;
      drawn.current.add(key);
      if (drawn.current.size === paneCount) {
        performance.mark(MARK_CHARTS_DRAWN);
        setDrawnFor(shown.url);
      }
    },
    [shown, paneCount],
  );
  // The corner view has no uPlot panes: it is drawn once its data is in (set while rendering, the
  // way React adjusts state to changed data, rather than in an effect).
  if (mode === "corners" && whole && drawnFor !== whole.url) setDrawnFor(whole.url);

  const setLaps = (next: LapRef[]) => setView({ laps: next.length ? formatLapRefs(next) : null, from: null, to: null });
  const cursorDisplay = cursorX == null ? null : cursorX * xUnit.factor + xUnit.offset;
  const cornerAtCursor = cursorX != null && whole ? whole.meta.corners.find((c) => cursorX >= c.fromX && cursorX <= c.toX)?.name : undefined;

  const speedTrace = useMemo(() => {
    if (!whole) return null;
    const p = whole.meta.panes.find((pp) => pp.role === "speed_front") ?? whole.meta.panes.find((pp) => pp.role === "speed_rear") ?? whole.meta.panes.find((pp) => pp.role === "gps_speed");
    return p ? { x: whole.arrays[p.x], speeds: p.series.map((s) => (s == null ? null : whole.arrays[s])) } : null;
  }, [whole]);
  const openCorner = (c: LapSeriesCorner) => {
    const pad = (c.toX - c.fromX) * 0.1;
    const digits = x === "distance" ? 1 : 3;
    setView({ view: "lap", from: Math.max(0, c.fromX - pad).toFixed(digits), to: (c.toX + pad).toFixed(digits) });
  };

  return (
    <div className="grid gap-6 lg:grid-cols-[260px_minmax(0,1fr)]" data-testid="compare" data-series-url={shown?.url ?? ""} data-drawn-for={drawnFor ?? ""} data-mode={mode}>
      <aside className="card flex flex-col gap-5 self-start p-4 lg:sticky lg:top-4 lg:max-h-[calc(100vh-2rem)]" aria-label="Compare options">
        {laps.length > 0 && (
          <section aria-label="Track outline" className="shrink-0 space-y-2">
            {track ? (
              <>
                <TrackMap x={track.x} eastM={track.east} northM={track.north} values={track.values} valueLabel={track.label} cursorX={cursorX} diverging={track.diverging} size={OUTLINE_PX} corners={track.corners} />
                <label htmlFor="colour-by" className="label">Outline colour</label>
                <select id="colour-by" className="field py-1 text-xs" value={colourBy} onChange={(e) => setView({ colour: e.target.value })}>
                  {whole?.meta.gap && <option value="gain">Time gained or lost</option>}
                  {whole?.meta.panes.map((p) => (
                    <option key={p.role} value={p.role}>{p.label}</option>
                  ))}
                </select>
              </>
            ) : whole ? (
              <p className="text-xs text-ink-400">The reference lap has no GPS position, so there is no outline.</p>
            ) : (
              <div className="h-56 animate-pulse rounded bg-ink-850" />
            )}
          </section>
        )}
        {/* Everything below the outline scrolls on its own, so the outline stays in view. */}
        <div className="min-h-0 space-y-5 lg:overflow-y-auto lg:pr-1">
        <LapPicker sessions={sessions} selected={laps} onChange={setLaps} />
        <ChannelPicker selected={roles} onChange={(r) => setView({ roles: r.join(",") })} />
        <div>
          <p className="label" id="x-axis-label">x axis</p>
          <div role="group" aria-labelledby="x-axis-label" className="inline-flex overflow-hidden rounded-md border border-ink-600 text-xs">
            {(["distance", "time"] as const).map((v) => (
              <button key={v} type="button" aria-pressed={x === v} onClick={() => setView({ x: v, from: null, to: null })} className={`px-3 py-1 font-semibold capitalize ${x === v ? "bg-ink-700 text-signal-400" : "text-ink-300 hover:bg-ink-800"}`}>
                {v}
              </button>
            ))}
          </div>
        </div>
        <label className="flex cursor-pointer items-center gap-2 text-sm">
          <input type="checkbox" className="size-4 accent-signal-500" checked={showGapPane} onChange={(e) => setView({ gap: e.target.checked ? "1" : null })} />
          Running gap pane
        </label>
        <div>
          <p className="label">Units</p>
          <UnitToggle initial={initialUnits} />
        </div>
        </div>
      </aside>

      <div className="min-w-0 space-y-3" ref={chartsRef}>
        {laps.length === 0 ? (
          <div className="card text-center" data-testid="compare-empty">
            <p className="font-medium">Pick laps to compare</p>
            <p className="mt-1 text-sm text-ink-400">Choose a session, tick two or more laps — from any session of the team — and pick the channels to overlay.</p>
          </div>
        ) : q.isError ? (
          <div role="alert" className="card border-alert-500/60 text-alert-400">{q.error.message}</div>
        ) : null}

        {laps.length > 0 && (
          <div className="flex flex-wrap items-center gap-3">
            <div role="group" aria-label="Compare by" className="inline-flex overflow-hidden rounded-md border border-ink-600 text-sm">
              {([["corners", "Corners"], ["lap", "Whole lap"]] as const).map(([v, label]) => (
                <button key={v} type="button" aria-pressed={mode === v} onClick={() => setView({ view: v === "corners" ? null : v })} className={`px-3 py-1 font-semibold ${mode === v ? "bg-ink-700 text-signal-400" : "text-ink-300 hover:bg-ink-800"}`}>
                  {label}
                </button>
              ))}
            </div>
            {whole && (
              <ol className="flex flex-wrap items-center gap-2 text-xs" aria-label="Laps compared" data-testid="lap-keys">
                {whole.meta.laps.map((l, i) => (
                  <li key={`${l.sessionId}:${l.lap}`} className="inline-flex items-center gap-1.5 rounded-full border border-ink-700 px-2 py-0.5">
                    <span aria-hidden className="h-2.5 w-2.5 rounded-full" style={{ background: lapColour(i) }} />
                    <span className="font-semibold text-ink-100">Lap {l.lap}</span>
                    <span className="text-ink-400">
                      {l.sessionTitle}
                      {l.riderName ? ` · ${l.riderName}` : ""} · <span className="num">{formatLapTime(l.lapTimeMs)}</span>
                      {i === 0 ? " · reference" : ""}
                    </span>
                  </li>
                ))}
              </ol>
            )}
          </div>
        )}

        {mode === "corners" && whole && laps.length > 0 && (
          <CornerView laps={whole.meta.laps} corners={whole.meta.corners} cornerSource={whole.meta.cornerSource} trace={speedTrace} speedUnit={displayUnitIn(system, "speed_front", "m/s")} distanceUnit={distanceUnitIn(system)} onOpen={openCorner} />
        )}

        <div className={`card space-y-2 p-3 ${laps.length === 0 || mode !== "lap" ? "hidden" : ""}`} aria-busy={q.isFetching || zq.isFetching} data-testid="panes">
          {laps.length > 0 && !view && <div className="h-64 animate-pulse rounded bg-ink-850" aria-label="Loading the series" />}
          {view && mode === "lap" && (
            <p className="flex flex-wrap items-center gap-2 px-1 text-xs text-ink-400">
              <span data-testid="cursor-x" data-si={cursorX ?? ""}>
                {cursorX == null ? "Move over a chart to read the laps' values." : `${x === "distance" ? "Distance" : "Time"} ${formatDisplay(cursorX, x === "distance" ? xUnit : SECONDS)} ${xUnit.unit}${cornerAtCursor ? ` · ${cornerAtCursor}` : ""}`}
              </span>
              {zoomSi && (
                <button type="button" className="btn-quiet py-0.5 text-xs" onClick={() => onXRange(null)}>
                  Show the whole lap
                </button>
              )}
              {whole && whole.meta.missing.length > 0 && <span>Not in these sessions: {whole.meta.missing.map((r) => ROLE_LABEL[r as ChannelRole] ?? r).join(", ")}.</span>}
            </p>
          )}
          {view?.gap && showGapPane && mode === "lap" && (
            <ChartPane key="gap" testId="pane-gap" title={view.gap.title} unit="s" data={view.gap.data} series={view.gap.series} height={110} syncKey={SYNC_KEY} xRange={xRange} onXRange={onXRange} onCursorX={onCursorX} onDrawn={() => onDrawn("gap")} zeroLine marks={marks} cursorX={cursorDisplay} />
          )}
          {mode === "lap" &&
            view?.panes.map((p) => (
              <ChartPane
                key={p.key}
                testId={`pane-${p.key}`}
                title={p.title}
                unit={p.unit}
                data={p.data}
                series={p.series}
                height={p.key === "inputs" ? 170 : 140}
                syncKey={SYNC_KEY}
                xRange={xRange}
                onXRange={onXRange}
                onCursorX={onCursorX}
                onDrawn={() => onDrawn(p.key)}
                scales={p.scales}
                axes={p.axes}
                marks={marks}
                gapBand={view.gapBand}
                cursorX={cursorDisplay}
              />
            ))}
          {view && mode === "lap" && (
            <p className="px-1 text-[11px] text-ink-400">
              x: {x === "distance" ? `distance along the lap [${xUnit.unit}], each lap scaled to the reference lap's length, labelled by corner` : "time since each lap's start [s], labelled by corner"} · shaded: sectors · band under each chart: time gained (up) or lost (down) against the reference · drag to zoom (finer data is fetched for the stretch), double-click to reset ·{" "}
              {shown ? `${(shown.bytes / 1024).toFixed(0)} kB, ${shown.meta.gridPoints} grid points${windowed ? " in this stretch" : ""}` : ""}
            </p>
          )}
        </div>
      </div>
    </div>
  );
}
