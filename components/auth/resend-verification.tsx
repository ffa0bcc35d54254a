"use client";
import { useState, useTransition } from "react";
import { authClient } from "@/lib/auth/client";

/** Sends the address-confirmation e-mail again (rate-limited per client address). */
export function ResendVerificationButton({ email, callbackURL }: { email: string; callbackURL: string }) {
  const [pending, start] = useTransition();
  const [note, setNote] = useState<string | null>(null);
  return (
    <div className="space-y-2">
      <button
        className="btn-quiet"
        disabled={pending}
        onClick={() =>
          start(async () => {
            const { error } = await authClient.sendVerificationEmail({ email, callbackURL });
            setNote(error ? error.message || "Could not send the e-mail; try again in a few minutes." : `Sent again to ${email}.`);
          })
        }
      >
        {pending ? "Sending…" : "Send the link again"}
      </button>
      {note && <p role="status" className="text-sm text-ink-300">{note}</p>}
    </div>
  );
}
