"use client";
/**
 * One Compare pane: a uPlot chart created once on mount and fed new data with setData (STYLE
 * habit 6). Cursor sync goes through uPlot's own cursor.sync key; zoom through its setScale hook,
 * reported up so every pane and the URL follow.
 */
import { useEffect, useRef } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";

export interface PaneSeries {
  label: string;
  colour: string;
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
}

const AXIS = { stroke: "#a3adb9", grid: { stroke: "#2a323c", width: 1 }, ticks: { stroke: "#2a323c", width: 1 }, font: "11px var(--font-mono), monospace" };

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

  useEffect(() => {
    latest.current = props;
  });

  // Create once; destroy on unmount.
  useEffect(() => {
    const node = host.current!;
    const opts: uPlot.Options = {
      width: Math.max(200, node.clientWidth),
      height: latest.current.height,
      scales: { x: { time: false } },
      legend: { show: false },
      series: [{}],
      axes: [
        { ...AXIS, size: 30 },
        { ...AXIS, size: 56 },
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
        draw: [
          (u) => {
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
    const u = new uPlot(opts, [[]], node);
    plot.current = u;
    const ro = new ResizeObserver(() => {
      const w = Math.max(200, node.clientWidth);
      if (w !== u.width) u.setSize({ width: w, height: latest.current.height });
    });
    ro.observe(node);
    return () => {
      ro.disconnect();
      u.destroy();
      plot.current = null;
    };
  }, []);

  // New data: adjust the series set only when laps change, then setData (one redraw).
  useEffect(() => {
    const u = plot.current;
    if (!u) return;
    const key = props.series.map((s) => `${s.label}|${s.colour}`).join(";");
    if (key !== seriesKey.current) {
      for (let i = u.series.length - 1; i >= 1; i--) u.delSeries(i);
      u.setData(props.data, false);
      props.series.forEach((s, i) => u.addSeries({ label: s.label, stroke: s.colour, width: i === 0 ? 2 : 1.5, points: { show: false } }, i + 1));
      seriesKey.current = key;
    }
    u.setData(props.data, true);
    const xs = props.data[0];
    if (props.xRange) u.setScale("x", { min: props.xRange[0], max: props.xRange[1] });
    ownRange.current = props.xRange ?? (xs.length ? [xs[0], xs[xs.length - 1]] : null);
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

  return (
    <figure className="min-w-0" data-testid={props.testId}>
      <figcaption className="flex items-baseline gap-2 px-1 text-xs">
        <span className="font-semibold text-ink-100">{props.title}</span>
        {props.unit && <span className="text-ink-400">[{props.unit}]</span>}
      </figcaption>
      <div ref={host} className="w-full" />
    </figure>
  );
}
