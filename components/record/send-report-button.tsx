"use client";
import { useActionState } from "react";
import { sendEventReportAction, type SendReportState } from "@/lib/actions/event-report";

export function SendReportButton({ eventId }: { eventId: number }) {
  const [state, action, pending] = useActionState<SendReportState, FormData>(sendEventReportAction, {});
  return (
    <form action={action} className="flex flex-wrap items-center gap-3">
      <input type="hidden" name="eventId" value={eventId} />
      <button className="btn-quiet" disabled={pending}>{pending ? "Sending…" : "Mail the report to the owner"}</button>
      {state.message && <p role={state.ok ? "status" : "alert"} className={`text-sm ${state.ok ? "text-ok-400" : "text-alert-400"}`}>{state.message}</p>}
    </form>
  );
}
