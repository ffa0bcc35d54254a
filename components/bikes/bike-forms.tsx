"use client";
import { useActionState } from "react";
import { createBikeAction, updateBikeAction, createEngineAction, updateEngineAction } from "@/lib/actions/bikes";
import type { SetupActionState } from "@/lib/actions/setup-state";
import type { BikeDetail } from "@/lib/data/bikes";
import { Feedback, Field } from "@/components/setup/form-bits";
import { TyreCalculator } from "./tyre-calculator";

export function CreateBikeForm() {
  const [state, action, pending] = useActionState<SetupActionState, FormData>(createBikeAction, {});
  return (
    <form action={action} className="flex flex-wrap items-start gap-3" noValidate>
      <Field state={state} idPrefix="new-bike" name="name" label="Bike name" placeholder="Bike 12" className="min-w-48 flex-1" />
      <Field state={state} idPrefix="new-bike" name="className" label="Class" placeholder="Superbike (1000 cc four)" className="min-w-60 flex-1" />
      <button className="btn-primary mt-5" disabled={pending}>{pending ? "Adding…" : "Add bike"}</button>
      <div className="w-full"><Feedback state={state} /></div>
    </form>
  );
}

export function BikeSettingsForm({ bike, editable }: { bike: BikeDetail; editable: boolean }) {
  const [state, action, pending] = useActionState<SetupActionState, FormData>(updateBikeAction, {});
  const ro = !editable;
  const p = "bike";
  return (
    <form action={action} className="space-y-5" noValidate aria-label="Bike settings">
      <input type="hidden" name="bikeId" value={bike.id} />
      <div className="grid gap-4 sm:grid-cols-2">
        <Field state={state} idPrefix={p} name="name" label="Name" defaultValue={bike.name} readOnly={ro} />
        <Field state={state} idPrefix={p} name="className" label="Class" defaultValue={bike.className} readOnly={ro} />
      </div>
      <fieldset className="space-y-3">
        <legend className="mb-2 text-xs font-semibold uppercase tracking-wide text-trace-400">Wheels and tyres</legend>
        <div className="grid gap-4 sm:grid-cols-3">
          <Field state={state} idPrefix={p} align name="wheelCircFrontMm" label="Front rolling circumference" unit="mm" inputMode="decimal" defaultValue={bike.wheelCircFrontMm} readOnly={ro} />
          <Field state={state} idPrefix={p} align name="wheelCircRearMm" label="Rear rolling circumference" unit="mm" inputMode="decimal" defaultValue={bike.wheelCircRearMm} readOnly={ro} />
          <Field state={state} idPrefix={p} align name="tyreCrownRadiusFrontMm" label="Front tyre crown radius" unit="mm" inputMode="decimal" defaultValue={bike.tyreCrownRadiusFrontMm} readOnly={ro} hint="With the rear's, corrects both rolling radii at lean in Drive slip." />
          <Field state={state} idPrefix={p} align name="tyreCrownRadiusMm" label="Rear tyre crown radius" unit="mm" inputMode="decimal" defaultValue={bike.tyreCrownRadiusMm} readOnly={ro} />
        </div>
        {editable && <TyreCalculator />}
      </fieldset>
      <fieldset>
        <legend className="mb-2 text-xs font-semibold uppercase tracking-wide text-trace-400">Drive line and engine</legend>
        <div className="grid gap-4 sm:grid-cols-4">
          <Field state={state} idPrefix={p} align name="primaryRatio" label="Primary ratio" inputMode="decimal" defaultValue={bike.primaryRatio} readOnly={ro} />
          <Field state={state} idPrefix={p} align name="sprocketFront" label="Front sprocket" unit="teeth" inputMode="numeric" defaultValue={bike.sprocketFront} readOnly={ro} />
          <Field state={state} idPrefix={p} align name="sprocketRear" label="Rear sprocket" unit="teeth" inputMode="numeric" defaultValue={bike.sprocketRear} readOnly={ro} />
          <Field state={state} idPrefix={p} align name="revCeilingRpm" label="Rev ceiling" unit="rpm" inputMode="numeric" defaultValue={bike.revCeilingRpm} readOnly={ro} />
        </div>
        <Field
          state={state}
          idPrefix={p}
          name="gearboxRatios"
          label="Gearbox ratios, 1st gear first"
          inputMode="decimal"
          className="mt-4"
          defaultValue={bike.gearboxRatios.join(", ")}
          readOnly={ro}
          hint="Separated by commas or spaces, e.g. 2.6, 2.05, 1.71, 1.5, 1.36, 1.25."
        />
      </fieldset>
      <fieldset>
        <legend className="mb-2 text-xs font-semibold uppercase tracking-wide text-trace-400">Suspension</legend>
        <div className="grid gap-4 sm:grid-cols-2">
          <Field state={state} idPrefix={p} name="forkStrokeMm" label="Fork stroke" unit="mm" inputMode="decimal" defaultValue={bike.forkStrokeMm} readOnly={ro} />
          <Field state={state} idPrefix={p} name="shockStrokeMm" label="Shock stroke" unit="mm" inputMode="decimal" defaultValue={bike.shockStrokeMm} readOnly={ro} />
        </div>
      </fieldset>
      {editable && (
        <div className="flex flex-wrap items-center gap-4">
          <button className="btn-primary" disabled={pending}>{pending ? "Saving…" : "Save bike"}</button>
          <Feedback state={state} />
        </div>
      )}
    </form>
  );
}

export interface EngineFormValues {
  id?: number;
  serial: string;
  bikeId: number | null;
  rebuildIntervalH: number | null;
  rebuildIntervalKm: number | null;
  hoursAtInstall: number;
  kmAtInstall: number;
  notes: string | null;
}

/** Add an engine (no `engine.id`) or edit one. */
export function EngineForm({ engine, bikes }: { engine: EngineFormValues; bikes: { id: number; name: string }[] }) {
  const editing = engine.id !== undefined;
  const [state, action, pending] = useActionState<SetupActionState, FormData>(editing ? updateEngineAction : createEngineAction, {});
  const p = editing ? `engine-${engine.id}` : "new-engine";
  const bikeValue = state.values?.bikeId ?? (engine.bikeId == null ? "" : String(engine.bikeId));
  return (
    <form action={action} className="space-y-4" noValidate aria-label={editing ? `Edit engine ${engine.serial}` : "Add an engine"}>
      {editing && <input type="hidden" name="engineId" value={engine.id} />}
      <div className="grid gap-4 sm:grid-cols-3">
        <Field state={state} idPrefix={p} name="serial" label="Serial" defaultValue={engine.serial} />
        <div>
          <label className="label" htmlFor={`${p}-bikeId`}>Fitted to</label>
          <select key={bikeValue} id={`${p}-bikeId`} name="bikeId" defaultValue={bikeValue} className="field">
            <option value="">No bike (on the shelf)</option>
            {bikes.map((b) => (
              <option key={b.id} value={b.id}>{b.name}</option>
            ))}
          </select>
          {state.errors?.bikeId && <p className="mt-1 text-xs text-alert-400">{state.errors.bikeId}</p>}
        </div>
        <Field state={state} idPrefix={p} name="notes" label="Notes" defaultValue={engine.notes} />
      </div>
      <div className="grid gap-4 sm:grid-cols-4">
        <Field state={state} idPrefix={p} align name="rebuildIntervalH" label="Rebuild every" unit="h" inputMode="decimal" defaultValue={engine.rebuildIntervalH} hint="From the manufacturer's service data." />
        <Field state={state} idPrefix={p} align name="rebuildIntervalKm" label="Rebuild every" unit="km" inputMode="decimal" defaultValue={engine.rebuildIntervalKm} />
        <Field state={state} idPrefix={p} align name="hoursAtInstall" label="Hours when fitted" unit="h" inputMode="decimal" defaultValue={engine.hoursAtInstall} hint="Running since its last rebuild." />
        <Field state={state} idPrefix={p} align name="kmAtInstall" label="Distance when fitted" unit="km" inputMode="decimal" defaultValue={engine.kmAtInstall} />
      </div>
      <div className="flex flex-wrap items-center gap-4">
        <button className={editing ? "btn-quiet" : "btn-primary"} disabled={pending}>{pending ? "Saving…" : editing ? "Save engine" : "Add engine"}</button>
        <Feedback state={state} />
      </div>
    </form>
  );
}
