"use client";
/**
 * Compare: laps × channels overlaid on distance (or time), a Running gap pane, a legend with the
 * values at the cursor and the reference lap's track outline. The view — laps, channels, x, zoom —
 * lives in the URL, so a link reproduces it for a teammate.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { useRouter, useSearchParams } from "next/navigation";
import type uPlot from "uplot";
import { useLapSeries } from "@/lib/client/lap-series";
import { useUnitSystem } from "@/lib/client/use-unit-system";
import type { PickerSession } from "@/lib/client/use-team-sessions";
import { formatLapRefs, parseLapRefs } from "@/lib/series/lap-series-query";
import type { LapRef, SeriesX } from "@/lib/series/lap-series-meta";
import type { DisplayUnit } from "@/lib/units/display";
import { displayUnitIn, distanceUnitIn, type UnitSystem } from "@/lib/units/unit-system";
import { ROLE_LABEL, type ChannelRole } from "@/lib/channels/roles";
import { UnitToggle } from "@/components/units/unit-toggle";
import { ChartPane } from "./chart-pane";
import { ChannelPicker, COMPARE_ROLES, DEFAULT_ROLES } from "./channel-picker";
import { CursorLegend, type LegendRow } from "./cursor-legend";
import { LapPicker } from "./lap-picker";
import { TrackMap } from "./track-map";
import { lapColour } from "./lap-colours";
import { interpolateAt } from "./series-lookup";

export const MARK_CHARTS_DRAWN = "lapbench:charts-drawn";
const SYNC_KEY = "lapbench-compare";
const SECONDS: DisplayUnit = { unit: "s", factor: 1, offset: 0, decimals: 3 };
const TIME_AXIS: DisplayUnit = { unit: "s", factor: 1, offset: 0, decimals: 2 };
/** y-axis gutter of a pane: the series is decimated to the plotting width, not the card's. */
const AXIS_GUTTER_PX = 60;

function convert(a: ArrayLike<number>, d: DisplayUnit): Float64Array {
  const out = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i] * d.factor + d.offset;
  return out;
}

interface PaneView {
  key: string;
  title: string;
  unit: DisplayUnit;
  data: uPlot.AlignedData;
  series: { label: string; colour: string }[];
  legend: LegendRow;
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
  const zoomSi = useMemo<[number, number] | null>(() => {
    const f = Number(sp.get("from"));
    const t = Number(sp.get("to"));
    return sp.has("from") && sp.has("to") && Number.isFinite(f) && Number.isFinite(t) && t > f ? [f, t] : null;
  }, [sp]);
  const colourBy = sp.get("colour") ?? "speed_front";

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
  const data = q.data;

  const xUnit = x === "distance" ? distanceUnitIn(system) : TIME_AXIS;
  const view = useMemo(() => {
    if (!data) return null;
    const { meta, arrays } = data;
    const xd = meta.x === "distance" ? distanceUnitIn(system) : TIME_AXIS;
    const xCache = new Map<number, Float64Array>();
    const xOf = (i: number) => xCache.get(i) ?? (xCache.set(i, convert(arrays[i], xd)), xCache.get(i)!);
    const lapLabel = (i: number) => `Lap ${meta.laps[i].lap} · ${meta.laps[i].sessionTitle}`;
    const panes: PaneView[] = meta.panes.map((p) => {
      const du = displayUnitIn(system, p.role, p.unit);
      const xs = xOf(p.x);
      const nan = new Float64Array(xs.length).fill(NaN);
      return {
        key: p.role,
        title: p.label,
        unit: du,
        data: [xs, ...p.series.map((s) => (s == null ? nan : convert(arrays[s], du)))] as uPlot.AlignedData,
        series: meta.laps.map((_, i) => ({ label: lapLabel(i), colour: lapColour(i) })),
        legend: { key: p.role, title: p.label, unit: du, x: arrays[p.x], series: p.series.map((s) => (s == null ? null : arrays[s])) },
      };
    });
    let gap: PaneView | null = null;
    if (meta.gap) {
      const xs = xOf(meta.gap.x);
      const others = meta.gap.series.slice(1);
      gap = {
        key: "gap",
        title: `Running gap to lap ${meta.laps[0].lap} (${meta.laps[0].sessionTitle})`,
        unit: SECONDS,
        data: [xs, ...others.map((s) => arrays[s!])] as uPlot.AlignedData,
        series: others.map((_, k) => ({ label: lapLabel(k + 1), colour: lapColour(k + 1) })),
        legend: { key: "gap", title: "Running gap", unit: SECONDS, x: arrays[meta.gap.x], series: meta.gap.series.map((s) => (s == null ? null : arrays[s])) },
      };
    }
    let track: { x: ArrayLike<number>; east: ArrayLike<number>; north: ArrayLike<number>; values: Float64Array | null; label: string } | null = null;
    if (meta.track) {
      const tx = arrays[meta.track.x];
      const pane = panes.find((p) => p.key === colourBy) ?? panes[0];
      let values: Float64Array | null = null;
      if (pane) {
        const ys = pane.legend.series[0];
        if (ys) {
          values = new Float64Array(tx.length);
          for (let i = 0; i < tx.length; i++) values[i] = interpolateAt(pane.legend.x, ys, tx[i]) * pane.unit.factor + pane.unit.offset;
        }
      }
      track = { x: tx, east: arrays[meta.track.eastM], north: arrays[meta.track.northM], values, label: pane ? `${pane.title}${pane.unit.unit ? ` [${pane.unit.unit}]` : ""}` : "" };
    }
    return { meta, panes, gap, track };
  }, [data, system, colourBy]);

  // Cursor in SI x, shared by the legend and the track outline; one React update per frame.
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
  const paneCount = view ? view.panes.length + (view.gap ? 1 : 0) : 0;
  const onDrawn = useCallback(
    (key: string) => {
      if (!data || drawn.current.has(key)) return;
      drawn.current.add(key);
      if (drawn.current.size === paneCount) {
        performance.mark(MARK_CHARTS_DRAWN);
        setDrawnFor(data.url);
      }
    },
    [data, paneCount],
  );

  const legendRows = view ? [...view.panes.map((p) => p.legend), ...(view.gap ? [view.gap.legend] : [])] : [];
  const setLaps = (next: LapRef[]) => setView({ laps: next.length ? formatLapRefs(next) : null, from: null, to: null });

  return (
    <div className="grid gap-6 lg:grid-cols-[260px_minmax(0,1fr)]" data-testid="compare" data-series-url={data?.url ?? ""} data-drawn-for={drawnFor ?? ""}>
      <aside className="card space-y-5 self-start">
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
        <div>
          <p className="label">Units</p>
          <UnitToggle initial={initialUnits} />
        </div>
      </aside>

      <div className="min-w-0 space-y-4">
        {laps.length === 0 ? (
          <div className="card text-center" data-testid="compare-empty">
            <p className="font-medium">Pick laps to compare</p>
            <p className="mt-1 text-sm text-ink-400">Choose a session, tick two or more laps — from any session of the team — and pick the channels to overlay.</p>
          </div>
        ) : q.isError ? (
          <div role="alert" className="card border-alert-500/60 text-alert-400">{q.error.message}</div>
        ) : null}

        {view && laps.length > 0 && (
          <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_320px]">
            <section className="card min-w-0 p-3" aria-label="Legend">
              <CursorLegend laps={view.meta.laps} rows={legendRows} cursorX={cursorX} xUnit={x === "distance" ? xUnit : SECONDS} xLabel={x === "distance" ? "Distance" : "Time"} />
              {view.meta.missing.length > 0 && <p className="mt-2 text-xs text-ink-400">Not in these sessions: {view.meta.missing.map((r) => ROLE_LABEL[r as ChannelRole] ?? r).join(", ")}.</p>}
              {zoomSi && (
                <button type="button" className="btn-quiet mt-2 py-1 text-xs" onClick={() => onXRange(null)}>
                  Show the whole lap
                </button>
              )}
            </section>
            <section className="card p-3" aria-label="Track outline">
              {view.track ? (
                <>
                  <label htmlFor="colour-by" className="label">Colour the outline by</label>
                  <select id="colour-by" className="field mb-2 py-1" value={view.panes.some((p) => p.key === colourBy) ? colourBy : view.panes[0]?.key ?? ""} onChange={(e) => setView({ colour: e.target.value })}>
                    {view.panes.map((p) => (
                      <option key={p.key} value={p.key}>{p.title}</option>
                    ))}
                  </select>
                  <TrackMap x={view.track.x} eastM={view.track.east} northM={view.track.north} values={view.track.values} valueLabel={view.track.label} cursorX={cursorX} />
                </>
              ) : (
                <p className="text-sm text-ink-400">The reference lap has no GPS position, so there is no outline.</p>
              )}
            </section>
          </div>
        )}

        <div ref={chartsRef} className={`card space-y-2 p-3 ${laps.length === 0 ? "hidden" : ""}`} aria-busy={q.isFetching} data-testid="panes">
          {laps.length > 0 && !view && <div className="h-64 animate-pulse rounded bg-ink-850" aria-label="Loading the series" />}
          {view?.gap && (
            <ChartPane key="gap" testId="pane-gap" title={view.gap.title} unit="s" data={view.gap.data} series={view.gap.series} height={120} syncKey={SYNC_KEY} xRange={xRange} onXRange={onXRange} onCursorX={onCursorX} onDrawn={() => onDrawn("gap")} zeroLine />
          )}
          {view?.panes.map((p) => (
            <ChartPane key={p.key} testId={`pane-${p.key}`} title={p.title} unit={p.unit.unit} data={p.data} series={p.series} height={140} syncKey={SYNC_KEY} xRange={xRange} onXRange={onXRange} onCursorX={onCursorX} onDrawn={() => onDrawn(p.key)} />
          ))}
          {view && (
            <p className="px-1 text-[11px] text-ink-400">
              x: {x === "distance" ? `distance along the lap [${xUnit.unit}], each lap scaled to the reference lap's length` : "time since each lap's start [s]"} · drag across a chart to zoom, double-click to reset ·{" "}
              {data ? `${(data.bytes / 1024).toFixed(0)} kB, ${view.meta.gridPoints} grid points` : ""}
            </p>
          )}
        </div>
      </div>
    </div>
  );
}
