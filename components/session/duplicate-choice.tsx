"use client";
/** A held-back upload whose bytes match an earlier session: go there, or import this copy on purpose. */
import { useActionState } from "react";
import Link from "next/link";
import { resolveDuplicateAction } from "@/lib/actions/imports";
import type { FormState } from "@/lib/forms/session-form";

export interface DuplicateChoiceProps {
  sessionId: number;
  earlier: { sessionId: number; title: string; uploadedAt: string };
  canEdit: boolean;
}

export function DuplicateChoice({ sessionId, earlier, canEdit }: DuplicateChoiceProps) {
  const [state, action, pending] = useActionState<FormState, FormData>(resolveDuplicateAction, {});
  // On success the action navigates to the session to open; only a refusal comes back here.
  const when = earlier.uploadedAt.slice(0, 16).replace("T", " ") + " UTC";
  return (
    <div className="rounded-lg border border-signal-500/50 bg-signal-500/5 p-4" data-testid="duplicate-choice" role="region" aria-label="Same file uploaded before">
      <p className="font-semibold text-signal-400">This file was uploaded before</p>
      <p className="mt-1 text-sm text-ink-200">
        Its bytes are the same as the file of{" "}
        <Link href={`/sessions/${earlier.sessionId}`} className="text-trace-400 underline underline-offset-2">{earlier.title}</Link> (uploaded {when}). It has not been read again.
      </p>
      {canEdit ? (
        <form action={action} className="mt-3 flex flex-wrap gap-3">
          <input type="hidden" name="sessionId" value={sessionId} />
          <button name="choice" value="existing" className="btn-primary" disabled={pending}>Go to the existing session</button>
          <button name="choice" value="import" className="btn-quiet" disabled={pending}>Import it again as a new session</button>
        </form>
      ) : (
        <p className="mt-2 text-sm text-ink-400">An engineer decides whether to import it again.</p>
      )}
      {state.message && !state.ok && <p role="alert" className="mt-2 text-sm text-alert-400">{state.message}</p>}
    </div>
  );
}
