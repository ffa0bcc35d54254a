"use client";
/** The session-details fields, shared by the import screen and the session page's editor (inside a FormProvider). */
import { useFormContext, useWatch, type FieldErrors } from "react-hook-form";
import { SESSION_KINDS, type SessionDetailsInput } from "@/lib/forms/session-form";

export interface DetailOptions {
  events: { id: number; label: string }[];
  bikes: { id: number; label: string }[];
  engines: { id: number; label: string; bikeId: number | null }[];
  riders: { id: number; label: string }[];
}

/** Stored UTC instant → `datetime-local` value, also in UTC (the label says so). */
export function toLocalInput(iso: string | null): string {
  return iso ? iso.slice(0, 16) : "";
}

export function FieldError({ message, id }: { message?: string; id: string }) {
  if (!message) return null;
  return (
    <p id={id} className="mt-1 text-xs text-alert-400">
      {message}
    </p>
  );
}

export function SessionDetailsFields({ options, idPrefix = "details" }: { options: DetailOptions; idPrefix?: string }) {
  const { register, control, formState } = useFormContext<SessionDetailsInput>();
  const errors = formState.errors as FieldErrors<SessionDetailsInput>;
  const bikeId = useWatch({ control, name: "bikeId" });
  // Engines fitted to the chosen bike first; engines with no bike are always offered.
  const engines = bikeId ? options.engines.filter((e) => e.bikeId == null || String(e.bikeId) === bikeId) : options.engines;
  const id = (f: string) => `${idPrefix}-${f}`;
  const describedBy = (f: keyof SessionDetailsInput) => (errors[f] ? `${id(f)}-error` : undefined);

  const select = (field: "eventId" | "bikeId" | "engineId" | "riderId", label: string, list: { id: number; label: string }[], none: string) => (
    <div>
      <label className="label" htmlFor={id(field)}>{label}</label>
      <select id={id(field)} className="field" aria-invalid={!!errors[field]} aria-describedby={describedBy(field)} {...register(field)}>
        <option value="">{none}</option>
        {list.map((o) => (
          <option key={o.id} value={String(o.id)}>{o.label}</option>
        ))}
      </select>
      <FieldError id={`${id(field)}-error`} message={errors[field]?.message} />
    </div>
  );

  return (
    <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
      <div className="sm:col-span-2">
        <label className="label" htmlFor={id("title")}>Title</label>
        <input id={id("title")} className="field" aria-invalid={!!errors.title} aria-describedby={describedBy("title")} {...register("title")} />
        <FieldError id={`${id("title")}-error`} message={errors.title?.message} />
      </div>
      <div>
        <label className="label" htmlFor={id("kind")}>Kind</label>
        <select id={id("kind")} className="field capitalize" aria-invalid={!!errors.kind} {...register("kind")}>
          {SESSION_KINDS.map((k) => (
            <option key={k} value={k}>{k[0]!.toUpperCase() + k.slice(1)}</option>
          ))}
        </select>
        <FieldError id={`${id("kind")}-error`} message={errors.kind?.message} />
      </div>
      <div>
        <label className="label" htmlFor={id("startedAt")}>Started at (UTC)</label>
        <input id={id("startedAt")} type="datetime-local" className="field" aria-invalid={!!errors.startedAt} aria-describedby={describedBy("startedAt")} {...register("startedAt")} />
        <FieldError id={`${id("startedAt")}-error`} message={errors.startedAt?.message} />
      </div>
      {select("eventId", "Event", options.events, "No event")}
      {select("riderId", "Rider", options.riders, "No rider")}
      {select("bikeId", "Bike", options.bikes, "No bike")}
      {select("engineId", "Engine", engines, "No engine")}
      <div className="sm:col-span-2 lg:col-span-3">
        <label className="label" htmlFor={id("conditions")}>Conditions</label>
        <input id={id("conditions")} className="field" placeholder="e.g. dry, 24 °C track, light wind" aria-invalid={!!errors.conditions} aria-describedby={describedBy("conditions")} {...register("conditions")} />
        <FieldError id={`${id("conditions")}-error`} message={errors.conditions?.message} />
      </div>
      <div className="flex items-end pb-2">
        <label className="flex items-center gap-2 text-sm" htmlFor={id("sharedWithRiders")}>
          <input id={id("sharedWithRiders")} type="checkbox" className="h-4 w-4 accent-signal-500" {...register("sharedWithRiders")} />
          Share with riders
        </label>
      </div>
    </div>
  );
}
