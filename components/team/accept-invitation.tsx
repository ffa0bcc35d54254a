"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { acceptInvitation } from "@/lib/actions/team";

export function AcceptInvitationButton({ invitationId }: { invitationId: string }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="space-y-2">
      <button
        className="btn-primary w-full"
        disabled={pending}
        onClick={() =>
          start(async () => {
            const r = await acceptInvitation(invitationId);
            if (!r.ok) setError(r.message ?? "Could not accept the invitation.");
            else {
              router.push("/home");
              router.refresh();
            }
          })
        }
      >
        {pending ? "Joining…" : "Accept and join the team"}
      </button>
      {error && <p role="alert" className="text-sm text-alert-400">{error}</p>}
    </div>
  );
}
