/** Setup changes between consecutive sessions of a bike at a track, with what the lap times did. */
import Link from "next/link";
import type { EffectView } from "@/lib/data/setup-history";
import type { SetupFieldDef } from "@/lib/data/setup-sheets";
import { formatLapTime } from "@/lib/export/format-lap-time";
import { showSetupValue } from "./setup-values";

function signed(ms: number | null): string {
  if (ms == null) return "—";
  const s = (ms / 1000).toFixed(3);
  return ms > 0 ? `+${s} s` : `${s} s`;
}

function tone(ms: number | null): string {
  if (ms == null || ms === 0) return "text-ink-300";
  return ms < 0 ? "text-ok-400" : "text-alert-400";
}

export function EffectList({ view, fields }: { view: EffectView; fields: SetupFieldDef[] }) {
  const byName = new Map(fields.map((f) => [f.name, f]));
  if (view.effects.length === 0) return <p className="card text-sm text-ink-400">No setup change between consecutive sessions of one bike at one track yet.</p>;
  return (
    <div className="space-y-4">
      {view.effects.map((e) => (
        <section key={`${e.before.sessionId}-${e.after.sessionId}`} className="card space-y-3" data-testid="effect" data-before={e.before.sessionId} data-after={e.after.sessionId}>
          <h2 className="text-sm font-semibold">
            {e.bikeName ?? "Bike"} at {e.trackName ?? "track"}:{" "}
            <Link className="text-signal-400 hover:underline" href={`/sessions/${e.before.sessionId}/setup`}>
              {e.before.title}
            </Link>{" "}
            →{" "}
            <Link className="text-signal-400 hover:underline" href={`/sessions/${e.after.sessionId}/setup`}>
              {e.after.title}
            </Link>
          </h2>
          <div>
            <h3 className="text-xs font-semibold uppercase tracking-wide text-trace-400">What changed</h3>
            <ul className="text-sm" data-testid="effect-changes">
              {e.changes.map((c) => {
                const f = byName.get(c.field);
                return (
                  <li key={c.field}>
                    {f?.label ?? c.field}: {f?.kind === "longtext" ? "edited" : `${showSetupValue(f, c.before)} → ${showSetupValue(f, c.after)}`}
                  </li>
                );
              })}
            </ul>
          </div>
          <table className="table-plain">
            <thead>
              <tr>
                <th></th>
                <th>Before (setup v{e.before.setupVersion})</th>
                <th>After (setup v{e.after.setupVersion})</th>
                <th>Change</th>
              </tr>
            </thead>
            <tbody>
              <tr data-testid="effect-best">
                <td>Best lap</td>
                <td className="num">{formatLapTime(e.before.bestLapMs) || "—"}</td>
                <td className="num">{formatLapTime(e.after.bestLapMs) || "—"}</td>
                <td className={`num ${tone(e.bestLapDeltaMs)}`}>{signed(e.bestLapDeltaMs)}</td>
              </tr>
              <tr data-testid="effect-best3">
                <td>Best-three mean</td>
                <td className="num">{formatLapTime(e.before.bestThreeMeanMs) || "—"}</td>
                <td className="num">{formatLapTime(e.after.bestThreeMeanMs) || "—"}</td>
                <td className={`num ${tone(e.bestThreeMeanDeltaMs)}`}>{signed(e.bestThreeMeanDeltaMs)}</td>
              </tr>
              <tr>
                <td>Conditions</td>
                <td>{e.before.conditions ?? "not recorded"}</td>
                <td>{e.after.conditions ?? "not recorded"}</td>
                <td></td>
              </tr>
              {e.sectors.map((s) => (
                <tr key={s.sector} data-testid="effect-sector">
                  <td>Sector {s.sector} (best)</td>
                  <td className="num">{formatLapTime(s.beforeMs)}</td>
                  <td className="num">{formatLapTime(s.afterMs)}</td>
                  <td className={`num ${tone(s.deltaMs)}`}>{signed(s.deltaMs)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ))}
    </div>
  );
}
