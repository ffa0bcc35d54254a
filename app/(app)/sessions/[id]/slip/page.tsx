import type { Metadata } from "next";
import { slipForViewer } from "@/lib/data/viewer-analyses";
import { viewerSession } from "@/lib/auth/viewer-session";
import { AnalysisHeader, LapLinks } from "@/components/analysis/analysis-header";
import { CautionNote } from "@/components/analysis/caution-note";
import { SlipChart } from "@/components/analysis/slip-chart";
import { SlipScatterSvg } from "@/components/analysis/scatter-svg";

export const metadata: Metadata = { title: "Drive slip" };

const pct = (x: number | null | undefined, d = 1) => (x == null || !Number.isFinite(x) ? "—" : `${(x * 100).toFixed(d)} %`);

export default async function DriveSlipPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ lap?: string; lean?: string }> }) {
  const { id } = await params;
  const sp = await searchParams;
  const { ctx, session } = await viewerSession(id, `/sessions/${id}/slip`);
  const lean = sp.lean === "1";
  const lapParam = sp.lap ? Number(sp.lap) : null;
  const a = await slipForViewer(ctx, session.id, { lap: lapParam, lean });
  const href = (lap: number | null, leanOn = lean) => `/sessions/${session.id}/slip?${new URLSearchParams({ ...(lap != null ? { lap: String(lap) } : {}), ...(leanOn ? { lean: "1" } : {}) })}`;
  const cornerNames = a.exits[0]?.exits.map((e) => e.name) ?? [];
  return (
    <div className="space-y-6">
      <AnalysisHeader title="Drive slip" session={session} current="slip">
        <CautionNote />
      </AnalysisHeader>
      {!a.available ? (
        <p className="card text-sm text-ink-300">{a.reason}</p>
      ) : (
        <>
          <section className="card space-y-3 text-sm" aria-labelledby="conv">
            <h2 id="conv" className="text-sm font-semibold uppercase tracking-wide text-ink-300">How slip is read here</h2>
            <p>
              Slip = (v<sub>rear</sub> − v<sub>front</sub>) / v<sub>front</sub>, with the front wheel as the ground reference (SAE J670 longitudinal slip), shown while the front wheel is at
              30 km/h or more. Positive under drive, negative when the rear brakes.
            </p>
            <p data-testid="slip-target">
              Target used: <span className="num font-semibold text-signal-400">{pct(a.targetSlip)}</span>{" "}
              <span className="text-ink-400">
                ({a.targetSource === "default" ? "Lapbench default — set it per bike in Settings" : a.targetSource === "bike" ? "this bike's setting" : "this track's setting"})
              </span>
              . Zero calibration:{" "}
              {a.zero.applied ? (
                <span>
                  rear/front ratio <span className="num">{a.zero.ratio.toFixed(4)}</span> on steady straights ({a.zero.sampleCount} samples) taken as zero slip.
                </span>
              ) : (
                <span className="text-ink-400">{a.zero.reason ?? "not enough steady straight running"}; raw ratio used.</span>
              )}
            </p>
            <div className="flex flex-wrap items-center gap-3">
              {a.lean.possible ? (
                <a href={href(a.lap, !lean)} className="btn-quiet text-xs" role="switch" aria-checked={lean}>
                  Lean correction: {lean ? "on" : "off"}
                </a>
              ) : (
                <span className="text-xs text-ink-400">Lean correction needs a lean angle channel and the bike&apos;s front and rear circumferences and tyre crown radii.</span>
              )}
              {a.lean.possible ? <span className="text-xs text-ink-400">Corrects both wheels with the bike&apos;s tyre crown radii (front {a.lean.frontCrownRadiusMm} mm, rear {a.lean.crownRadiusMm} mm): r_eff = r₀ − r_c(1 − cos lean).</span> : null}
            </div>
          </section>

          <section className="card space-y-3" aria-labelledby="trace">
            <h2 id="trace" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Slip and throttle along the lap</h2>
            <LapLinks laps={a.laps} current={a.lap} href={(l) => href(l)} />
            {a.trace ? <SlipChart distanceM={a.trace.distanceM} slip={a.trace.slip} throttlePct={a.trace.throttlePct} targetSlip={a.targetSlip} /> : <p className="text-sm text-ink-400">No laps in this session.</p>}
          </section>

          <div className="grid gap-6 lg:grid-cols-[3fr_2fr]">
            <section className="card min-w-0" aria-labelledby="spins">
              <h2 id="spins" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Spin events ({a.spins.length})</h2>
              {a.spins.length === 0 ? (
                <p className="text-sm text-ink-400">No slip above the target under open throttle.</p>
              ) : (
                <div className="max-h-96 overflow-auto">
                  <table className="table-plain" data-testid="spin-table">
                    <thead>
                      <tr><th>Start</th><th>Lap</th><th>Corner</th><th className="text-right">Above target</th><th className="text-right">Peak</th></tr>
                    </thead>
                    <tbody>
                      {a.spins.map((e) => (
                        <tr key={e.startTimeS}>
                          <td className="num">{e.startTimeS.toFixed(2)} s</td>
                          <td>{e.lap ?? "—"}</td>
                          <td>{e.corner ?? "—"}</td>
                          <td className="num text-right">{e.durationS.toFixed(2)} s</td>
                          <td className="num text-right">{pct(e.peakSlip)}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              )}
            </section>
            <section className="card" aria-labelledby="scatter">
              <h2 id="scatter" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Slip against throttle</h2>
              <SlipScatterSvg throttlePct={a.scatter.throttlePct} slip={a.scatter.slip} targetSlip={a.targetSlip} />
              <p className="mt-1 text-xs text-ink-400">Whole session; dashed line: the target.</p>
            </section>
          </div>

          <section className="card overflow-x-auto" aria-labelledby="exits">
            <h2 id="exits" className="mb-1 text-sm font-semibold uppercase tracking-wide text-ink-300">Corner exits: peak slip per flying lap</h2>
            <p className="mb-3 text-xs text-ink-400">
              From each apex to 150 m after it (or the next corner). Time above target in brackets. Corners {a.cornerSource === "track" ? "as named on the track" : "found from the best lap's speed"}.
            </p>
            {cornerNames.length === 0 ? (
              <p className="text-sm text-ink-400">No flying laps or no corners to summarise.</p>
            ) : (
              <table className="table-plain" data-testid="exit-table">
                <thead>
                  <tr>
                    <th>Corner</th>
                    {a.exits.map((l) => (
                      <th key={l.lap} className="text-right">Lap {l.lap}</th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {cornerNames.map((name, ci) => (
                    <tr key={name}>
                      <td>{name}</td>
                      {a.exits.map((l) => {
                        const e = l.exits[ci];
                        const over = e && e.peakSlip > a.targetSlip;
                        return (
                          <td key={l.lap} className={`num text-right ${over ? "text-signal-400" : ""}`}>
                            {pct(e?.peakSlip)}
                            {e && e.timeAboveTargetS > 0 ? <span className="text-ink-400"> ({e.timeAboveTargetS.toFixed(2)} s)</span> : null}
                          </td>
                        );
                      })}
                    </tr>
                  ))}
                </tbody>
              </table>
            )}
          </section>
        </>
      )}
    </div>
  );
}
