"use client";
/** Session page: engineers and owners edit the details, behind a toggle to keep the page calm. */
import { useState, useTransition } from "react";
import { FormProvider, useForm, type FieldPath } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { sessionDetailsSchema, type SessionDetailsInput, type SessionDetailsValues } from "@/lib/forms/session-form";
import { saveSessionDetailsAction } from "@/lib/actions/imports";
import { SessionDetailsFields, toLocalInput, type DetailOptions } from "./session-details-fields";
import type { ImportFormProps } from "./import-form";

export function DetailsEditor({ sessionId, details, options }: { sessionId: number; details: ImportFormProps["details"]; options: DetailOptions }) {
  const [open, setOpen] = useState(false);
  const [pending, startTransition] = useTransition();
  const [feedback, setFeedback] = useState<{ ok: boolean; text: string } | null>(null);
  const form = useForm<SessionDetailsInput, unknown, SessionDetailsValues>({
    resolver: zodResolver(sessionDetailsSchema),
    defaultValues: {
      title: details.title,
      kind: details.kind as SessionDetailsInput["kind"],
      eventId: details.eventId ? String(details.eventId) : "",
      bikeId: details.bikeId ? String(details.bikeId) : "",
      engineId: details.engineId ? String(details.engineId) : "",
      riderId: details.riderId ? String(details.riderId) : "",
      startedAt: toLocalInput(details.startedAt),
      conditions: details.conditions,
      sharedWithRiders: details.sharedWithRiders,
    },
  });

  const onSubmit = form.handleSubmit(() => {
    const raw = form.getValues();
    setFeedback(null);
    startTransition(async () => {
      const res = await saveSessionDetailsAction(sessionId, raw);
      setFeedback({ ok: !!res.ok, text: res.message ?? (res.ok ? "Details saved." : "The details could not be saved.") });
      for (const [path, msg] of Object.entries(res.errors ?? {})) form.setError(path as FieldPath<SessionDetailsInput>, { type: "server", message: msg });
      if (res.ok) {
        form.reset(raw);
        setOpen(false);
      }
    });
  });

  return (
    <section className="card" aria-labelledby="edit-details">
      <div className="flex items-center justify-between gap-4">
        <h2 id="edit-details" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Session details</h2>
        <button type="button" className="btn-quiet py-1" aria-expanded={open} aria-controls="details-form" onClick={() => setOpen((o) => !o)}>
          {open ? "Close" : "Edit details"}
        </button>
      </div>
      {feedback && !open && (
        <p role={feedback.ok ? "status" : "alert"} className={`mt-2 text-sm ${feedback.ok ? "text-ok-400" : "text-alert-400"}`}>{feedback.text}</p>
      )}
      {open && (
        <FormProvider {...form}>
          <form id="details-form" onSubmit={onSubmit} noValidate className="mt-4 space-y-4">
            <SessionDetailsFields options={options} idPrefix="edit" />
            <div className="flex items-center gap-3">
              <button className="btn-primary" disabled={pending}>{pending ? "Saving…" : "Save details"}</button>
              {feedback && !feedback.ok && <p role="alert" className="text-sm text-alert-400">{feedback.text}</p>}
            </div>
          </form>
        </FormProvider>
      )}
    </section>
  );
}
