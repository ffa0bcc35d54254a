import "server-only";
/**
 * The one server-side guard every route handler, server action and page uses:
 * session → active team → role. Another team's resources answer 404 (never 403), so ids of other
 * teams' data are not even confirmed to exist. The signed session cookie is checked here and the
 * session, user and memberships are read in one query (better-auth's own getSession only runs
 * when a session is due to be extended). No cookie cache: a revoked session or a removed member
 * is refused on the next request.
 */
import { createHmac, timingSafeEqual } from "node:crypto";
import { cache } from "react";
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

/** A signed-in user with no team yet: 403 to an API caller; a page sends them to create a team. */
export class NoTeamError extends HttpError {
  constructor() {
    super(403, "You are not a member of any team yet. Create a team or accept an invitation.");
    this.name = "NoTeamError";
  }
}

type Statements = Parameters<(typeof roles)["owner"]["authorize"]>[0];
export type Permission = Statements;

/** Whether a role holds a permission (the team role table, defined in lib/auth/permissions.ts). */
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

/** The session token from the signed session cookie, or null when it is absent or its signature is wrong. */
function sessionTokenFrom(cookieHeader: string, cookieName: string, secret: string): string | null {
  for (const part of cookieHeader.split(";")) {
    const eq = part.indexOf("=");
    if (eq < 0 || part.slice(0, eq).trim() !== cookieName) continue;
    let value: string;
    try {
      value = decodeURIComponent(part.slice(eq + 1).trim());
    } catch {
      return null;
    }
    // better-auth signs the cookie as `token.base64(HMAC-SHA256(secret, token))` (44 characters).
    const dot = value.lastIndexOf(".");
    if (dot < 1) return null;
    const token = value.slice(0, dot);
    const given = Buffer.from(value.slice(dot + 1), "base64");
    const expected = createHmac("sha256", secret).update(token).digest();
    return given.length === expected.length && timingSafeEqual(given, expected) ? token : null;
  }
  return null;
}

interface SessionMemberRow {
  userId: string;
  userName: string;
  email: string;
  expiresAt: Date;
  activeOrganizationId: string | null;
  teamId: string | null;
  teamName: string | null;
  teamSlug: string | null;
  role: string | null;
}

interface ResolvedSession {
  userId: string;
  userName: string;
  email: string;
  activeOrganizationId: string | null;
  memberships: Membership[];
}

/**
 * Session → user → every membership with its team, in one query. Expired or unknown tokens give
 * null. When better-auth would extend the session (older than its update age), its own
 * getSession runs too, so sessions that are used stay alive exactly as before (about once a day).
 */
async function resolveSession(cookieHeader: string): Promise<ResolvedSession | null> {
  if (!cookieHeader) return null;
  const ac = await auth.$context;
  const token = sessionTokenFrom(cookieHeader, ac.authCookies.sessionToken.name, ac.secret);
  if (!token) return null;
  const rows = await getSequelize().query<SessionMemberRow>(
    `SELECT u.id AS userId, u.name AS userName, u.email AS email, s.expiresAt AS expiresAt, s.activeOrganizationId AS activeOrganizationId,
            m.organizationId AS teamId, o.name AS teamName, o.slug AS teamSlug, m.role AS role
       FROM session s JOIN user u ON u.id = s.userId
       LEFT JOIN member m ON m.userId = u.id LEFT JOIN organization o ON o.id = m.organizationId
      WHERE s.token = ? AND s.expiresAt > NOW(3)
      ORDER BY m.createdAt ASC`,
    { replacements: [token], type: QueryTypes.SELECT },
  );
  const first = rows[0];
  if (!first) return null;
  const expiresAtMs = new Date(first.expiresAt).getTime();
  const { expiresIn, updateAge } = ac.sessionConfig;
  if (expiresAtMs - expiresIn * 1000 + updateAge * 1000 <= Date.now()) {
    // Let better-auth refresh the session's expiry (and drop it if it finds it invalid).
    if (!(await auth.api.getSession({ headers: new Headers({ cookie: cookieHeader }) }))) return null;
  }
  const memberships = rows
    .filter((r) => r.teamId != null && r.teamName != null && r.teamSlug != null && r.role != null)
    .map((r) => ({ teamId: r.teamId!, teamName: r.teamName!, teamSlug: r.teamSlug!, role: (r.role!.split(",")[0]?.trim() ?? "viewer") as TeamRole }))
    .filter((r) => teamRoles.includes(r.role));
  return { userId: first.userId, userName: first.userName, email: first.email, activeOrganizationId: first.activeOrganizationId, memberships };
}

/**
 * One resolution per request: React's cache() memoises it for the length of a server render (a
 * layout and its page share it), keyed by the cookie text, so another sign-in never shares it.
 * Outside a render (route handlers, scripts) it simply calls through.
 */
const resolveSessionCached = cache(resolveSession);

/** Resolve the signed-in user's active team and role from request headers, or throw HttpError. */
export async function requireTeam(headers: Headers, opts: GuardOptions = {}): Promise<TeamContext> {
  const session = await resolveSessionCached(headers.get("cookie") ?? "");
  if (!session) throw unauthorized();
  const { memberships } = session;
  const active = memberships.find((m) => m.teamId === session.activeOrganizationId) ?? memberships[0];
  if (!active) throw new NoTeamError();
  if (opts.roles && !opts.roles.includes(active.role)) throw forbidden();
  if (opts.permission && !roleCan(active.role, opts.permission)) throw forbidden();
  return { ...active, userId: session.userId, userName: session.userName, email: session.email, memberships };
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
