/**
 * Real users, teams and sign-in cookies on the test database, made through better-auth itself.
 */
import { randomUUID } from "node:crypto";
import { getSequelize } from "@/models/db";
import { createAuth } from "@/lib/auth/create-auth";
import type { TeamRole } from "@/lib/auth/permissions";

export const PASSWORD = "integration-password-1";

export function testAuth() {
  return createAuth(getSequelize());
}

export interface TestMember {
  role: TeamRole;
  userId: string;
  email: string;
  cookie: string;
}

export interface TestTeam {
  teamId: string;
  members: Record<TeamRole, TestMember>;
}

export async function signInCookie(email: string, password = PASSWORD): Promise<string> {
  const res = await testAuth().api.signInEmail({ body: { email, password }, asResponse: true });
  if (res.status !== 200) throw new Error(`sign-in failed for ${email}: ${res.status} ${await res.text()}`);
  const cookies = res.headers.getSetCookie().map((c) => c.split(";")[0]);
  return cookies.join("; ");
}

export async function createUser(label: string): Promise<{ userId: string; email: string }> {
  const email = `${label}-${randomUUID().slice(0, 8)}@example.com`;
  const r = await testAuth().api.signUpEmail({ body: { email, password: PASSWORD, name: label } });
  return { userId: r.user.id, email };
}

/** A team with one member of each role, each signed in. */
export async function createTeamWithRoles(name = "Test team"): Promise<TestTeam> {
  const auth = testAuth();
  const owner = await createUser("owner");
  const team = await auth.api.createOrganization({ body: { name, slug: `t-${randomUUID().slice(0, 12)}`, userId: owner.userId } });
  if (!team) throw new Error("team not created");
  const members = { owner: { role: "owner", ...owner, cookie: "" } } as Record<TeamRole, TestMember>;
  for (const role of ["engineer", "rider", "viewer"] as const) {
    const u = await createUser(role);
    await auth.api.addMember({ body: { userId: u.userId, role, organizationId: team.id } });
    members[role] = { role, ...u, cookie: "" };
  }
  for (const m of Object.values(members)) m.cookie = await signInCookie(m.email);
  return { teamId: team.id, members };
}

export function req(url: string, cookie?: string, init: RequestInit = {}): Request {
  const headers = new Headers(init.headers);
  if (cookie) headers.set("cookie", cookie);
  return new Request(new URL(url, "http://localhost:3000"), { ...init, headers });
}

export const params = <P>(p: P) => ({ params: Promise.resolve(p) });
