"use client";
/**
 * One Compare pane: a uPlot chart created once on mount and fed new data with setData. Cursor
 * sync goes through uPlot's own cursor.sync key; zoom through its setScale hook, reported up so
 * every pane and the URL follow. Behind the traces: the reference lap's sector bands; on the x
 * axis: the track's corners by name; under it: a thin signed band of time gained (up, teal) or
 * lost (down, amber) by each compared lap against the reference. The caption carries one small
 * chip per trace with its value at the cursor.
 */
import { useEffect, useRef, type ReactNode } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import { GAIN_COLOUR, LOSS_COLOUR } from "./lap-colours";
import { interpolateAt, nearestIndex } from "./series-lookup";
import { cornerLabels } from "@/lib/compare/corner-labels";

export interface PaneSeries {
  label: string;
  colour: string;
  /** y scale of this trace ("y" unless given). */
  scale?: string;
  dash?: number[];
  /** Draw as steps (gear). */
  stepped?: boolean;
  /** Short name in the cursor chip, e.g. "L7 front". */
  chip?: string;
  /** Chip text for a value in display units. */
  format?: (v: number) => string;
  /** Display → SI for the chip's data-si (tests, tools). */
  toSi?: (v: number) => number;
}

export interface PaneScale {
  range?: [number, number];
  /** -1: values grow downwards (brake mirrored under the throttle). */
  dir?: 1 | -1;
}

export interface PaneAxis {
  scale: string;
  side: 1 | 3;
  /** Only label values ≥ 0 (mirrored scales). */
  positiveOnly?: boolean;
  label?: string;
}

export interface XMarks {
  /** Corner apexes (display x) with their names, drawn as the x axis' labels. */
  corners: { x: number; name: string }[];
  /** Sector bands (display x). */
  sectors: { fromX: number; toX: number; name: string }[];
}

export interface GapBand {
  /** Display x and, per compared lap, its Running gap to the reference (s). */
  x: ArrayLike<number>;
  gaps: { label: string; values: ArrayLike<number> }[];
}

export interface ChartPaneProps {
  title: string;
  unit: string;
  /** [x, ...one column per series], display units. */
  data: uPlot.AlignedData;
  series: PaneSeries[];
  height: number;
  syncKey: string;
  /** Zoomed x range in display units, or null for the whole lap. */
  xRange: [number, number] | null;
  onXRange: (range: [number, number] | null) => void;
  onCursorX: (x: number) => void;
  onDrawn?: () => void;
  /** Draw a zero line (Running gap). */
  zeroLine?: boolean;
  testId: string;
  /** Set at creation: extra y scales and axes (the left axis shows scale "y" unless axes say otherwise). */
  scales?: Record<string, PaneScale>;
  axes?: PaneAxis[];
  marks?: XMarks | null;
  gapBand?: GapBand | null;
  /** Cursor x in display units, for the chips. */
  cursorX?: number | null;
  /** Extra caption content (right side). */
  captionExtra?: ReactNode;
}

const AXIS = { stroke: "#a3adb9", grid: { stroke: "#2a323c", width: 1 }, ticks: { stroke: "#2a323c", width: 1 }, font: "11px ui-monospace, SFMono-Regular, Menlo, monospace" }; // canvas fonts cannot read CSS variables
const BAND_PX = 12;

let measureCtx: CanvasRenderingContext2D | null = null;
/** Width in CSS px of an x-axis label in the axis font. */
function measureAxisText(text: string): number {
  measureCtx ??= document.createElement("canvas").getContext("2d");
  if (!measureCtx) return text.length * 7;
  measureCtx.font = AXIS.font;
  return measureCtx.measureText(text).width;
}
const X_AXIS_PX = 26;

/** Gain/loss per pixel column of each compared lap, drawn under the x axis. Returns [gained, lost] columns. */
function drawGapBand(u: uPlot, band: GapBand): [number, number] {
  const c = u.ctx;
  const pr = uPlot.pxRatio;
  const left = u.bbox.left;
  const width = u.bbox.width;
  const top = u.bbox.top + u.bbox.height + (X_AXIS_PX - 2) * pr;
  const rows = band.gaps.length;
  if (rows === 0 || width <= 0) return [0, 0];
  const rowH = (BAND_PX * pr) / rows;
  const cols = Math.max(1, Math.floor(width / pr));
  let gained = 0;
  let lost = 0;
  c.save();
  c.fillStyle = "#13171d";
  c.fillRect(left, top, width, BAND_PX * pr);
  band.gaps.forEach((g, r) => {
    const deltas = new Float64Array(cols);
    let maxAbs = 0;
    let prev = interpolateAt(band.x, g.values, u.posToVal(0, "x"));
    for (let k = 0; k < cols; k++) {
      const next = interpolateAt(band.x, g.values, u.posToVal(k + 1, "x"));
      const d = next - prev; // + = the lap lost time to the reference over this column
      deltas[k] = Number.isFinite(d) ? d : 0;
      if (Number.isFinite(next)) prev = next;
      maxAbs = Math.max(maxAbs, Math.abs(deltas[k]));
    }
    const mid = top + rowH * (r + 0.5);
    c.strokeStyle = "#3a4450";
    c.lineWidth = 1;
    c.beginPath();
    c.moveTo(left, mid);
    c.lineTo(left + width, mid);
    c.stroke();
    if (maxAbs <= 0) return;
    for (let k = 0; k < cols; k++) {
      const d = deltas[k];
      if (d === 0) continue;
      const h = Math.max(pr, (Math.abs(d) / maxAbs) * (rowH / 2 - pr));
      const x = left + k * pr;
      if (d < 0) {
        gained++;
        c.fillStyle = GAIN_COLOUR;
        c.fillRect(x, mid - h, pr, h);
      } else {
        lost++;
        c.fillStyle = LOSS_COLOUR;
        c.fillRect(x, mid, pr, h);
      }
    }
  });
  c.restore();
  return [gained, lost];
}

export function ChartPane(props: ChartPaneProps) {
  const host = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const latest = useRef(props);
  /**
   * The x range we set ourselves (new data, zoom from another pane or the URL). uPlot fires its
   * setScale hook later, in its batched commit, so a flag around the call cannot tell our changes
   * from the person's: the hook instead skips, once, a range equal to the one we asked for.
   */
  const ownRange = useRef<[number, number] | null>(null);
  const seriesKey = useRef("");
  const observer = useRef<ResizeObserver | null>(null);

  useEffect(() => {
    latest.current = props;
  });

  /** uPlot's options with the given traces: built once, when the first data arrives. */
  const buildOptions = (node: HTMLDivElement, p: ChartPaneProps): uPlot.Options => {
    const scales: uPlot.Scales = { x: { time: false } };
    for (const [k, s] of Object.entries(p.scales ?? {})) scales[k] = { auto: s.range == null, ...(s.range ? { range: s.range } : {}), ...(s.dir ? { dir: s.dir } : {}) };
    const yAxes: uPlot.Axis[] = (p.axes ?? [{ scale: "y", side: 3 }]).map((a) => ({
      ...AXIS,
      scale: a.scale,
      side: a.side,
      size: 52,
      grid: { ...AXIS.grid, show: a.side === 3 },
      ...(a.positiveOnly ? { values: (_u: uPlot, splits: number[]) => splits.map((v) => (v >= 0 ? String(Math.round(v * 100) / 100) : "")) } : {}),
      // Every axis reserves room for a label (a blank one if none), so all panes plot equally wide.
      label: a.label ?? " ",
      labelSize: 14,
      labelFont: "10px sans-serif",
    }));
    // Every pane keeps a right-hand gutter of the same width, so the plotting areas — and the
    // corners on their x axes — line up from pane to pane.
    if (!yAxes.some((a) => a.side === 1)) yAxes.push({ ...AXIS, scale: yAxes[0]?.scale ?? "y", side: 1, size: 52, label: " ", labelSize: 14, grid: { show: false }, ticks: { show: false }, values: (_u: uPlot, splits: number[]) => splits.map(() => "") });
    return {
      width: Math.max(200, node.clientWidth),
      height: latest.current.height,
      scales,
      legend: { show: false },
      series: [{}, ...p.series.map(seriesOptions)],
      axes: [
        {
          ...AXIS,
          size: X_AXIS_PX + BAND_PX + 4,
          // The track's corners by name where there are any in view; plain numbers otherwise.
          splits: (u) => {
            const marks = latest.current.marks?.corners ?? [];
            const { min, max } = u.scales.x;
            const inView = marks.filter((m) => min != null && max != null && m.x >= min && m.x <= max).map((m) => m.x);
            if (inView.length >= 2) return inView;
            const lo = min ?? 0;
            const hi = max ?? 1;
            const step = niceStep((hi - lo) / 6);
            const out: number[] = [];
            for (let v = Math.ceil(lo / step) * step; v <= hi; v += step) out.push(v);
            return out;
          },
          values: (u, splits) => {
            const marks = latest.current.marks?.corners ?? [];
            const named = splits.map((v) => marks.find((m) => m.x === v));
            if (splits.length === 0 || named.some((m) => m == null)) {
              delete node.dataset.xLabels;
              return splits.map((v) => String(Math.round(v * 10) / 10));
            }
            // Corner names that never overlap: full, else all short, else some left out.
            const pos = splits.map((v) => u.valToPos(v, "x"));
            const texts = cornerLabels(named.map((m, i) => ({ pos: pos[i], name: m!.name })), measureAxisText);
            // What is drawn where (CSS px from the plot's left), for people's tools and tests.
            node.dataset.xLabels = JSON.stringify(texts.map((t, i) => ({ text: t, left: pos[i] - measureAxisText(t) / 2, right: pos[i] + measureAxisText(t) / 2 })).filter((l) => l.text));
            return texts;
          },
        },
        ...yAxes,
      ],
      cursor: {
        sync: { key: latest.current.syncKey, setSeries: false },
        drag: { x: true, y: false, setScale: true },
        points: { size: 7, width: 2 },
      },
      hooks: {
        setScale: [
          (u, key) => {
            if (key !== "x") return;
            const { min, max } = u.scales.x;
            const xs = u.data[0];
            // The visible range on the element, for people's tools and tests to read.
            if (min != null && max != null) Object.assign(node.dataset, { xMin: String(min), xMax: String(max) });
            if (min == null || max == null || xs.length === 0) return;
            const own = ownRange.current;
            ownRange.current = null;
            const eps = (max - min) * 1e-6;
            if (own && Math.abs(own[0] - min) <= eps && Math.abs(own[1] - max) <= eps) return;
            const whole = min <= xs[0] && max >= xs[xs.length - 1];
            latest.current.onXRange(whole ? null : [min, max]);
          },
        ],
        setCursor: [
          (u) => {
            const i = u.cursor.idx;
            if (i != null && (u.cursor.left ?? -1) >= 0) latest.current.onCursorX(u.data[0][i]);
          },
        ],
        drawClear: [
          (u) => {
            // Sector bands behind every trace: alternate sectors shaded, each named at the top.
            const sectors = latest.current.marks?.sectors ?? [];
            if (sectors.length === 0) return;
            const c = u.ctx;
            const pr = uPlot.pxRatio;
            c.save();
            c.font = `${10 * pr}px sans-serif`;
            sectors.forEach((s, k) => {
              const x0 = Math.max(u.bbox.left, u.valToPos(s.fromX, "x", true));
              const x1 = Math.min(u.bbox.left + u.bbox.width, u.valToPos(s.toX, "x", true));
              if (x1 <= x0) return;
              c.fillStyle = k % 2 === 0 ? "rgba(79,209,197,0.06)" : "rgba(228,232,237,0.025)";
              c.fillRect(x0, u.bbox.top, x1 - x0, u.bbox.height);
              // Named where it starts in view, or where enough of it shows for the name.
              if (x0 > u.valToPos(s.fromX, "x", true) && x1 - x0 < 28 * pr) return;
              c.fillStyle = "#7d8896";
              c.fillText(s.name, x0 + 4 * pr, u.bbox.top + 11 * pr);
            });
            c.restore();
          },
        ],
        draw: [
          (u) => {
            const band = latest.current.gapBand;
            if (band) {
              const [gained, lost] = drawGapBand(u, band);
              Object.assign(node.dataset, { gapGained: String(gained), gapLost: String(lost) });
            }
            if (u.data[0].length > 0) latest.current.onDrawn?.();
          },
        ],
        drawAxes: [
          (u) => {
            if (!latest.current.zeroLine) return;
            const y = u.valToPos(0, "y", true);
            if (!Number.isFinite(y) || y < u.bbox.top || y > u.bbox.top + u.bbox.height) return;
            const c = u.ctx;
            c.save();
            c.strokeStyle = "#7d8896";
            c.setLineDash([4, 4]);
            c.beginPath();
            c.moveTo(u.bbox.left, y);
            c.lineTo(u.bbox.left + u.bbox.width, y);
            c.stroke();
            c.restore();
          },
        ],
      },
    };
  };

  // Destroy on unmount.
  useEffect(
    () => () => {
      observer.current?.disconnect();
      plot.current?.destroy();
      plot.current = null;
    },
    [],
  );

  // New data: adjust the series set only when laps change, then setData (one redraw).
  useEffect(() => {
    const key = props.series.map((s) => `${s.label}|${s.colour}|${s.scale ?? "y"}`).join(";");
    const xs = props.data[0];
    const whole: [number, number] | null = xs.length ? [xs[0], xs[xs.length - 1]] : null;
    let u = plot.current;
    if (!u) {
      // Created with its traces and data in one go: one layout and one draw, as bare uPlot.
      if (xs.length === 0) return;
      const node = host.current!;
      ownRange.current = whole;
      u = new uPlot(buildOptions(node, props), props.data, node);
      plot.current = u;
      seriesKey.current = key;
      const created = u;
      observer.current = new ResizeObserver(() => {
        const w = Math.max(200, node.clientWidth);
        if (w !== created.width) created.setSize({ width: w, height: latest.current.height });
      });
      observer.current.observe(node);
      if (props.xRange) created.setScale("x", { min: props.xRange[0], max: props.xRange[1] });
      ownRange.current = props.xRange ?? whole;
      return;
    }
    if (key !== seriesKey.current) {
      for (let i = u.series.length - 1; i >= 1; i--) u.delSeries(i);
      u.setData(props.data, false);
      props.series.forEach((s, i) => u!.addSeries(seriesOptions(s, i), i + 1));
      seriesKey.current = key;
    }
    u.setData(props.data, true);
    if (props.xRange) u.setScale("x", { min: props.xRange[0], max: props.xRange[1] });
    ownRange.current = props.xRange ?? whole;
    // props.xRange is applied by its own effect; here only with new data.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [props.data, props.series]);

  // Zoom set elsewhere (another pane, the URL, a reset).
  useEffect(() => {
    const u = plot.current;
    const xs = u?.data[0];
    if (!u || !xs || xs.length === 0) return;
    const [min, max] = props.xRange ?? [xs[0], xs[xs.length - 1]];
    const cur = u.scales.x;
    const eps = (max - min) * 1e-6;
    if (cur.min != null && cur.max != null && Math.abs(cur.min - min) <= eps && Math.abs(cur.max - max) <= eps) return;
    ownRange.current = [min, max];
    u.setScale("x", { min, max });
  }, [props.xRange]);

  // Marks and the gap band are read by the draw hooks: redraw when they change.
  useEffect(() => {
    plot.current?.redraw(false, true);
  }, [props.marks, props.gapBand]);

  const k = props.cursorX == null ? -1 : nearestIndex(props.data[0], props.cursorX);
  // Which y scale sits on which side (and which grows downwards), for people's tools and tests.
  const axesText = (props.axes ?? [{ scale: "y", side: 3 }]).map((a) => `${a.scale}:${a.side === 3 ? "left" : "right"}${props.scales?.[a.scale]?.dir === -1 ? ":down" : ""}`).join(" ");
  return (
    <figure className="min-w-0" data-testid={props.testId} data-points={props.data[0].length} data-axes={axesText} data-series-scales={props.series.map((s) => s.scale ?? "y").join(" ")}>
      <figcaption className="flex flex-wrap items-center gap-x-2 gap-y-1 px-1 text-xs">
        <span className="font-semibold text-ink-100">{props.title}</span>
        {props.unit && <span className="text-ink-400">[{props.unit}]</span>}
        {k >= 0 &&
          props.series.map((s, i) => {
            const v = props.data[i + 1]?.[k];
            const ok = v != null && Number.isFinite(v);
            return (
              <span
                key={i}
                data-testid={`chip-${props.testId}-${i}`}
                data-si={ok && s.toSi ? s.toSi(v as number) : ""}
                className="inline-flex items-center gap-1 rounded-full border border-ink-700 bg-ink-950 px-1.5 py-px font-mono text-[11px] text-ink-100"
              >
                <span aria-hidden className="h-2 w-2 rounded-full" style={{ background: s.colour }} />
                <span className="text-ink-400">{s.chip ?? s.label}</span>
                <span className="num">{ok ? (s.format ? s.format(v as number) : String(v)) : "–"}</span>
              </span>
            );
          })}
        {props.captionExtra}
      </figcaption>
      <div ref={host} className="w-full" />
    </figure>
  );
}

/** One trace's uPlot options (the first, the reference lap, a little heavier). */
function seriesOptions(s: PaneSeries, i: number): uPlot.Series {
  return {
    label: s.label,
    stroke: s.colour,
    scale: s.scale ?? "y",
    width: i === 0 ? 2 : 1.5,
    dash: s.dash,
    points: { show: false },
    ...(s.stepped ? { paths: uPlot.paths.stepped!({ align: 1 }) } : {}),
  };
}

/** A round step (1, 2 or 5 × 10^n) at least `raw`. */
function niceStep(raw: number): number {
  if (!(raw > 0)) return 1;
  const p = 10 ** Math.floor(Math.log10(raw));
  const f = raw / p;
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10) * p;
}
