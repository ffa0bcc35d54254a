"use client";
import { useActionState, useEffect } from "react";
import { useRouter } from "next/navigation";
import { createTeam } from "@/lib/actions/team";

export function CreateTeamForm() {
  const [state, action, pending] = useActionState(createTeam, {});
  const router = useRouter();
  useEffect(() => {
    if (state.ok) router.push("/home");
  }, [state.ok, router]);
  return (
    <form action={action} className="space-y-4" noValidate>
      <div>
        <label className="label" htmlFor="team-name">Team name</label>
        <input id="team-name" name="name" className="field" placeholder="e.g. Northfield Privateers" />
        {state.errors?.name && <p className="mt-1 text-xs text-alert-400">{state.errors.name}</p>}
      </div>
      {state.message && !state.ok && <p role="alert" className="text-sm text-alert-400">{state.message}</p>}
      <button className="btn-primary w-full" disabled={pending}>{pending ? "Creating…" : "Create team"}</button>
    </form>
  );
}
