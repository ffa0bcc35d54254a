"use client";
/** Move an engine to another bike, or record its rebuild, each on a date (engineers and the owner). */
import { useActionState } from "react";
import { moveEngineAction, recordRebuildAction } from "@/lib/actions/engine-history";
import type { SetupActionState } from "@/lib/actions/setup-state";
import { Feedback, Field } from "@/components/setup/form-bits";

export function MoveEngineForm({ engineId, serial, bikeId, bikes, today }: { engineId: number; serial: string; bikeId: number | null; bikes: { id: number; name: string }[]; today: string }) {
  const [state, action, pending] = useActionState<SetupActionState, FormData>(moveEngineAction, {});
  const p = `move-${engineId}`;
  return (
    <form action={action} className="space-y-3" aria-label={`Move engine ${serial}`} noValidate>
      <input type="hidden" name="engineId" value={engineId} />
      <div className="grid gap-3 sm:grid-cols-3">
        <div>
          <label className="label" htmlFor={`${p}-toBikeId`}>Move to</label>
          <select id={`${p}-toBikeId`} name="toBikeId" className="field" defaultValue={state.values?.toBikeId ?? ""}>
            <option value="">No bike (on the shelf)</option>
            {bikes
              .filter((b) => b.id !== bikeId)
              .map((b) => (
                <option key={b.id} value={b.id}>
                  {b.name}
                </option>
              ))}
          </select>
          {state.errors?.toBikeId && <p className="mt-1 text-xs text-alert-400">{state.errors.toBikeId}</p>}
        </div>
        <Field state={state} idPrefix={p} name="onDate" label="On" type="date" defaultValue={today} />
        <Field state={state} idPrefix={p} name="note" label="Note" />
      </div>
      <div className="flex items-center gap-3">
        <button className="btn-quiet" disabled={pending}>{pending ? "Moving…" : "Move engine"}</button>
        <Feedback state={state} />
      </div>
    </form>
  );
}

export function RebuildForm({ engineId, serial, today }: { engineId: number; serial: string; today: string }) {
  const [state, action, pending] = useActionState<SetupActionState, FormData>(recordRebuildAction, {});
  const p = `rebuild-${engineId}`;
  return (
    <form action={action} className="space-y-3" aria-label={`Record a rebuild of ${serial}`} noValidate>
      <input type="hidden" name="engineId" value={engineId} />
      <div className="grid gap-3 sm:grid-cols-3">
        <Field state={state} idPrefix={p} name="onDate" label="Rebuilt on" type="date" defaultValue={today} />
        <Field state={state} idPrefix={p} name="note" label="What was done" className="sm:col-span-2" />
      </div>
      <div className="flex items-center gap-3">
        <button className="btn-quiet" disabled={pending}>{pending ? "Saving…" : "Record rebuild"}</button>
        <Feedback state={state} />
      </div>
    </form>
  );
}
