"use client";
import { useActionState } from "react";
import { saveMailPreferencesAction, type MailPrefsState } from "@/lib/actions/mail-preferences";
import type { MailPreferences } from "@/lib/data/mail-preferences";

/** The signed-in person's own e-mail choices. */
export function MailPreferencesForm({ prefs, role }: { prefs: MailPreferences; role: string }) {
  const [state, action, pending] = useActionState<MailPrefsState, FormData>(saveMailPreferencesAction, {});
  return (
    <form action={action} className="card space-y-3" aria-label="E-mail">
      <label className="flex items-start gap-3 text-sm">
        <input type="checkbox" name="sessionReady" defaultChecked={prefs.sessionReady} className="mt-1" />
        <span>
          <span className="font-semibold">Session ready</span>
          <span className="block text-ink-400">{role === "rider" ? "When a session you rode is analysed: your brief summary and a link to your Rider brief." : role === "engineer" ? "When a session is analysed: its figures and the findings count." : "Sent to the session's rider and to engineers."}</span>
        </span>
      </label>
      <label className="flex items-start gap-3 text-sm">
        <input type="checkbox" name="eventReport" defaultChecked={prefs.eventReport} className="mt-1" />
        <span>
          <span className="font-semibold">Event report</span>
          <span className="block text-ink-400">After an event: best laps per rider, findings and engine use (sent to the team owner).</span>
        </span>
      </label>
      <div className="flex items-center gap-3">
        <button className="btn-quiet" disabled={pending}>{pending ? "Saving…" : "Save e-mail choices"}</button>
        {state.message && <p role={state.ok ? "status" : "alert"} className={`text-sm ${state.ok ? "text-ok-400" : "text-alert-400"}`}>{state.message}</p>}
      </div>
    </form>
  );
}
