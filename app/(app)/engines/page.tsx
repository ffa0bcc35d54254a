import type { Metadata } from "next";
import Link from "next/link";
import { pageTeam } from "@/lib/auth/page-guard";
import { listSeasonEngines } from "@/lib/data/engine-season";
import { listBikes } from "@/lib/data/bikes";
import { canEditSetup } from "@/lib/data/setup-access";
import { SetupCaution } from "@/components/setup/setup-caution";
import { MoveEngineForm, RebuildForm } from "@/components/record/engine-history-forms";
import { EngineSessionFigures } from "@/components/bikes/engine-session-figures";

export const metadata: Metadata = { title: "Engines" };

const pct = (n: number | null) => (n == null ? "—" : `${n.toFixed(0)} %`);

export default async function EnginesPage({ searchParams }: { searchParams: Promise<{ rpm?: string }> }) {
  const ctx = await pageTeam({}, "/engines");
  const rpmRaw = Number((await searchParams).rpm);
  const rpm = Number.isFinite(rpmRaw) && rpmRaw >= 1000 && rpmRaw <= 25000 ? rpmRaw : undefined;
  const [engines, bikes] = await Promise.all([listSeasonEngines(ctx, rpm), listBikes(ctx)]);
  const editable = canEditSetup(ctx);
  const today = new Date().toISOString().slice(0, 10);
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
          <h1 className="text-2xl font-semibold">Engines across the season</h1>
          <p className="mt-1 text-sm text-ink-400">
            Life since the last rebuild: hours and distance when fitted plus every analysed session on the days after it. Warns at 80 % of the rebuild interval (Lapbench&apos;s default, not a manufacturer&apos;s figure).
          </p>
        </div>
        <form method="get" className="flex items-end gap-2" aria-label="Time above rpm">
          <div>
            <label className="label" htmlFor="rpm">Time above</label>
            <input id="rpm" name="rpm" className="field num w-28" inputMode="numeric" defaultValue={rpm ?? ""} placeholder="each bike's" />
          </div>
          <span className="pb-2 text-sm text-ink-400">rpm</span>
          <button className="btn-quiet">Show</button>
        </form>
      </div>
      <SetupCaution />
      {engines.length === 0 && <p className="card text-sm text-ink-400">No engines yet. Add them on a bike&apos;s page.</p>}
      {engines.map((e) => {
        const l = e.ledger;
        return (
          <article key={e.id} className="card space-y-4" data-testid="season-engine" aria-label={`Engine ${e.serial}`}>
            <header className="flex flex-wrap items-baseline justify-between gap-2">
              <h2 className="text-lg font-semibold">
                Engine <span className="num">{e.serial}</span>
              </h2>
              <p className="text-sm text-ink-300">
                {e.bikeId ? (
                  <Link className="text-signal-400 hover:underline" href={`/bikes/${e.bikeId}`}>
                    in {e.bikeName}
                  </Link>
                ) : (
                  "on the shelf"
                )}
                {" · "}last rebuild {e.lastRebuild ?? "not recorded"}
              </p>
            </header>
            {l.warning && (
              <p role="alert" data-testid="engine-warning" className={`rounded-md border px-3 py-2 text-sm ${l.warning.level === "due" ? "border-alert-500/60 bg-alert-500/10 text-alert-400" : "border-signal-600/60 bg-signal-500/10 text-signal-400"}`}>
                {l.warning.message} Plan the rebuild by the manufacturer&apos;s service data.
              </p>
            )}
            <dl className="grid grid-cols-2 gap-3 sm:grid-cols-5">
              <Stat label="Hours since rebuild" value={`${l.hours.toFixed(2)} h`} sub={e.rebuildIntervalH ? `of ${e.rebuildIntervalH} h · ${pct(l.hoursUsedPct)}` : "no interval set"} />
              <Stat label="Distance since rebuild" value={`${l.km.toFixed(0)} km`} sub={e.rebuildIntervalKm ? `of ${e.rebuildIntervalKm} km · ${pct(l.kmUsedPct)}` : "no interval set"} />
              <Stat label="Over-revs" value={String(l.ceilingExceedances)} sub="rev-ceiling exceedances" />
              <Stat label={`Above ${Math.round(e.rpm).toLocaleString("en-GB")} rpm`} value={`${l.timeAboveRpmS.toFixed(1)} s`} />
              <Stat label="Sessions / events" value={`${e.sessions.length} / ${e.events.length}`} sub={e.events.join(", ") || "—"} />
            </dl>
            {e.sessions.length > 0 && (
              <details>
                <summary className="cursor-pointer text-sm text-ink-300 hover:text-ink-100">Sessions ({e.sessions.length})</summary>
                <table className="table-plain mt-2">
                  <thead>
                    <tr>
                      <th>Session</th>
                      <th>Event</th>
                      <th className="text-right">Hours</th>
                      <th className="text-right">km</th>
                      <th className="text-right">Above rpm</th>
                      <th className="text-right">Over-revs</th>
                    </tr>
                  </thead>
                  <tbody>
                    {e.sessions.map((s) => (
                      <tr key={s.sessionId}>
                        <td>
                          <Link className="text-signal-400 hover:underline" href={`/sessions/${s.sessionId}`}>
                            {s.title}
                          </Link>
                          <span className="ml-2 text-xs text-ink-400">{s.startedAt?.slice(0, 10)}</span>
                        </td>
                        <td>{s.eventName ?? "—"}</td>
                        <EngineSessionFigures s={s} />
                      </tr>
                    ))}
                  </tbody>
                </table>
              </details>
            )}
            <div>
              <h3 className="text-xs font-semibold uppercase tracking-wide text-trace-400">History</h3>
              {e.history.length === 0 ? (
                <p className="text-sm text-ink-400">No rebuilds or moves on record.</p>
              ) : (
                <ul className="text-sm" data-testid="engine-history">
                  {e.history.map((h) => (
                    <li key={h.id} data-kind={h.kind}>
                      <span className="num">{h.onDate}</span> ·{" "}
                      {h.kind === "rebuild" ? `Rebuilt after ${h.hoursBefore?.toFixed(1) ?? "?"} h, ${h.kmBefore?.toFixed(0) ?? "?"} km` : `Moved from ${h.fromBike ?? "the shelf"} to ${h.toBike ?? "the shelf"}`}
                      {h.note && <span className="text-ink-300"> — {h.note}</span>}
                      {h.by && <span className="text-xs text-ink-400"> ({h.by})</span>}
                    </li>
                  ))}
                </ul>
              )}
            </div>
            {editable && (
              <details className="border-t border-ink-800 pt-3">
                <summary className="cursor-pointer text-sm text-ink-300 hover:text-ink-100">Move or record a rebuild</summary>
                <div className="mt-3 space-y-5">
                  <MoveEngineForm engineId={e.id} serial={e.serial} bikeId={e.bikeId} bikes={bikes.map((b) => ({ id: b.id, name: b.name }))} today={today} />
                  <RebuildForm engineId={e.id} serial={e.serial} today={today} />
                </div>
              </details>
            )}
          </article>
        );
      })}
    </div>
  );
}

function Stat({ label, value, sub }: { label: string; value: string; sub?: string }) {
  return (
    <div>
      <dt className="text-xs uppercase tracking-wide text-ink-400">{label}</dt>
      <dd className="num text-lg font-semibold">{value}</dd>
      {sub && <dd className="text-xs text-ink-400">{sub}</dd>}
    </div>
  );
}
