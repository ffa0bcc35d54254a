import type { Metadata } from "next";
import { gearsForViewer } from "@/lib/data/viewer-analyses";
import { viewerSession } from "@/lib/auth/viewer-session";
import { AnalysisHeader } from "@/components/analysis/analysis-header";
import { CautionNote } from "@/components/analysis/caution-note";

export const metadata: Metadata = { title: "Gears" };

export default async function GearsPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { ctx, session } = await viewerSession(id, `/sessions/${id}/gears`);
  const g = await gearsForViewer(ctx, session.id);
  const maxPct = Math.max(1, ...g.rows.map((r) => r.pct));
  return (
    <div className="space-y-6">
      <AnalysisHeader title="Gears" session={session} current="gears">
        <CautionNote />
      </AnalysisHeader>
      {g.source === "none" ? (
        <p className="card text-sm text-ink-300">{g.reason}</p>
      ) : (
        <div className="grid gap-6 lg:grid-cols-[2fr_3fr]">
          <section className="card" aria-labelledby="tig">
            <h2 id="tig" className="mb-1 text-sm font-semibold uppercase tracking-wide text-ink-300">Time in each gear</h2>
            <p className="mb-3 text-xs text-ink-400">
              {g.source === "logged" ? "From the logged gear channel." : "From engine speed against rear-wheel speed, matched to the bike's primary, gearbox and sprocket ratios."} Whole session.
            </p>
            <table className="table-plain" data-testid="gear-table">
              <thead>
                <tr><th>Gear</th><th className="text-right">Time</th><th className="w-1/2">Share</th></tr>
              </thead>
              <tbody>
                {g.rows.map((r) => (
                  <tr key={r.gear}>
                    <td>{r.gear === 0 ? "None (neutral, clutch, shifting)" : r.gear}</td>
                    <td className="num whitespace-nowrap text-right">{r.timeS.toFixed(1)} s</td>
                    <td>
                      <div className="flex items-center gap-2">
                        <div className="h-2 rounded bg-trace-500" style={{ width: `${(100 * r.pct) / maxPct}%` }} />
                        <span className="num whitespace-nowrap text-xs text-ink-400">{r.pct.toFixed(1)} %</span>
                      </div>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </section>
          <section className="card min-w-0" aria-labelledby="shifts">
            <h2 id="shifts" className="mb-1 text-sm font-semibold uppercase tracking-wide text-ink-300">Shifts ({g.shifts.length})</h2>
            <p className="mb-3 text-xs text-ink-400">
              {g.upshifts} upshifts, {g.clutchlessUpshifts} of them clutchless (throttle held open and engine speed dropping through the shift).
            </p>
            <div className="max-h-[32rem] overflow-auto">
              <table className="table-plain" data-testid="shift-table">
                <thead>
                  <tr><th>Time</th><th>Lap</th><th>Shift</th><th className="text-right">Engine speed</th><th className="text-right">Took</th><th>Clutchless</th></tr>
                </thead>
                <tbody>
                  {g.shifts.map((s) => (
                    <tr key={s.timeS}>
                      <td className="num">{s.timeS.toFixed(2)} s</td>
                      <td>{s.lap ?? "—"}</td>
                      <td>{s.fromGear} → {s.toGear} <span className="text-xs text-ink-400">{s.direction}</span></td>
                      <td className="num text-right">{Number.isFinite(s.rpmBefore) ? `${Math.round(s.rpmBefore)} → ${Math.round(s.rpmAfter)}` : "—"}</td>
                      <td className="num text-right">{(s.shiftTimeS * 1000).toFixed(0)} ms</td>
                      <td>{s.clutchless ? <span className="text-trace-400">yes</span> : ""}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>
        </div>
      )}
    </div>
  );
}
