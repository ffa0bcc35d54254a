"use client";
/** Pick laps from any session of the team: a session select, then its laps. */
import { useState } from "react";
import { formatLapTime } from "@/lib/export/format-lap-time";
import { useSessionLaps, useTeamSessions, type PickerSession } from "@/lib/client/use-team-sessions";
import type { LapRef } from "@/lib/series/lap-series-meta";
import { MAX_COMPARE_LAPS } from "@/lib/series/lap-series-query";
import { lapColour } from "./lap-colours";

export interface LapPickerProps {
  sessions: PickerSession[];
  selected: LapRef[];
  onChange: (laps: LapRef[]) => void;
}

const same = (a: LapRef, b: LapRef) => a.sessionId === b.sessionId && a.lap === b.lap;

export function LapPicker({ sessions: initial, selected, onChange }: LapPickerProps) {
  const sessions = useTeamSessions(initial).data ?? initial;
  const ready = sessions.filter((s) => s.status === "ready");
  const [sessionId, setSessionId] = useState<number | null>(selected[0]?.sessionId ?? ready[0]?.id ?? null);
  const laps = useSessionLaps(sessionId);
  const title = (id: number) => sessions.find((s) => s.id === id)?.title ?? `Session ${id}`;

  return (
    <div className="space-y-3">
      <div>
        <label htmlFor="compare-session" className="label">Session</label>
        <select id="compare-session" className="field" value={sessionId ?? ""} onChange={(e) => setSessionId(e.target.value ? Number(e.target.value) : null)}>
          {ready.length === 0 && <option value="">No ready sessions</option>}
          {ready.map((s) => (
            <option key={s.id} value={s.id}>
              {s.title}{s.riderName ? ` — ${s.riderName}` : ""}
            </option>
          ))}
        </select>
      </div>
      <div>
        <p className="label">Laps of this session</p>
        {laps.isPending && sessionId != null && <p className="text-xs text-ink-400">Loading laps…</p>}
        {laps.isError && <p role="alert" className="text-xs text-alert-400">{laps.error.message}</p>}
        {laps.data && laps.data.length === 0 && <p className="text-xs text-ink-400">No laps in this session.</p>}
        <ul className="max-h-56 space-y-1 overflow-y-auto pr-1" aria-label="Laps of the chosen session">
          {laps.data?.map((l) => {
            const ref = { sessionId: l.sessionId, lap: l.number };
            const on = selected.some((s) => same(s, ref));
            const flags = [l.outLap && "out", l.inLap && "in", l.pitPass && "pit", l.invalid && "invalid"].filter(Boolean).join(", ");
            return (
              <li key={l.number}>
                <label className="flex cursor-pointer items-center gap-2 rounded px-1.5 py-1 text-sm hover:bg-ink-850">
                  <input
                    type="checkbox"
                    className="size-4 accent-signal-500"
                    checked={on}
                    disabled={!on && selected.length >= MAX_COMPARE_LAPS}
                    onChange={() => onChange(on ? selected.filter((s) => !same(s, ref)) : [...selected, ref])}
                  />
                  <span className="w-12">Lap {l.number}</span>
                  <span className="num">{formatLapTime(l.lapTimeMs)}</span>
                  {flags && <span className="text-[11px] uppercase text-ink-400">{flags}</span>}
                </label>
              </li>
            );
          })}
        </ul>
      </div>
      <div>
        <p className="label">Compared ({selected.length})</p>
        {selected.length === 0 && <p className="text-xs text-ink-400">Tick two or more laps. The first is the reference.</p>}
        <ol className="space-y-1" aria-label="Laps compared">
          {selected.map((s, i) => (
            <li key={`${s.sessionId}:${s.lap}`} className="flex items-center gap-2 text-sm">
              <span aria-hidden className="h-3 w-3 shrink-0 rounded-sm" style={{ background: lapColour(i) }} />
              <span className="min-w-0 flex-1 truncate">
                {title(s.sessionId)} · Lap {s.lap}
                {i === 0 && <span className="ml-1 text-[11px] uppercase text-signal-400">reference</span>}
              </span>
              {i > 0 && (
                <button type="button" className="text-[11px] text-ink-400 hover:text-ink-100" onClick={() => onChange([s, ...selected.filter((_, k) => k !== i)])}>
                  Make reference
                </button>
              )}
              <button type="button" aria-label={`Remove lap ${s.lap} of ${title(s.sessionId)}`} className="text-ink-400 hover:text-alert-400" onClick={() => onChange(selected.filter((_, k) => k !== i))}>
                ×
              </button>
            </li>
          ))}
        </ol>
      </div>
    </div>
  );
}
