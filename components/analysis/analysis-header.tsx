import type { ReactNode } from "react";
import { SessionAnalysisLinks } from "@/components/session/session-analysis-links";

export function AnalysisHeader({ title, session, current, children }: { title: string; session: { id: number; title: string }; current: "slip" | "suspension" | "gears" | "brief"; children?: ReactNode }) {
  return (
    <div className="space-y-3">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{session.title}</p>
        <h1 className="text-2xl font-semibold">{title}</h1>
      </div>
      <SessionAnalysisLinks sessionId={session.id} current={current} />
      {children}
    </div>
  );
}

export function LapLinks({ laps, current, href, label = "Lap" }: { laps: { number: number; lapTimeMs: number; flying: boolean; best: boolean }[]; current: number | null; href: (lap: number | null) => string; label?: string }) {
  return (
    <div className="flex flex-wrap items-center gap-1.5 text-xs" role="group" aria-label={`${label} choice`}>
      {laps.map((l) => (
        <a
          key={l.number}
          href={href(l.number)}
          aria-current={current === l.number ? "true" : undefined}
          className={`rounded border px-2 py-1 ${current === l.number ? "border-signal-500 bg-signal-500/10 text-signal-400" : "border-ink-700 text-ink-300 hover:border-ink-400"}`}
          title={l.flying ? "Flying lap" : "Out-lap, in-lap or partial lap"}
        >
          Lap {l.number} <span className="num text-ink-400">{fmtLap(l.lapTimeMs)}</span>
          {l.best ? <span className="ml-1 text-ok-400">best</span> : null}
          {!l.flying ? <span className="ml-1 text-ink-400">partial</span> : null}
        </a>
      ))}
    </div>
  );
}

export function fmtLap(ms: number): string {
  const m = Math.floor(ms / 60000);
  const s = (ms - m * 60000) / 1000;
  return `${m}:${s.toFixed(3).padStart(6, "0")}`;
}
