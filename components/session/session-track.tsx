"use client";
/**
 * The session's track: which one, why the event's track was not used (with the distance), another
 * track to choose, and for a session on no track a new track from its GPS with a suggested
 * start/finish gate drawn on its outline. Confirming makes the track and splits the laps at once.
 */
import { useActionState, useMemo } from "react";
import Link from "next/link";
import type { SessionTrackPanel } from "@/lib/data/session-track";
import type { SetupActionState } from "@/lib/actions/setup-state";
import { changeSessionTrackAction, confirmSuggestedGateAction } from "@/lib/actions/session-track";
import { toLocalMetres } from "@/lib/geo/to-local-metres";

function km(m: number): string {
  return m >= 10_000 ? `${Math.round(m / 1000).toLocaleString("en-GB")} km` : `${(m / 1000).toLocaleString("en-GB", { maximumFractionDigits: 1 })} km`;
}

function OutlineWithGate({ outline, gate }: { outline: [number, number][]; gate: NonNullable<SessionTrackPanel["suggestion"]>["gate"] }) {
  const drawn = useMemo(() => {
    const proj = toLocalMetres({ lat: outline[0]![0]!, lon: outline[0]![1]! });
    const xs = outline.map((p) => proj.xM(p[1]));
    const ys = outline.map((p) => -proj.yM(p[0]));
    const minX = Math.min(...xs) - 40;
    const maxX = Math.max(...xs) + 40;
    const minY = Math.min(...ys) - 40;
    const maxY = Math.max(...ys) + 40;
    const path = xs.map((x, i) => `${i ? "L" : "M"}${x.toFixed(1)} ${ys[i]!.toFixed(1)}`).join(" ");
    const g = [gate.a, gate.b].map((p) => [proj.xM(p.lon), -proj.yM(p.lat)] as const);
    return { viewBox: `${minX.toFixed(0)} ${minY.toFixed(0)} ${(maxX - minX).toFixed(0)} ${(maxY - minY).toFixed(0)}`, path, g, w: (maxX - minX) / 120 };
  }, [outline, gate]);
  return (
    <svg viewBox={drawn.viewBox} className="h-64 w-full max-w-md rounded-md bg-ink-950" role="img" aria-label="Outline of one lap with the suggested start/finish gate" data-testid="suggested-gate-map">
      <path d={drawn.path} fill="none" stroke="currentColor" className="text-trace-400" strokeWidth={drawn.w} strokeLinejoin="round" />
      <line x1={drawn.g[0]![0]!} y1={drawn.g[0]![1]!} x2={drawn.g[1]![0]!} y2={drawn.g[1]![1]!} stroke="currentColor" className="text-signal-400" strokeWidth={drawn.w * 2.5} strokeLinecap="round" />
      <circle cx={(drawn.g[0]![0]! + drawn.g[1]![0]!) / 2} cy={(drawn.g[0]![1]! + drawn.g[1]![1]!) / 2} r={drawn.w * 4} fill="none" stroke="currentColor" className="text-signal-400" strokeWidth={drawn.w} />
    </svg>
  );
}

export function SessionTrack({ sessionId, panel, canEdit, defaultName }: { sessionId: number; panel: SessionTrackPanel; canEdit: boolean; defaultName: string }) {
  const [changed, change, changing] = useActionState<SetupActionState, FormData>(changeSessionTrackAction, {});
  const [made, make, making] = useActionState<SetupActionState, FormData>(confirmSuggestedGateAction, {});
  const s = panel.suggestion;
  return (
    <section className="card space-y-4" aria-labelledby="session-track" data-testid="session-track">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 id="session-track" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Track</h2>
        {panel.trackId != null ? (
          <p className="text-sm">
            On <span className="font-semibold">{panel.trackName}</span> ·{" "}
            <Link href={`/tracks/${panel.trackId}?session=${sessionId}`} className="text-trace-400 underline underline-offset-2">edit its gates</Link>
          </p>
        ) : (
          <p className="text-sm text-ink-300">On no track: no laps are split.</p>
        )}
      </div>

      {panel.refused && (
        <p role="status" className="rounded-md border border-signal-500/50 bg-signal-500/10 px-3 py-2 text-sm text-ink-100" data-testid="track-refused">
          Not put on <span className="font-semibold">{panel.refused.name}</span>
          {panel.refused.via === "event" ? " (the event's track)" : ""}: this log&apos;s positions are <span className="num font-semibold">{km(panel.refused.distanceM)}</span> from it.
          A session goes on a track only within 2 km of its GPS.
        </p>
      )}

      {made.ok && made.id ? (
        <p role="status" className="text-sm text-ok-400">
          {made.message}{" "}
          <Link href={`/tracks/${made.id}?session=${sessionId}`} className="underline underline-offset-2">Edit the gate</Link>
        </p>
      ) : null}

      {s && canEdit && (
        <div className="grid gap-4 md:grid-cols-[minmax(0,28rem)_1fr]" data-testid="gate-suggestion">
          <OutlineWithGate outline={s.outline} gate={s.gate} />
          <form action={make} className="space-y-3">
            <p className="text-sm text-ink-200">
              Lapbench found a {km(s.lengthM)} lap in this session&apos;s GPS and suggests the start/finish gate{" "}
              {s.source === "beacon" ? (
                <>where the lap beacon fired ({s.pulses} pulses).</>
              ) : (
                <>in the middle of the longest straight ({s.straightM} m).</>
              )}{" "}
              Confirm to make a track from it: the session is split into laps at once, and the gate can be moved afterwards in the track editor.
            </p>
            <input type="hidden" name="sessionId" value={sessionId} />
            <div>
              <label className="label" htmlFor="new-track-name">Track name</label>
              <input id="new-track-name" name="name" className="field" defaultValue={made.values?.name ?? defaultName} aria-invalid={!!made.errors?.name} />
              {made.errors?.name && <p className="mt-1 text-xs text-alert-400">{made.errors.name}</p>}
            </div>
            <button className="btn-primary" disabled={making}>{making ? "Splitting laps…" : "Confirm gate and split laps"}</button>
            {made.message && !made.ok && <p role="alert" className="text-sm text-alert-400">{made.message}</p>}
          </form>
        </div>
      )}

      {panel.trackId == null && !s && (
        <p className="text-sm text-ink-400">
          {panel.hasGps ? "No closed lap was found in this session's GPS to suggest a start/finish gate." : "This log has no GPS positions; choose a track below if you know where it ran."}
        </p>
      )}

      {canEdit && panel.tracks.length > 0 && (
        <form action={change} className="flex flex-wrap items-end gap-3">
          <input type="hidden" name="sessionId" value={sessionId} />
          <div>
            <label className="label" htmlFor="session-track-choice">Put the session on</label>
            <select id="session-track-choice" name="trackId" className="field w-auto" defaultValue={panel.trackId ?? ""} aria-invalid={!!changed.errors?.trackId}>
              <option value="">No track</option>
              {panel.tracks.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}
                  {t.distanceM != null ? ` — ${km(t.distanceM)} away` : ""}
                </option>
              ))}
            </select>
          </div>
          <button className="btn-quiet" disabled={changing}>{changing ? "Analysing again…" : "Change track"}</button>
          {changed.message && <p role={changed.ok ? "status" : "alert"} className={`text-sm ${changed.ok ? "text-ok-400" : "text-alert-400"}`}>{changed.message}</p>}
        </form>
      )}
    </section>
  );
}
