"use client";
/**
 * Compare by corner: one small card per corner of the track, in lap order — each lap's speed
 * through the corner drawn small, with where it started braking, and the figures a rider reads in
 * the Rider brief: speed on entry, where braking started, the slowest point, speed on exit, and
 * the time gained or lost against the reference lap in that corner. A card opens the corner in
 * the whole-lap stack.
 */
import type { LapSeriesCorner, LapSeriesLapMeta } from "@/lib/series/lap-series-meta";
import type { DisplayUnit } from "@/lib/units/display";
import { formatDisplay } from "@/lib/units/display";
import { lapColour, GAIN_COLOUR, LOSS_COLOUR } from "./lap-colours";

export interface CornerTrace {
  /** SI x (m or s) and each lap's speed (m/s) at it, null where a lap has none. */
  x: ArrayLike<number>;
  speeds: (ArrayLike<number> | null)[];
}

interface CornerViewProps {
  laps: LapSeriesLapMeta[];
  corners: LapSeriesCorner[];
  cornerSource: "track" | "found" | "none";
  trace: CornerTrace | null;
  speedUnit: DisplayUnit;
  distanceUnit: DisplayUnit;
  onOpen: (corner: LapSeriesCorner) => void;
}

const W = 232;
const H = 78;

function Spark({ corner, trace, laps }: { corner: LapSeriesCorner; trace: CornerTrace; laps: number }) {
  // Points of the stretch, then one polyline per lap, all on one speed scale.
  let i0 = 0;
  while (i0 < trace.x.length && trace.x[i0] < corner.fromX) i0++;
  let i1 = i0;
  while (i1 < trace.x.length && trace.x[i1] <= corner.toX) i1++;
  let lo = Infinity;
  let hi = -Infinity;
  for (const s of trace.speeds) if (s) for (let i = i0; i < i1; i++) if (Number.isFinite(s[i])) { lo = Math.min(lo, s[i]); hi = Math.max(hi, s[i]); }
  if (!Number.isFinite(lo) || i1 - i0 < 2) return <div className="h-[78px] rounded bg-ink-950" />;
  const px = (x: number) => ((x - corner.fromX) / Math.max(1e-9, corner.toX - corner.fromX)) * (W - 4) + 2;
  const py = (v: number) => H - 4 - ((v - lo) / Math.max(1e-9, hi - lo)) * (H - 10);
  const apex = px(corner.x);
  return (
    <svg viewBox={`0 0 ${W} ${H}`} width="100%" height={H} className="rounded bg-ink-950" aria-hidden>
      <line x1={apex} x2={apex} y1={0} y2={H} stroke="#3a4450" strokeDasharray="3 3" />
      {Array.from({ length: laps }, (_, k) => laps - 1 - k).map((lap) => {
        const s = trace.speeds[lap];
        if (!s) return null;
        let d = "";
        for (let i = i0; i < i1; i++) if (Number.isFinite(s[i])) d += `${d ? "L" : "M"}${px(trace.x[i]).toFixed(1)},${py(s[i]).toFixed(1)}`;
        return <path key={lap} d={d} fill="none" stroke={lapColour(lap)} strokeWidth={lap === 0 ? 2 : 1.5} />;
      })}
    </svg>
  );
}

export function CornerView({ laps, corners, cornerSource, trace, speedUnit, distanceUnit, onOpen }: CornerViewProps) {
  if (corners.length === 0)
    return (
      <div className="card text-sm text-ink-400" data-testid="corner-view">
        No corners: name them on the track page, or compare laps with a speed channel so they can be found from the reference lap.
      </div>
    );
  const sp = (v: number | null | undefined) => (v == null || !Number.isFinite(v) ? "–" : formatDisplay(v, speedUnit));
  return (
    <section aria-label="Corners" data-testid="corner-view" className="space-y-2">
      <p className="px-1 text-xs text-ink-400">
        {cornerSource === "track" ? "The track's named corners" : "Corners found from the reference lap's speed (name them on the track page)"}, each from halfway after the corner before to halfway
        to the next. Speeds in {speedUnit.unit}; braking is where front pressure first passed 5 bar, counted back from the reference lap&apos;s slowest point. Time gained is against lap {laps[0].lap}.
      </p>
      <ol className="grid gap-3 sm:grid-cols-2 2xl:grid-cols-3">
        {corners.map((c, k) => {
          const refApex = c.laps[0]?.apexM ?? null;
          return (
            <li key={c.name} className="card space-y-2 p-3" data-testid="corner-card" data-corner={c.name}>
              <button type="button" className="flex w-full items-baseline justify-between gap-2 text-left" onClick={() => onOpen(c)} aria-label={`Open ${c.name} in the whole lap`}>
                <span className="font-semibold text-ink-100">
                  <span className="mr-1.5 text-ink-400">{k + 1}</span>
                  {c.name}
                </span>
                <span className="text-[11px] text-trace-400">whole lap →</span>
              </button>
              {trace && <Spark corner={c} trace={trace} laps={laps.length} />}
              <table className="w-full text-[11px]">
                <thead>
                  <tr className="text-left text-ink-400">
                    <th className="font-normal">lap</th>
                    <th className="text-right font-normal">entry</th>
                    <th className="text-right font-normal">brakes</th>
                    <th className="text-right font-normal">slowest</th>
                    <th className="text-right font-normal">exit</th>
                    <th className="text-right font-normal">gained</th>
                  </tr>
                </thead>
                <tbody className="font-mono">
                  {laps.map((l, i) => {
                    const f = c.laps[i];
                    const before = f?.brakingPointM != null && refApex != null ? refApex - f.brakingPointM : null;
                    const g = f?.gainedS;
                    return (
                      <tr key={`${l.sessionId}:${l.lap}`}>
                        <td>
                          <span className="inline-flex items-center gap-1">
                            <span aria-hidden className="h-2 w-2 rounded-full" style={{ background: lapColour(i) }} />L{l.lap}
                          </span>
                        </td>
                        <td className="text-right">{sp(f?.entrySpeedMps)}</td>
                        <td className="text-right" title="before the reference lap's slowest point">
                          {before == null ? "–" : `${formatDisplay(before, distanceUnit)} ${distanceUnit.unit}`}
                        </td>
                        <td className="text-right">{sp(f?.minSpeedMps)}</td>
                        <td className="text-right">{sp(f?.exitSpeedMps)}</td>
                        <td className="text-right" data-testid={`corner-gained-${k}-${i}`} data-si={g ?? ""} style={{ color: i === 0 || g == null ? undefined : g >= 0 ? GAIN_COLOUR : LOSS_COLOUR }}>
                          {i === 0 ? "ref" : g == null ? "–" : `${g >= 0 ? "+" : "−"}${Math.abs(g).toFixed(3)} s`}
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </li>
          );
        })}
      </ol>
    </section>
  );
}
