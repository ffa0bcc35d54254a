import "server-only";
/**
 * The one server-side guard every route handler, server action and page uses:
 * session → active team → role. Another team's resources answer 404 (never 403), so ids of other
 * teams' data are not even confirmed to exist.
 */
import { QueryTypes } from "sequelize";
import { auth } from "./auth";
import { roles, type TeamRole, teamRoles } from "./permissions";
import { getSequelize } from "@/models/db";
import { HttpError, forbidden, unauthorized } from "@/lib/http/http-error";

export interface Membership {
  teamId: string;
  teamName: string;
  teamSlug: string;
  role: TeamRole;
}

export interface TeamContext extends Membership {
  userId: string;
  userName: string;
  email: string;
  memberships: Membership[];
}

type Statements = Parameters<(typeof roles)["owner"]["authorize"]>[0];
export type Permission = Statements;

/** Whether a role holds a permission (PRODUCT.md §7, defined in lib/auth/permissions.ts). */
export function roleCan(role: TeamRole, permission: Permission): boolean {
  return roles[role].authorize(permission).success;
}

export async function membershipsOf(userId: string): Promise<Membership[]> {
  const rows = await getSequelize().query<{ teamId: string; teamName: string; teamSlug: string; role: string }>(
    `SELECT m.organizationId AS teamId, o.name AS teamName, o.slug AS teamSlug, m.role AS role
       FROM member m JOIN organization o ON o.id = m.organizationId
      WHERE m.userId = ? ORDER BY m.createdAt ASC`,
    { replacements: [userId], type: QueryTypes.SELECT },
  );
  return rows
    .map((r) => ({ ...r, role: (r.role.split(",")[0]?.trim() ?? "viewer") as TeamRole }))
    .filter((r) => teamRoles.includes(r.role));
}

export interface GuardOptions {
  /** Roles allowed; omitted = any member. */
  roles?: readonly TeamRole[];
  /** A permission the role must hold (alternative to `roles`). */
  permission?: Permission;
}

/** Resolve the signed-in user's active team and role from request headers, or throw HttpError. */
export async function requireTeam(headers: Headers, opts: GuardOptions = {}): Promise<TeamContext> {
  const session = await auth.api.getSession({ headers });
  if (!session) throw unauthorized();
  const memberships = await membershipsOf(session.user.id);
  if (memberships.length === 0) throw new HttpError(403, "You are not a member of any team yet. Create a team or accept an invitation.");
  const activeId = (session.session as { activeOrganizationId?: string | null }).activeOrganizationId;
  const active = memberships.find((m) => m.teamId === activeId) ?? memberships[0];
  if (opts.roles && !opts.roles.includes(active.role)) throw forbidden();
  if (opts.permission && !roleCan(active.role, opts.permission)) throw forbidden();
  return { ...active, userId: session.user.id, userName: session.user.name, email: session.user.email, memberships };
}

/** The signed-in user, team or not (for team creation and invitations). */
export async function requireUser(headers: Headers) {
  const session = await auth.api.getSession({ headers });
  if (!session) throw unauthorized();
  return session;
}

/** Throw 404 unless the row exists and belongs to the caller's team. */
export function assertTeamOwns<T extends { teamId: string }>(row: T | null | undefined, ctx: { teamId: string }, what: string): T {
  if (!row || row.teamId !== ctx.teamId) throw new HttpError(404, `${what} was not found in your team.`);
  return row;
}
