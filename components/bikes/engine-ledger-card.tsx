import type { EngineWithLedger } from "@/lib/data/engines";
import { EngineForm } from "./bike-forms";
import { EngineSessionFigures } from "./engine-session-figures";

function pct(n: number | null): string {
  return n === null ? "—" : `${n.toFixed(0)} %`;
}

function duration(s: number): string {
  if (s < 60) return `${s.toFixed(1)} s`;
  const m = Math.floor(s / 60);
  return `${m} min ${Math.round(s - m * 60)} s`;
}

/** One engine's ledger: totals, use of each interval with a bar, the warning, the sessions. */
export function EngineLedgerCard({ engine, rpm, revCeilingRpm, editable, bikes }: { engine: EngineWithLedger; rpm: number; revCeilingRpm: number | null; editable: boolean; bikes: { id: number; name: string }[] }) {
  const l = engine.ledger;
  const tone = l.warning?.level === "due" ? "alert" : l.warning ? "signal" : "ok";
  return (
    <article className="card" data-testid="engine-ledger" aria-label={`Engine ${engine.serial}`}>
      <header className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="text-lg font-semibold">
          Engine <span className="num">{engine.serial}</span>
        </h3>
        <p className="text-xs text-ink-400">
          {l.sessionCount} analysed session{l.sessionCount === 1 ? "" : "s"}
          {engine.notes && <> · {engine.notes}</>}
        </p>
      </header>
      {l.warning && (
        <p role="alert" data-testid="ledger-warning" className={`mb-3 rounded-md border px-3 py-2 text-sm ${tone === "alert" ? "border-alert-500/60 bg-alert-500/10 text-alert-400" : "border-signal-600/60 bg-signal-500/10 text-signal-400"}`}>
          {l.warning.message} Plan the rebuild by the manufacturer&apos;s service data.
        </p>
      )}
      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        <Stat label="Running hours" value={`${l.hours.toFixed(2)} h`} sub={engine.rebuildIntervalH ? `of ${engine.rebuildIntervalH} h` : "no interval set"} />
        <Stat label="Distance" value={`${l.km.toFixed(0)} km`} sub={engine.rebuildIntervalKm ? `of ${engine.rebuildIntervalKm.toLocaleString("en-GB")} km` : "no interval set"} />
        <Stat label={`Above ${Math.round(rpm).toLocaleString("en-GB")} rpm`} value={duration(l.timeAboveRpmS)} />
        <Stat label="Rev-ceiling exceedances" value={String(l.ceilingExceedances)} sub={revCeilingRpm ? `ceiling ${revCeilingRpm.toLocaleString("en-GB")} rpm` : "no ceiling set"} />
      </dl>
      <div className="mt-4 space-y-2">
        <UseBar label="Hours" pctUsed={l.hoursUsedPct} />
        <UseBar label="Distance" pctUsed={l.kmUsedPct} />
      </div>
      {engine.sessions.length > 0 && (
        <details className="mt-4">
          <summary className="cursor-pointer text-sm text-ink-300 hover:text-ink-100">Sessions ({engine.sessions.length})</summary>
          <table className="table-plain mt-2">
            <thead>
              <tr>
                <th>Session</th>
                <th className="text-right">Hours</th>
                <th className="text-right">km</th>
                <th className="text-right">Above rpm</th>
                <th className="text-right">Exceed.</th>
              </tr>
            </thead>
            <tbody>
              {engine.sessions.map((s) => (
                <tr key={s.sessionId}>
                  <td>{s.title}<span className="ml-2 text-xs text-ink-400">{s.startedAt?.slice(0, 10)}</span></td>
                  <EngineSessionFigures s={s} />
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-2 text-xs text-ink-400">Hours when fitted: {engine.hoursAtInstall} h, {engine.kmAtInstall} km — counted in the totals above.</p>
        </details>
      )}
      {editable && (
        <details className="mt-4 border-t border-ink-800 pt-3">
          <summary className="cursor-pointer text-sm text-ink-300 hover:text-ink-100">Edit engine {engine.serial}</summary>
          <div className="mt-3">
            <EngineForm engine={engine} bikes={bikes} />
          </div>
        </details>
      )}
    </article>
  );
}

function Stat({ label, value, sub }: { label: string; value: string; sub?: string }) {
  return (
    <div className="rounded-md bg-ink-850 px-3 py-2">
      <dt className="text-xs text-ink-400">{label}</dt>
      <dd className="num text-lg font-semibold text-ink-100">{value}</dd>
      {sub && <dd className="text-xs text-ink-400">{sub}</dd>}
    </div>
  );
}

function UseBar({ label, pctUsed }: { label: string; pctUsed: number | null }) {
  if (pctUsed === null) return null;
  const w = Math.min(100, Math.max(0, pctUsed));
  const colour = pctUsed >= 100 ? "bg-alert-500" : pctUsed >= 80 ? "bg-signal-500" : "bg-trace-500";
  return (
    <div className="flex items-center gap-3 text-xs">
      <span className="w-16 text-ink-400">{label}</span>
      <div className="relative h-2 flex-1 rounded bg-ink-800" role="meter" aria-label={`${label} of the rebuild interval used`} aria-valuenow={Math.round(pctUsed)} aria-valuemin={0} aria-valuemax={100}>
        <div className={`h-2 rounded ${colour}`} style={{ width: `${w}%` }} />
        {/* The 80 % warning mark. */}
        <div className="absolute top-[-2px] h-3 w-px bg-ink-300" style={{ left: "80%" }} aria-hidden />
      </div>
      <span className="num w-12 text-right text-ink-100">{pct(pctUsed)}</span>
    </div>
  );
}
