"use client";
import { useActionState } from "react";
import { createTrackAction } from "@/lib/actions/tracks";
import type { SetupActionState } from "@/lib/actions/setup-state";
import type { SessionPick } from "@/lib/data/track-editor";
import { Feedback, Field } from "@/components/setup/form-bits";

export function CreateTrackForm({ sessions }: { sessions: SessionPick[] }) {
  const [state, action, pending] = useActionState<SetupActionState, FormData>(createTrackAction, {});
  const sessionValue = state.values?.sessionId ?? "";
  return (
    <form action={action} className="space-y-3" noValidate aria-label="New track">
      <div className="grid gap-3 sm:grid-cols-2">
        <Field state={state} idPrefix="new-track" name="name" label="Track name" placeholder="Harbour Ring, club layout" />
        <div>
          <label className="label" htmlFor="new-track-sessionId">Make a track from this session</label>
          <select key={sessionValue} id="new-track-sessionId" name="sessionId" defaultValue={sessionValue} className="field">
            <option value="">None: draw it later from an upload</option>
            {sessions.map((s) => (
              <option key={s.id} value={s.id}>
                {s.title}
                {s.startedAt ? ` · ${s.startedAt.slice(0, 10)}` : ""}
              </option>
            ))}
          </select>
          {state.errors?.sessionId && <p className="mt-1 text-xs text-alert-400">{state.errors.sessionId}</p>}
          <p className="mt-1 text-xs text-ink-400">
            {sessions.length ? "Analysed sessions with GPS and no track yet. One lap of its GPS becomes the outline; the session joins the track." : "No analysed session without a track has GPS positions."}
          </p>
        </div>
      </div>
      <div className="flex flex-wrap items-center gap-4">
        <button className="btn-primary" disabled={pending}>{pending ? "Creating…" : "Create track"}</button>
        <Feedback state={state} />
      </div>
    </form>
  );
}
