"use client";
/**
 * A session's import status, live: polls while the file is queued or being read, then refreshes
 * the page (server-rendered channel table, laps, findings) once it is ready or has failed.
 */
import { useEffect, useRef } from "react";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useSessionStatus, type SessionStatus as Status } from "@/lib/client/use-session-status";
import { ReimportButton } from "./reimport-button";
import { KeepFirstChoice } from "@/components/upload/keep-first-choice";

const WORDS: Record<string, string> = {
  uploaded: "Uploaded — looking at the file",
  queued: "Queued — waiting for the worker",
  parsing: "Reading the file",
  mapping: "Waiting for the column mapping",
  ready: "Ready",
  failed: "Import failed",
};

export function SessionStatus({ initial, canEdit, repeatedTimeRows = null }: { initial: Status; canEdit: boolean; repeatedTimeRows?: number | null }) {
  const router = useRouter();
  const { data, error } = useSessionStatus(initial.id, initial);
  const s = data ?? initial;
  const seen = useRef(initial.status);

  useEffect(() => {
    const before = seen.current;
    seen.current = s.status;
    // The server parts of the page depend on the status; fetch them again when it settles.
    if (before !== s.status && (s.status === "ready" || s.status === "failed" || s.status === "mapping")) router.refresh();
  }, [s.status, router]);

  if (s.status === "failed") {
    return (
      <div role="alert" className="rounded-lg border border-alert-500/60 bg-alert-500/10 p-4" data-testid="session-status" data-status="failed">
        <p className="font-semibold text-alert-400">{WORDS.failed}</p>
        <p className="mt-1 text-sm whitespace-pre-line text-ink-100" data-testid="failure-reason">{s.statusReason ?? "No reason was recorded."}</p>
        <p className="mt-2 text-xs text-ink-400">No data from this file is shown. The uploaded file is kept: fix the mapping, or upload a corrected export.</p>
        {canEdit && (
          <div className="mt-3 space-y-3">
            {repeatedTimeRows != null && <KeepFirstChoice sessionId={s.id} repeatedRows={repeatedTimeRows} />}
            <ReimportButton sessionId={s.id} />
          </div>
        )}
      </div>
    );
  }

  if (s.status === "mapping") {
    return (
      <div className="rounded-lg border border-signal-500/50 bg-signal-500/5 p-4" data-testid="session-status" data-status="mapping">
        <p className="font-semibold text-signal-400">{WORDS.mapping}</p>
        <p className="mt-1 text-sm text-ink-300">This CSV&apos;s columns have not been mapped in this team before.</p>
        {canEdit ? (
          <Link href={`/sessions/${s.id}/import`} className="btn-primary mt-3">Map the columns</Link>
        ) : (
          <p className="mt-1 text-sm text-ink-400">An engineer maps them; the data appears here afterwards.</p>
        )}
      </div>
    );
  }

  if (s.status === "ready") {
    return (
      <p className="inline-flex items-center gap-2 rounded-full border border-ok-400/40 bg-ok-400/10 px-3 py-1 text-sm font-semibold text-ok-400" data-testid="session-status" data-status="ready">
        <span className="h-2 w-2 rounded-full bg-ok-400" aria-hidden />
        {WORDS.ready}
      </p>
    );
  }

  const pct = s.status === "parsing" ? Math.max(1, s.progress) : 0;
  return (
    <div className="rounded-lg border border-ink-700 bg-ink-950 p-4" data-testid="session-status" data-status={s.status} aria-live="polite">
      <div className="flex items-baseline justify-between gap-3 text-sm">
        <span className="font-semibold text-signal-400">{WORDS[s.status] ?? s.status}</span>
        <span className="num text-ink-300">{pct}%</span>
      </div>
      <div role="progressbar" aria-label="Import progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct} className="mt-2 h-2 overflow-hidden rounded-full bg-ink-800">
        <div className={`h-full rounded-full bg-trace-400 transition-[width] duration-500 ${s.status === "queued" ? "w-1/12 animate-pulse" : ""}`} style={s.status === "queued" ? undefined : { width: `${pct}%` }} />
      </div>
      {error && <p className="mt-2 text-xs text-alert-400">{(error as Error).message} Retrying…</p>}
    </div>
  );
}
