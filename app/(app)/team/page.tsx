import type { Metadata } from "next";
import { pageTeam } from "@/lib/auth/page-guard";
import { roleCan } from "@/lib/auth/guard";
import { listMembers, listPendingInvitations } from "@/lib/data/team";
import { InviteForm, RoleForm, RemoveMemberForm, CancelInvitationForm } from "@/components/team/team-forms";
import { TeamExportCard } from "@/components/record/team-export-card";

export const metadata: Metadata = { title: "Team" };

export default async function TeamPage() {
  const ctx = await pageTeam({}, "/team");
  const manage = roleCan(ctx.role, { member: ["update"] });
  const [members, invitations] = await Promise.all([listMembers(ctx.teamId), manage ? listPendingInvitations(ctx.teamId) : []]);
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
        <h1 className="text-2xl font-semibold">Team</h1>
        {!manage && <p className="mt-1 text-sm text-ink-400">Only the team owner changes members and roles.</p>}
      </div>
      <TeamExportCard role={ctx.role} />
      <section className="card" aria-labelledby="members">
        <h2 id="members" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Members</h2>
        <table className="table-plain" data-testid="members-table">
          <thead>
            <tr>
              <th>Name</th>
              <th>E-mail</th>
              <th>Role</th>
              {manage && <th className="text-right">Actions</th>}
            </tr>
          </thead>
          <tbody>
            {members.map((m) => {
              const self = m.userId === ctx.userId;
              return (
                <tr key={m.memberId}>
                  <td className="font-medium">{m.name}{self && <span className="ml-2 text-xs text-ink-400">(you)</span>}</td>
                  <td className="text-ink-300">{m.email}</td>
                  <td>{manage && !self ? <RoleForm memberId={m.memberId} role={m.role} label={m.name} /> : <span className="capitalize">{m.role}</span>}</td>
                  {manage && <td className="text-right">{!self && <RemoveMemberForm memberId={m.memberId} label={m.name} />}</td>}
                </tr>
              );
            })}
          </tbody>
        </table>
      </section>
      {manage && (
        <section className="card" aria-labelledby="invite">
          <h2 id="invite" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Invite someone</h2>
          <InviteForm />
          {invitations.length > 0 && (
            <>
              <h3 className="mb-2 mt-6 text-xs font-semibold uppercase tracking-wide text-ink-400">Pending invitations</h3>
              <table className="table-plain" data-testid="invitations-table">
                <tbody>
                  {invitations.map((i) => (
                    <tr key={i.id}>
                      <td>{i.email}</td>
                      <td className="capitalize">{i.role}</td>
                      <td className="text-ink-400">expires {i.expiresAt.slice(0, 10)}</td>
                      <td className="text-right"><CancelInvitationForm invitationId={i.id} email={i.email} /></td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </>
          )}
        </section>
      )}
    </div>
  );
}
