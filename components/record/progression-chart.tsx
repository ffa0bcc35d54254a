"use client";
/** Best lap and best-three mean per event at one track, across the season (uPlot, x = event date). */
import { useEffect, useRef } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import type { ProgressionPoint } from "@/lib/record/event-progression";
import { formatLapTime } from "@/lib/export/format-lap-time";

const AXIS = { stroke: "#a3adb9", grid: { stroke: "#2a323c", width: 1 }, ticks: { stroke: "#2a323c", width: 1 }, font: "11px var(--font-mono), monospace" };

export function ProgressionChart({ points }: { points: ProgressionPoint[] }) {
  const host = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const node = host.current!;
    const xs = points.map((p) => Date.parse(`${p.eventDate}T12:00:00Z`) / 1000);
    const best = points.map((p) => (p.bestLapMs == null ? null : p.bestLapMs / 1000));
    const mean = points.map((p) => (p.bestThreeMeanMs == null ? null : p.bestThreeMeanMs / 1000));
    const u = new uPlot(
      {
        width: Math.max(280, node.clientWidth),
        height: 240,
        scales: { x: { time: true }, y: { auto: true } },
        series: [
          {},
          { label: "Best lap", stroke: "#ffb84d", width: 2, points: { size: 8 }, value: (_u, v) => (v == null ? "—" : formatLapTime(v * 1000)) },
          { label: "Best-3 mean", stroke: "#4fd1c5", width: 2, dash: [6, 4], points: { size: 8 }, value: (_u, v) => (v == null ? "—" : formatLapTime(v * 1000)) },
        ],
        axes: [
          { ...AXIS, size: 34 },
          { ...AXIS, size: 70, values: (_u, vals) => vals.map((v) => formatLapTime(v * 1000)) },
        ],
      },
      [xs, best, mean] as uPlot.AlignedData,
      node,
    );
    node.dataset.drawn = "true";
    const ro = new ResizeObserver(() => u.setSize({ width: Math.max(280, node.clientWidth), height: 240 }));
    ro.observe(node);
    return () => {
      ro.disconnect();
      u.destroy();
    };
  }, [points]);
  return <div ref={host} data-testid="progression-chart" data-points={points.length} className="w-full" />;
}
