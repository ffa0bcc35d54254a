"use client";
import { useActionState } from "react";
import { createEventAction, updateEventAction } from "@/lib/actions/events";
import type { SetupActionState } from "@/lib/actions/setup-state";
import type { TrackOption } from "@/lib/data/events";
import { Feedback, Field } from "@/components/setup/form-bits";

export interface EventFormValues {
  id?: number;
  name: string;
  trackId: number | null;
  startsOn: string | null;
  endsOn: string | null;
}

/** Create an event (no `event.id`) or edit one. */
export function EventForm({ event, tracks }: { event: EventFormValues; tracks: TrackOption[] }) {
  const editing = event.id !== undefined;
  const [state, action, pending] = useActionState<SetupActionState, FormData>(editing ? updateEventAction : createEventAction, {});
  const p = editing ? `event-${event.id}` : "new-event";
  const trackValue = state.values?.trackId ?? (event.trackId == null ? "" : String(event.trackId));
  return (
    <form action={action} className="space-y-3" noValidate aria-label={editing ? `Edit ${event.name}` : "Add an event"}>
      {editing && <input type="hidden" name="eventId" value={event.id} />}
      <div className="grid gap-3 sm:grid-cols-[2fr_2fr_1fr_1fr]">
        <Field state={state} idPrefix={p} name="name" label="Event name" defaultValue={event.name} placeholder="Round 3, national superbike" />
        <div>
          <label className="label" htmlFor={`${p}-trackId`}>Track</label>
          <select key={trackValue} id={`${p}-trackId`} name="trackId" defaultValue={trackValue} className="field">
            <option value="">No track yet</option>
            {tracks.map((t) => (
              <option key={t.id} value={t.id}>{t.name}</option>
            ))}
          </select>
          {state.errors?.trackId && <p className="mt-1 text-xs text-alert-400">{state.errors.trackId}</p>}
        </div>
        <Field state={state} idPrefix={p} name="startsOn" type="date" label="First day" defaultValue={event.startsOn} />
        <Field state={state} idPrefix={p} name="endsOn" type="date" label="Last day" defaultValue={event.endsOn} />
      </div>
      <div className="flex flex-wrap items-center gap-4">
        <button className={editing ? "btn-quiet" : "btn-primary"} disabled={pending}>{pending ? "Saving…" : editing ? "Save event" : "Add event"}</button>
        <Feedback state={state} />
      </div>
    </form>
  );
}
