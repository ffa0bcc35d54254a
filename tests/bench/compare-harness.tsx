/**
 * Browser side of `npm run bench:compare`, bundled with esbuild into one script: the same binary
 * message drawn two ways, each timed from "the bytes are in the page" to "every pane has drawn":
 *   ours — decodeSeries, unit conversion as the Compare view does it, React rendering one
 *          ChartPane per channel plus the Running gap (components/compare/chart-pane.tsx);
 *   bare — decodeSeries, then `new uPlot()` per pane on the same typed arrays, nothing else.
 */
import { createRoot } from "react-dom/client";
import uPlot from "uplot";
import { decodeSeries } from "@/lib/series/binary";
import type { LapSeriesMeta } from "@/lib/series/lap-series-meta";
import { displayUnitIn } from "@/lib/units/unit-system";
import { ChartPane } from "@/components/compare/chart-pane";
import { lapColour } from "@/components/compare/lap-colours";

function convert(a: ArrayLike<number>, factor: number, offset: number): Float64Array {
  const out = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i] * factor + offset;
  return out;
}

const host = () => {
  const el = document.getElementById("root")!;
  el.innerHTML = "";
  return el;
};

function runOurs(buf: ArrayBuffer): Promise<number> {
  const t0 = performance.now();
  const { meta, arrays } = decodeSeries<LapSeriesMeta>(buf);
  const panes = meta.panes.map((p) => {
    const du = displayUnitIn("metric", p.role, p.unit);
    return { key: p.role, title: p.label, unit: du.unit, data: [convert(arrays[p.x], 1, 0), ...p.series.map((s) => convert(arrays[s!], du.factor, du.offset))] as uPlot.AlignedData };
  });
  if (meta.gap) panes.unshift({ key: "gap", title: "Running gap", unit: "s", data: [convert(arrays[meta.gap.x], 1, 0), ...meta.gap.series.slice(1).map((s) => convert(arrays[s!], 1, 0))] as uPlot.AlignedData });
  const series = meta.laps.map((_, i) => ({ label: `Lap ${i}`, colour: lapColour(i) }));
  return new Promise((resolve) => {
    const drawn = new Set<string>();
    const root = createRoot(host());
    root.render(
      <div style={{ width: 1400 }}>
        {panes.map((p) => (
          <ChartPane
            key={p.key}
            testId={p.key}
            title={p.title}
            unit={p.unit}
            data={p.data}
            series={p.key === "gap" ? series.slice(1) : series}
            height={140}
            syncKey="bench"
            xRange={null}
            onXRange={() => {}}
            onCursorX={() => {}}
            onDrawn={() => {
              drawn.add(p.key);
              if (drawn.size === panes.length) resolve(performance.now() - t0);
            }}
          />
        ))}
      </div>,
    );
  });
}

function runBare(buf: ArrayBuffer): Promise<number> {
  const t0 = performance.now();
  const { meta, arrays } = decodeSeries<LapSeriesMeta>(buf);
  const cols: uPlot.AlignedData[] = meta.panes.map((p) => [arrays[p.x], ...p.series.map((s) => arrays[s!])] as uPlot.AlignedData);
  if (meta.gap) cols.unshift([arrays[meta.gap.x], ...meta.gap.series.slice(1).map((s) => arrays[s!])] as uPlot.AlignedData);
  const el = host();
  return new Promise((resolve) => {
    let done = 0;
    for (const data of cols) {
      const div = document.createElement("div");
      el.appendChild(div);
      new uPlot(
        {
          width: 1340,
          height: 140,
          scales: { x: { time: false } },
          legend: { show: false },
          series: [{}, ...data.slice(1).map((_, i) => ({ stroke: lapColour(i), points: { show: false } }))],
          hooks: { draw: [() => { if (++done === cols.length) resolve(performance.now() - t0); }] },
        },
        data,
        div,
      );
    }
  });
}

Object.assign(window, { runOurs, runBare });
