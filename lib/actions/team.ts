"use server";
/**
 * Team server actions: invitations, roles, removal, team creation, switching, accepting.
 * Each checks the caller's role with the shared guard first, then asks better-auth (which checks
 * again with the same access-control roles), then revalidates the pages that show the result.
 */
import { headers } from "next/headers";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { auth } from "@/lib/auth/auth";
import { actionTeam } from "@/lib/auth/page-guard";
import { teamRoles } from "@/lib/auth/permissions";
import { recordActivity } from "@/lib/data/activity-log";
import { fieldErrors } from "@/lib/forms/form-state";

export interface ActionState {
  ok?: boolean;
  message?: string;
  errors?: Record<string, string>;
}

function fail(e: unknown, fallback: string): ActionState {
  const msg = e && typeof e === "object" && "message" in e && typeof e.message === "string" && e.message ? e.message : fallback;
  return { ok: false, message: msg };
}

const roleSchema = z.enum(teamRoles as [string, ...string[]], { message: "Choose one of owner, engineer, rider or viewer" });

const inviteSchema = z.object({ email: z.email("Enter a valid e-mail address"), role: roleSchema });

export async function inviteMember(_prev: ActionState, form: FormData): Promise<ActionState> {
  const g = await actionTeam({ permission: { invitation: ["create"] } });
  if (!g.ctx) return { ok: false, message: g.error };
  const parsed = inviteSchema.safeParse({ email: form.get("email"), role: form.get("role") });
  if (!parsed.success) return { ok: false, errors: fieldErrors(parsed.error) };
  try {
    await auth.api.createInvitation({
      headers: await headers(),
      body: { email: parsed.data.email.toLowerCase(), role: parsed.data.role as "viewer", organizationId: g.ctx.teamId, resend: true },
    });
  } catch (e) {
    return fail(e, "The invitation could not be sent.");
  }
  revalidatePath("/team");
  return { ok: true, message: `Invitation sent to ${parsed.data.email}.` };
}

export async function changeRole(_prev: ActionState, form: FormData): Promise<ActionState> {
  const g = await actionTeam({ permission: { member: ["update"] } });
  if (!g.ctx) return { ok: false, message: g.error };
  const parsed = z.object({ memberId: z.string().min(1), role: roleSchema }).safeParse({ memberId: form.get("memberId"), role: form.get("role") });
  if (!parsed.success) return { ok: false, errors: fieldErrors(parsed.error) };
  try {
    await auth.api.updateMemberRole({
      headers: await headers(),
      body: { memberId: parsed.data.memberId, role: parsed.data.role as "viewer", organizationId: g.ctx.teamId },
    });
  } catch (e) {
    return fail(e, "The role could not be changed.");
  }
  await recordActivity(g.ctx, { action: "member.role", subjectType: "member", subjectId: parsed.data.memberId, summary: `Changed a member's role to ${parsed.data.role}` });
  revalidatePath("/team");
  return { ok: true, message: "Role changed." };
}

export async function removeMember(_prev: ActionState, form: FormData): Promise<ActionState> {
  const g = await actionTeam({ permission: { member: ["delete"] } });
  if (!g.ctx) return { ok: false, message: g.error };
  const memberId = String(form.get("memberId") ?? "");
  if (!memberId) return { ok: false, message: "No member chosen." };
  try {
    await auth.api.removeMember({ headers: await headers(), body: { memberIdOrEmail: memberId, organizationId: g.ctx.teamId } });
  } catch (e) {
    return fail(e, "The member could not be removed.");
  }
  await recordActivity(g.ctx, { action: "member.remove", subjectType: "member", subjectId: memberId, summary: "Removed a member from the team" });
  revalidatePath("/team");
  return { ok: true, message: "Member removed." };
}

export async function cancelInvitation(_prev: ActionState, form: FormData): Promise<ActionState> {
  const g = await actionTeam({ permission: { invitation: ["cancel"] } });
  if (!g.ctx) return { ok: false, message: g.error };
  try {
    await auth.api.cancelInvitation({ headers: await headers(), body: { invitationId: String(form.get("invitationId") ?? "") } });
  } catch (e) {
    return fail(e, "The invitation could not be cancelled.");
  }
  revalidatePath("/team");
  return { ok: true, message: "Invitation cancelled." };
}

const teamSchema = z.object({
  name: z.string().trim().min(2, "Give the team a name of at least 2 characters").max(80),
});

function slugify(name: string): string {
  const base = name.toLowerCase().normalize("NFKD").replace(/[^a-z0-9]+/g, "-").replace(/^-|-$/g, "").slice(0, 40) || "team";
  return `${base}-${Math.random().toString(36).slice(2, 7)}`;
}

export async function createTeam(_prev: ActionState, form: FormData): Promise<ActionState> {
  const h = await headers();
  const session = await auth.api.getSession({ headers: h });
  if (!session) return { ok: false, message: "Sign in to continue." };
  const parsed = teamSchema.safeParse({ name: form.get("name") });
  if (!parsed.success) return { ok: false, errors: fieldErrors(parsed.error) };
  try {
    const team = await auth.api.createOrganization({ headers: h, body: { name: parsed.data.name, slug: slugify(parsed.data.name) } });
    if (team) await auth.api.setActiveOrganization({ headers: h, body: { organizationId: team.id } });
  } catch (e) {
    return fail(e, "The team could not be created.");
  }
  revalidatePath("/", "layout");
  return { ok: true, message: "Team created." };
}

export async function switchTeam(teamId: string): Promise<ActionState> {
  const g = await actionTeam();
  if (!g.ctx) return { ok: false, message: g.error };
  if (!g.ctx.memberships.some((m) => m.teamId === teamId)) return { ok: false, message: "You are not a member of that team." };
  await auth.api.setActiveOrganization({ headers: await headers(), body: { organizationId: teamId } });
  revalidatePath("/", "layout");
  return { ok: true };
}

export async function acceptInvitation(invitationId: string): Promise<ActionState> {
  const h = await headers();
  const session = await auth.api.getSession({ headers: h });
  if (!session) return { ok: false, message: "Sign in to continue." };
  try {
    const r = await auth.api.acceptInvitation({ headers: h, body: { invitationId } });
    const teamId = r?.invitation?.organizationId;
    if (teamId) await auth.api.setActiveOrganization({ headers: h, body: { organizationId: teamId } });
  } catch (e) {
    return fail(e, "The invitation could not be accepted.");
  }
  revalidatePath("/", "layout");
  return { ok: true, message: "Welcome to the team." };
}
