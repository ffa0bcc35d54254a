"use client";
import { useActionState } from "react";
import { inviteMember, changeRole, removeMember, cancelInvitation, type ActionState } from "@/lib/actions/team";

const ROLES = ["owner", "engineer", "rider", "viewer"] as const;

function Feedback({ state }: { state: ActionState }) {
  if (!state.message) return null;
  return (
    <p role={state.ok ? "status" : "alert"} className={`text-sm ${state.ok ? "text-ok-400" : "text-alert-400"}`}>
      {state.message}
    </p>
  );
}

export function InviteForm() {
  const [state, action, pending] = useActionState(inviteMember, {});
  return (
    <form action={action} className="flex flex-wrap items-end gap-3" noValidate>
      <div className="min-w-60 flex-1">
        <label className="label" htmlFor="invite-email">E-mail</label>
        <input id="invite-email" name="email" type="email" required className="field" placeholder="name@example.com" />
        {state.errors?.email && <p className="mt-1 text-xs text-alert-400">{state.errors.email}</p>}
      </div>
      <div>
        <label className="label" htmlFor="invite-role">Role</label>
        <select id="invite-role" name="role" className="field" defaultValue="engineer">
          {ROLES.map((r) => (
            <option key={r} value={r}>{r}</option>
          ))}
        </select>
      </div>
      <button className="btn-primary" disabled={pending}>{pending ? "Sending…" : "Send invitation"}</button>
      <div className="w-full"><Feedback state={state} /></div>
    </form>
  );
}

export function RoleForm({ memberId, role, label }: { memberId: string; role: string; label: string }) {
  const [state, action, pending] = useActionState(changeRole, {});
  return (
    <form action={action} className="flex items-center gap-2">
      <input type="hidden" name="memberId" value={memberId} />
      <select name="role" aria-label={`Role of ${label}`} defaultValue={role} className="field w-auto py-1" disabled={pending}>
        {ROLES.map((r) => (
          <option key={r} value={r}>{r}</option>
        ))}
      </select>
      <button className="btn-quiet py-1" disabled={pending}>Save</button>
      <Feedback state={state} />
    </form>
  );
}

export function RemoveMemberForm({ memberId, label }: { memberId: string; label: string }) {
  const [state, action, pending] = useActionState(removeMember, {});
  return (
    <form
      action={action}
      onSubmit={(e) => {
        if (!confirm(`Remove ${label} from the team? They lose access at once.`)) e.preventDefault();
      }}
    >
      <input type="hidden" name="memberId" value={memberId} />
      <button className="btn-danger py-1" disabled={pending} aria-label={`Remove ${label}`}>Remove</button>
      <Feedback state={state} />
    </form>
  );
}

export function CancelInvitationForm({ invitationId, email }: { invitationId: string; email: string }) {
  const [state, action, pending] = useActionState(cancelInvitation, {});
  return (
    <form action={action}>
      <input type="hidden" name="invitationId" value={invitationId} />
      <button className="btn-quiet py-1" disabled={pending} aria-label={`Cancel invitation to ${email}`}>Cancel</button>
      <Feedback state={state} />
    </form>
  );
}
