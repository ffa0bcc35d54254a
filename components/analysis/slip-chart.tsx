"use client";
import { useEffect, useRef } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";

/**
 * Drive slip (%) and throttle (%) against lap distance. The chart is created once and fed new
 * data through setData; its width follows the container.
 */
export function SlipChart({ distanceM, slip, throttlePct, targetSlip }: { distanceM: (number | null)[]; slip: (number | null)[]; throttlePct: (number | null)[]; targetSlip: number }) {
  const box = useRef<HTMLDivElement>(null);
  const chart = useRef<uPlot | null>(null);

  useEffect(() => {
    const el = box.current!;
    const opts: uPlot.Options = {
      width: el.clientWidth || 800,
      height: 280,
      cursor: { drag: { x: true, y: false } },
      scales: { x: { time: false }, slip: { range: [-5, 20] }, thr: { range: [0, 100] } },
      axes: [
        { stroke: "#a3adb9", grid: { stroke: "#2a323c" }, label: "Distance into the lap (m)", labelSize: 18 },
        { scale: "slip", stroke: "#ffb84d", grid: { stroke: "#2a323c" }, label: "Drive slip (%)", labelSize: 18 },
        { scale: "thr", side: 1, stroke: "#4fd1c5", grid: { show: false }, label: "Throttle (%)", labelSize: 18 },
      ],
      series: [
        { label: "Distance (m)" },
        { label: "Drive slip (%)", scale: "slip", stroke: "#ffb84d", width: 1.5 },
        { label: "Throttle (%)", scale: "thr", stroke: "#4fd1c5", width: 1 },
        { label: "Target (%)", scale: "slip", stroke: "#ff7a70", width: 1, dash: [6, 4], points: { show: false } },
      ],
    };
    chart.current = new uPlot(opts, [[], [], [], []], el);
    const ro = new ResizeObserver(() => chart.current?.setSize({ width: el.clientWidth, height: 280 }));
    ro.observe(el);
    return () => {
      ro.disconnect();
      chart.current?.destroy();
      chart.current = null;
    };
  }, []);

  useEffect(() => {
    const pct = slip.map((s) => (s == null ? null : s * 100));
    const target = distanceM.map(() => targetSlip * 100);
    chart.current?.setData([distanceM as number[], pct, throttlePct, target] as uPlot.AlignedData);
  }, [distanceM, slip, throttlePct, targetSlip]);

  return <div ref={box} className="w-full" data-testid="slip-chart" />;
}
