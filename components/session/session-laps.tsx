/**
 * The session's lap table: lap and sector times with the session's best marked, top speed, flags,
 * the Best-sector lap, selection for Compare, and the CSV / GPX exports.
 */
import Link from "next/link";
import { cookies } from "next/headers";
import type { listSessionLaps, LapRow } from "@/lib/data/laps";
import { bestSectorLap } from "@/lib/laps/best-sector-lap";
import { isFlyingLap } from "@/lib/laps/types";
import { formatLapTime } from "@/lib/export/format-lap-time";
import { formatDisplay } from "@/lib/units/display";
import { UNIT_COOKIE, displayUnitIn, parseUnitSystem } from "@/lib/units/unit-system";
import { UnitToggle } from "@/components/units/unit-toggle";

/** Sector times and small differences read as seconds ("24.570"); a minute or more as m:ss.SSS. */
function formatShortTime(ms: number): string {
  return ms < 60_000 ? (Math.round(ms) / 1000).toFixed(3) : formatLapTime(ms);
}

function Best({ children, best, label }: { children: React.ReactNode; best: boolean; label: string }) {
  if (!best) return <>{children}</>;
  // Our mark: amber text on a faint amber bar, and words for screen readers.
  return (
    <span className="rounded-sm bg-signal-500/15 px-1 font-semibold text-signal-400" title={`Best ${label} of the session`} data-best={label}>
      {children}
      <span className="sr-only"> (best {label})</span>
    </span>
  );
}

function Flags({ lap }: { lap: LapRow }) {
  const flags: { text: string; cls: string }[] = [];
  if (lap.outLap) flags.push({ text: "out-lap", cls: "border-ink-600 text-ink-300" });
  if (lap.inLap) flags.push({ text: "in-lap", cls: "border-ink-600 text-ink-300" });
  if (lap.pitPass) flags.push({ text: "pit", cls: "border-trace-500/60 text-trace-400" });
  if (lap.invalid) flags.push({ text: "invalid", cls: "border-alert-500/60 text-alert-400" });
  if (lap.suspect) flags.push({ text: "suspect: missed crossing?", cls: "border-alert-500/60 text-alert-400" });
  if (!lap.complete && !lap.outLap && !lap.inLap) flags.push({ text: "partial", cls: "border-ink-600 text-ink-300" });
  return (
    <span className="flex flex-wrap gap-1">
      {flags.map((f) => (
        <span key={f.text} className={`rounded border px-1.5 py-px text-[11px] font-medium uppercase tracking-wide ${f.cls}`}>
          {f.text}
        </span>
      ))}
    </span>
  );
}

export async function SessionLaps({ data }: { data: ReturnType<typeof listSessionLaps> }) {
  const { session, laps } = await data;
  const sessionId = session.id;
  const system = parseUnitSystem((await cookies()).get(UNIT_COOKIE)?.value);
  const speedUnit = displayUnitIn(system, "speed_front", "m/s");

  if (laps.length === 0) {
    return (
      <section aria-labelledby="laps-heading" className="card" data-testid="laps-empty">
        <h2 id="laps-heading" className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-300">Laps</h2>
        <p className="font-medium">No laps in this session</p>
        <p className="mt-1 text-sm text-ink-400">
          {session.status !== "ready"
            ? "Laps appear once the session has been read."
            : "Laps are split where the GPS path crosses a track's start/finish line. This session matched none of the team's tracks (or has no GPS position), so no line was crossed. Add the track with its gates, then analyse the session again."}
        </p>
      </section>
    );
  }

  const lib = laps; // a LapRow is a lib/laps Lap with the stored extras
  const flying = laps.filter((l, i) => isFlyingLap(lib[i]!));
  const sectorCount = laps.reduce((m, l) => Math.max(m, l.sectorTimesMs.length), 0);
  const bestLapMs = flying.length ? Math.min(...flying.map((l) => l.lapTimeMs)) : null;
  const bestSectorMs = Array.from({ length: sectorCount }, (_, s) => {
    const ts = flying.map((l) => l.sectorTimesMs[s]).filter((t): t is number => t != null);
    return ts.length ? Math.min(...ts) : null;
  });
  const tops = laps.map((l) => l.topSpeedMps).filter((v): v is number => v != null);
  const bestTop = tops.length ? Math.max(...tops) : null;
  const bsl = bestSectorLap(lib);
  // The default selection for Compare: the best flying lap against the next best.
  const ranked = [...flying].sort((a, b) => a.lapTimeMs - b.lapTimeMs);

  return (
    <section aria-labelledby="laps-heading" className="card" data-testid="laps">
      <div className="mb-3 flex flex-wrap items-center gap-3">
        <h2 id="laps-heading" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Laps</h2>
        <span className="text-xs text-ink-400">{flying.length} flying of {laps.length}</span>
        <div className="ml-auto flex items-center gap-2">
          <UnitToggle initial={system} />
          <a className="btn-quiet py-1 text-xs" href={`/api/sessions/${sessionId}/laps.csv`} download>
            Lap table (CSV)
          </a>
        </div>
      </div>
      <form action="/compare" method="get">
        <div className="overflow-x-auto">
          <table className="table-plain" data-testid="lap-table">
            <thead>
              <tr>
                <th scope="col"><span className="sr-only">Compare</span></th>
                <th scope="col">Lap</th>
                <th scope="col">Lap time</th>
                {Array.from({ length: sectorCount }, (_, s) => (
                  <th scope="col" key={s}>Sector {s + 1}</th>
                ))}
                <th scope="col">Top speed [{speedUnit.unit}]</th>
                <th scope="col">Flags</th>
                <th scope="col"><span className="sr-only">Export</span></th>
              </tr>
            </thead>
            <tbody>
              {laps.map((l) => (
                <tr key={l.number} data-testid={`lap-row-${l.number}`} className={l.invalid ? "text-ink-400 line-through decoration-ink-600" : undefined}>
                  <td className="w-8">
                    <input
                      type="checkbox"
                      name="lap"
                      value={`${sessionId}:${l.number}`}
                      aria-label={`Select lap ${l.number} for Compare`}
                      defaultChecked={ranked.length >= 2 && (l === ranked[0] || l === ranked[1])}
                      className="size-4 accent-signal-500"
                    />
                  </td>
                  <td className="num">{l.number}</td>
                  <td className="num">
                    <Best best={bestLapMs != null && l.lapTimeMs === bestLapMs && flying.includes(l)} label="lap">{formatLapTime(l.lapTimeMs)}</Best>
                  </td>
                  {Array.from({ length: sectorCount }, (_, s) => {
                    const t = l.sectorTimesMs[s];
                    return (
                      <td key={s} className="num">
                        {t == null ? "—" : <Best best={t === bestSectorMs[s] && flying.includes(l)} label={`sector ${s + 1}`}>{formatShortTime(t)}</Best>}
                      </td>
                    );
                  })}
                  <td className="num">
                    <Best best={l.topSpeedMps != null && l.topSpeedMps === bestTop} label="top speed">{formatDisplay(l.topSpeedMps, speedUnit)}</Best>
                  </td>
                  <td><Flags lap={l} /></td>
                  <td>
                    <a className="text-xs font-semibold text-trace-400 hover:underline" href={`/api/sessions/${sessionId}/laps/${l.number}/gpx`} download aria-label={`Lap ${l.number} as GPX`}>
                      GPX
                    </a>
                  </td>
                </tr>
              ))}
            </tbody>
            {bsl && (
              <tfoot>
                <tr data-testid="best-sector-lap" className="bg-ink-850">
                  <td />
                  <th scope="row" className="text-left text-xs font-semibold uppercase tracking-wide text-ink-300">Best-sector lap</th>
                  <td className="num font-semibold text-signal-400">{formatLapTime(bsl.timeMs)}</td>
                  {bsl.sectors.map((s) => (
                    <td key={s.sector} className="num">
                      {formatShortTime(s.timeMs)}
                      <span className="block text-[11px] text-ink-400">lap {s.lapNumber}</span>
                    </td>
                  ))}
                  <td colSpan={3} className="text-xs text-ink-400">
                    {bestLapMs != null ? `${formatShortTime(bestLapMs - bsl.timeMs)} s under the best lap` : ""}
                  </td>
                </tr>
              </tfoot>
            )}
          </table>
        </div>
        <div className="mt-3 flex items-center gap-3">
          <button type="submit" className="btn-primary">Compare selected</button>
          <span className="text-xs text-ink-400">The first lap ticked is the reference for the Running gap.</span>
          <Link href={`/compare`} className="ml-auto text-xs text-ink-400 hover:text-ink-100">Open Compare</Link>
        </div>
      </form>
    </section>
  );
}
