"use client";
/**
 * Shown where a CSV is refused because rows repeat their time stamps (a logger exporting a fast
 * log with rounded times): import it again keeping the first row of each time stamp. The
 * session page then says how many rows were dropped.
 */
import { useActionState, useEffect } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { queryKeys } from "@/lib/client/query-keys";
import { keepFirstOfRepeatedTimesAction } from "@/lib/actions/imports";
import type { FormState } from "@/lib/forms/session-form";

export function KeepFirstChoice({ sessionId, repeatedRows }: { sessionId: number; repeatedRows: number }) {
  const [state, action, pending] = useActionState<FormState, FormData>(keepFirstOfRepeatedTimesAction, {});
  const qc = useQueryClient();
  useEffect(() => {
    // The status card stopped polling at "failed"; read the status again so it follows the new import.
    if (state.ok) void qc.invalidateQueries({ queryKey: queryKeys.session(sessionId) });
  }, [state, qc, sessionId]);
  const rows = repeatedRows.toLocaleString("en-GB");
  return (
    <form action={action} className="space-y-2 rounded-md border border-ink-700 bg-ink-950 p-3" data-testid="keep-first-choice">
      <input type="hidden" name="sessionId" value={sessionId} />
      <p className="text-sm text-ink-200">
        If the export rounded the times, import the file keeping the first row of each time stamp: {rows} {repeatedRows === 1 ? "row" : "rows"} would be dropped, and the
        session page says so. If the repeats are real faults in the log, upload a corrected export instead.
      </p>
      <div className="flex flex-wrap items-center gap-3">
        <button className="btn-primary" disabled={pending}>{pending ? "Importing again…" : "Keep the first row of each time stamp"}</button>
        {state.message && (
          <p role={state.ok ? "status" : "alert"} className={`text-sm ${state.ok ? "text-ink-300" : "text-alert-400"}`}>
            {state.message}
          </p>
        )}
      </div>
    </form>
  );
}
