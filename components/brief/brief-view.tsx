import Link from "next/link";
import type { RiderBrief, BriefCorner } from "@/lib/data/analysis";
import type { BriefSession } from "@/lib/data/brief-sessions";
import { TrackOutlineSvg, type OutlineMark } from "@/components/analysis/track-outline-svg";
import { fmtLap } from "@/components/analysis/analysis-header";

function tone(c: BriefCorner): OutlineMark["tone"] {
  if (c.earlierM === null) return "ink";
  if (Math.abs(c.earlierM) < 2) return "ok";
  return c.earlierM > 0 ? "trace" : "signal";
}

function Bar({ value, best, max, unit, label }: { value: number | null; best: number | null; max: number; unit: string; label: string }) {
  const w = (v: number | null) => `${v == null ? 0 : Math.max(2, Math.min(100, (100 * v) / max))}%`;
  return (
    <div className="space-y-1" aria-label={label}>
      <div className="flex items-center gap-2 text-xs">
        <span className="w-16 shrink-0 text-ink-400">This lap</span>
        <div className="h-2.5 flex-1 rounded bg-ink-800"><div className="h-2.5 rounded bg-signal-500" style={{ width: w(value) }} /></div>
        <span className="num w-20 text-right">{value == null ? "—" : `${value} ${unit}`}</span>
      </div>
      <div className="flex items-center gap-2 text-xs">
        <span className="w-16 shrink-0 text-ink-400">Best lap</span>
        <div className="h-2.5 flex-1 rounded bg-ink-800"><div className="h-2.5 rounded bg-ink-400" style={{ width: w(best) }} /></div>
        <span className="num w-20 text-right">{best == null ? "—" : `${best} ${unit}`}</span>
      </div>
    </div>
  );
}

/** The Rider brief: corner by corner on the outline, in plain words and pictures. */
export function BriefView({ brief, sessions, basePath, isRider }: { brief: RiderBrief; sessions: BriefSession[]; basePath: (sessionId: number, lap?: number | null) => string; isRider: boolean }) {
  const maxBar = Math.max(1, ...brief.corners.flatMap((c) => [c.peakBar ?? 0, c.bestPeakBar ?? 0]));
  const maxKmh = Math.max(1, ...brief.corners.flatMap((c) => [c.minSpeedKmh ?? 0, c.bestMinSpeedKmh ?? 0]));
  const marks: OutlineMark[] = [];
  brief.corners.forEach((c, i) => {
    if (c.at) marks.push({ key: `c${i}`, x: c.at[0], y: c.at[1], label: String(i + 1), tone: tone(c), title: c.text });
  });
  const flying = brief.laps.filter((l) => l.flying);
  return (
    <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
      <div className="min-w-0 space-y-4">
        {!brief.available ? (
          <p className="card text-sm text-ink-300">{brief.reason}</p>
        ) : (
          <>
            <div className="card space-y-3">
              <p className="text-sm text-ink-300">
                Lap <span className="font-semibold text-ink-100">{brief.lap}</span> against your best lap, lap{" "}
                <span className="font-semibold text-ink-100">{brief.bestLap}</span>. Where you started braking, how hard you squeezed, and how slow you went through each corner.
              </p>
              <div className="flex flex-wrap gap-1.5 text-xs" role="group" aria-label="Lap choice">
                {flying.map((l) => (
                  <Link
                    key={l.number}
                    href={basePath(brief.sessionId, l.number)}
                    aria-current={brief.lap === l.number ? "true" : undefined}
                    className={`rounded border px-2 py-1 ${brief.lap === l.number ? "border-signal-500 bg-signal-500/10 text-signal-400" : "border-ink-700 text-ink-300 hover:border-ink-400"}`}
                  >
                    Lap {l.number} <span className="num text-ink-400">{fmtLap(l.lapTimeMs)}</span>
                    {l.best ? <span className="ml-1 text-ok-400">best</span> : null}
                  </Link>
                ))}
              </div>
            </div>
            <ol className="space-y-3" data-testid="brief-corners">
              {brief.corners.map((c, i) => (
                <li key={c.name} className="card space-y-3" data-testid="brief-corner">
                  <div className="flex items-start gap-3">
                    <span className={`num grid h-7 w-7 shrink-0 place-items-center rounded-full text-sm font-bold text-ink-950 ${{ ok: "bg-ok-400", trace: "bg-trace-400", signal: "bg-signal-400", ink: "bg-ink-400", alert: "bg-alert-400" }[tone(c)]}`}>{i + 1}</span>
                    <div>
                      <h3 className="font-semibold">{c.name}</h3>
                      <p className="text-base text-ink-100">{c.text.replace(`${c.name}: `, "").replace(/^./, (x) => x.toUpperCase())}</p>
                    </div>
                  </div>
                  <div className="grid gap-4 sm:grid-cols-2">
                    <div>
                      <p className="mb-1 text-xs font-semibold text-ink-300">How hard you braked</p>
                      <Bar value={c.peakBar} best={c.bestPeakBar} max={maxBar} unit="bar" label={`${c.name}: brake pressure`} />
                    </div>
                    <div>
                      <p className="mb-1 text-xs font-semibold text-ink-300">Slowest point</p>
                      <Bar value={c.minSpeedKmh} best={c.bestMinSpeedKmh} max={maxKmh} unit="km/h" label={`${c.name}: slowest speed`} />
                    </div>
                  </div>
                </li>
              ))}
            </ol>
          </>
        )}
      </div>
      <aside className="space-y-4 lg:sticky lg:top-28 lg:self-start">
        {brief.outline ? (
          <div className="card">
            <TrackOutlineSvg points={brief.outline.points} marks={marks} label="Track outline with the corners numbered" />
            <ul className="mt-2 grid grid-cols-2 gap-1 text-xs text-ink-300">
              <li><span className="mr-1 inline-block h-2 w-2 rounded-full bg-trace-400" />Braked earlier</li>
              <li><span className="mr-1 inline-block h-2 w-2 rounded-full bg-signal-400" />Braked later</li>
              <li><span className="mr-1 inline-block h-2 w-2 rounded-full bg-ok-400" />About the same</li>
              <li><span className="mr-1 inline-block h-2 w-2 rounded-full bg-ink-400" />No braking to compare</li>
            </ul>
          </div>
        ) : null}
        <div className="card">
          <h2 className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-300">{isRider ? "Your sessions" : "Sessions"}</h2>
          {sessions.length === 0 ? (
            <p className="text-sm text-ink-400">No analysed sessions yet.</p>
          ) : (
            <ul className="space-y-1 text-sm">
              {sessions.map((s) => (
                <li key={s.id}>
                  <Link href={basePath(s.id)} aria-current={s.id === brief.sessionId ? "true" : undefined} className={`block rounded px-2 py-1 hover:bg-ink-850 ${s.id === brief.sessionId ? "bg-ink-850 text-signal-400" : ""}`}>
                    {s.title}
                    <span className="block text-xs text-ink-400">
                      {s.riderName ?? ""} {s.startedAt ? s.startedAt.slice(0, 10) : ""}
                    </span>
                  </Link>
                </li>
              ))}
            </ul>
          )}
        </div>
      </aside>
    </div>
  );
}
