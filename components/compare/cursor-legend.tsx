"use client";
/** Values of every lap at the cursor, as a table (names in words, colour only as a swatch). */
import type { DisplayUnit } from "@/lib/units/display";
import { formatDisplay } from "@/lib/units/display";
import { formatLapTime } from "@/lib/export/format-lap-time";
import type { LapSeriesLapMeta } from "@/lib/series/lap-series-meta";
import { lapColour } from "./lap-colours";
import { nearestIndex } from "./series-lookup";

export interface LegendRow {
  key: string;
  title: string;
  unit: DisplayUnit;
  /** SI x column and each lap's SI values (null: lap lacks the channel). */
  x: ArrayLike<number>;
  series: (ArrayLike<number> | null)[];
}

export function CursorLegend({ laps, rows, cursorX, xUnit, xLabel }: { laps: LapSeriesLapMeta[]; rows: LegendRow[]; cursorX: number | null; xUnit: DisplayUnit; xLabel: string }) {
  return (
    <div className="overflow-x-auto">
      <table className="table-plain" data-testid="legend" aria-live="off">
        <caption className="mb-1 text-left text-xs text-ink-400">
          Values at the cursor
          {cursorX != null && (
            <span className="ml-2 text-ink-100" data-testid="legend-x" data-si={cursorX}>
              {xLabel} {formatDisplay(cursorX, xUnit)} {xUnit.unit}
            </span>
          )}
        </caption>
        <thead>
          <tr>
            <th scope="col">Channel</th>
            {laps.map((l, i) => (
              <th scope="col" key={`${l.sessionId}:${l.lap}`} className="normal-case">
                <span className="flex items-center gap-1.5">
                  <span aria-hidden className="h-2.5 w-2.5 rounded-sm" style={{ background: lapColour(i) }} />
                  <span className="font-semibold text-ink-100">Lap {l.lap}</span>
                </span>
                <span className="block font-normal text-ink-400">
                  {l.sessionTitle}
                  {l.riderName ? ` · ${l.riderName}` : ""} · <span className="num">{formatLapTime(l.lapTimeMs)}</span>
                  {i === 0 ? " · reference" : ""}
                </span>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key}>
              <th scope="row" className="whitespace-nowrap text-left text-xs font-medium normal-case text-ink-300">
                {r.title} {r.unit.unit && <span className="text-ink-400">[{r.unit.unit}]</span>}
              </th>
              {laps.map((_, i) => {
                const ys = r.series[i];
                const k = cursorX == null ? -1 : nearestIndex(r.x, cursorX);
                const v = ys && k >= 0 ? ys[k] : null;
                return (
                  <td key={i} className="num" data-testid={`legend-${r.key}-${i}`} data-si={v ?? ""}>
                    {ys == null ? <span className="text-ink-400">{r.key === "gap" && i === 0 ? "reference" : "no channel"}</span> : formatDisplay(v, r.unit)}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
