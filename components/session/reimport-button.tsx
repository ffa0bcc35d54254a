"use client";
/** "Re-import with another mapping": reads the kept file again and opens the mapping screen. */
import { useActionState } from "react";
import { reimportAction } from "@/lib/actions/imports";
import type { FormState } from "@/lib/forms/session-form";

export function ReimportButton({ sessionId, label = "Re-import with another mapping" }: { sessionId: number; label?: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(reimportAction, {});
  return (
    <form action={action} className="flex flex-wrap items-center gap-3">
      <input type="hidden" name="sessionId" value={sessionId} />
      <button className="btn-quiet" disabled={pending}>{pending ? "Reading the file again…" : label}</button>
      {state.message && <p role="alert" className="text-sm text-alert-400">{state.message}</p>}
    </form>
  );
}
