"use client";
/**
 * Shown where a CSV is refused because rows repeat their time stamps (a logger exporting a fast
 * log with rounded times): import it again keeping the first row of each time stamp. The
 * session page then says how many rows were dropped.
 */
import { useState, useTransition, type FormEvent } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { keepFirstOfRepeatedTimesAction } from "@/lib/actions/imports";
import { queryKeys } from "@/lib/client/query-keys";
import type { SessionStatus } from "@/lib/client/use-session-status";

export function KeepFirstChoice({ sessionId, repeatedRows }: { sessionId: number; repeatedRows: number }) {
  const [pending, startTransition] = useTransition();
  const [error, setError] = useState<string | null>(null);
  const qc = useQueryClient();
  const rows = repeatedRows.toLocaleString("en-GB");

  const submit = (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    startTransition(async () => {
      const r = await keepFirstOfRepeatedTimesAction({}, form);
      if (!r.ok) {
        setError(r.message ?? "The file could not be queued again.");
        return;
      }
      // The status card stopped polling at "failed": mark it queued and read it again so it
      // follows the new import (this card may already be gone from the refreshed page).
      const key = queryKeys.session(sessionId);
      qc.setQueryData<SessionStatus>(key, (old) => (old ? { ...old, status: "queued", statusReason: null, progress: 0 } : old));
      void qc.invalidateQueries({ queryKey: key });
    });
  };

  return (
    <form onSubmit={submit} className="space-y-2 rounded-md border border-ink-700 bg-ink-950 p-3" data-testid="keep-first-choice">
      <input type="hidden" name="sessionId" value={sessionId} />
      <p className="text-sm text-ink-200">
        If the export rounded the times, import the file keeping the first row of each time stamp: {rows} {repeatedRows === 1 ? "row" : "rows"} would be dropped, and the
        session page says so. If the repeats are real faults in the log, upload a corrected export instead.
      </p>
      <div className="flex flex-wrap items-center gap-3">
        <button className="btn-primary" disabled={pending}>{pending ? "Importing again…" : "Keep the first row of each time stamp"}</button>
        {error && <p role="alert" className="text-sm text-alert-400">{error}</p>}
      </div>
    </form>
  );
}
