/**
 * Lapbench's auth options end to end on the migrated test database (real MariaDB, real SMTP
 * exchange with a local smtp-server): sign-up, sign-in, teams and roles, invitation and
 * password-reset e-mails, and the sign-in rate limit through the HTTP handler.
 * The role expectations are the team role table (lib/auth/permissions.ts), spelled out below.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QueryTypes, type Sequelize } from "sequelize";
import { SMTPServer } from "smtp-server";
import { simpleParser, type ParsedMail } from "mailparser";
import type { AddressInfo } from "node:net";
import { createSequelize } from "@/models/db";
import { config } from "@/lib/config";
import { createAuth, type LapbenchAuth } from "@/lib/auth/create-auth";
import { invitationUrl, MIN_PASSWORD_LENGTH, SIGN_IN_RATE_LIMIT } from "@/lib/auth/options";
import { teamRoles, type TeamRole } from "@/lib/auth/permissions";
import { at } from "../fixtures/at";

const run = `${process.pid}-${Date.now().toString(36)}`;
const email = (who: string) => `${who}-${run}@lapbench.invalid`;
const PASSWORD = "gearbox-ratio-4711";

let db: Sequelize;
let auth: LapbenchAuth;
let smtp: SMTPServer;
const inbox: ParsedMail[] = [];

async function waitForMail(to: string, timeoutMs = 5000): Promise<ParsedMail> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = inbox.find((m) => m.to && !Array.isArray(m.to) && m.to.value.some((a) => a.address === to));
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`no mail to ${to} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** The session cookie of a sign-in response, as request headers. */
function cookieHeaders(res: Headers): Headers {
  const cookie = res.getSetCookie().map((c) => c.split(";")[0]).join("; ");
  return new Headers({ cookie });
}

async function signUpAndIn(who: string): Promise<{ userId: string; headers: Headers }> {
  const up = await auth.api.signUpEmail({ body: { email: email(who), password: PASSWORD, name: `Test ${who}` } });
  const { headers } = await auth.api.signInEmail({ body: { email: email(who), password: PASSWORD }, returnHeaders: true });
  return { userId: up.user.id, headers: cookieHeaders(headers) };
}

beforeAll(async () => {
  smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    onData(stream, _session, done) {
      simpleParser(stream).then((m) => (inbox.push(m), done()), done);
    },
  });
  await new Promise<void>((resolve) => smtp.listen(0, "127.0.0.1", resolve));
  // A free port picked by the OS; send-mail reads config.smtp when it first sends.
  config.smtp.port = (smtp.server.address() as AddressInfo).port;
  db = createSequelize(process.env.LAPBENCH_DB_NAME!, { pool: 5 });
  auth = createAuth(db);
});

afterAll(async () => {
  await db?.close();
  await new Promise<void>((resolve) => smtp.close(() => resolve()));
});

describe("sign-up and sign-in", () => {
  it("signs up, signs in with the right password, refuses a wrong one and a short one", async () => {
    const { userId, headers } = await signUpAndIn("rider-a");
    const session = await auth.api.getSession({ headers });
    expect(session?.user.id).toBe(userId);
    expect(session?.user.email).toBe(email("rider-a"));

    await expect(auth.api.signInEmail({ body: { email: email("rider-a"), password: `${PASSWORD}-wrong` } })).rejects.toMatchObject({ statusCode: 401 });
    await expect(auth.api.signInEmail({ body: { email: email("nobody"), password: PASSWORD } })).rejects.toMatchObject({ statusCode: 401 });
    await expect(
      auth.api.signUpEmail({ body: { email: email("short"), password: "x".repeat(MIN_PASSWORD_LENGTH - 1), name: "Short" } }),
    ).rejects.toMatchObject({ statusCode: 400 });

    // The password is stored hashed in the account table, never as given.
    const account = at(await db.query<{ password: string }>("SELECT password FROM account WHERE userId = ?", { type: QueryTypes.SELECT, replacements: [userId] }), 0);
    expect(account.password).toBeTruthy();
    expect(account.password).not.toContain(PASSWORD);
  });

  it("mails a password-reset link whose token sets a new password", async () => {
    await signUpAndIn("forgetful");
    await auth.api.requestPasswordReset({ body: { email: email("forgetful"), redirectTo: "/reset-password" } });
    const mail = await waitForMail(email("forgetful"));
    const link = mail.text!.match(/https?:\/\/\S+/)![0];
    expect(link.startsWith(`${config.appUrl}/api/auth/reset-password/`)).toBe(true);
    const token = new URL(link).pathname.split("/").pop()!;
    await auth.api.resetPassword({ body: { token, newPassword: "new-clutch-plate-99" } });
    await expect(auth.api.signInEmail({ body: { email: email("forgetful"), password: PASSWORD } })).rejects.toMatchObject({ statusCode: 401 });
    const ok = await auth.api.signInEmail({ body: { email: email("forgetful"), password: "new-clutch-plate-99" } });
    expect(ok.user.email).toBe(email("forgetful"));
  });
});

describe("teams and roles", () => {
  const people = {} as Record<TeamRole, { userId: string; headers: Headers }>;
  let teamId: string;

  beforeAll(async () => {
    for (const role of teamRoles) people[role] = await signUpAndIn(`team-${role}`);
    const team = await auth.api.createOrganization({ body: { name: `Test Team ${run}`, slug: `test-team-${run}` }, headers: people.owner.headers });
    teamId = team!.id;
    for (const role of ["engineer", "rider", "viewer"] as const) {
      await auth.api.addMember({ body: { userId: people[role].userId, role, organizationId: teamId } });
    }
  });

  it("makes the creator the owner and the others members with their roles", async () => {
    const full = await auth.api.getFullOrganization({ query: { organizationId: teamId }, headers: people.owner.headers });
    const roleOf = Object.fromEntries(full!.members.map((m) => [m.userId, m.role]));
    for (const role of teamRoles) expect(roleOf[people[role].userId], role).toBe(role);
  });

  // The role table: team/members/roles/deleting data — owner only; upload, edit setup data and
  // acknowledge findings — owner and engineer; notes — owner, engineer, rider (own sessions);
  // viewer — read-only.
  const cases: Array<[string, Record<string, string[]>, TeamRole[]]> = [
    ["update the team", { team: ["update"] }, ["owner"]],
    ["delete the team", { team: ["delete"] }, ["owner"]],
    ["update the team (plugin's own resource)", { organization: ["update"] }, ["owner"]],
    ["add members", { member: ["create"] }, ["owner"]],
    ["change roles", { member: ["update"] }, ["owner"]],
    ["remove members", { member: ["delete"] }, ["owner"]],
    ["invite", { invitation: ["create"] }, ["owner"]],
    ["cancel invitations", { invitation: ["cancel"] }, ["owner"]],
    ["delete session data", { "session-data": ["delete"] }, ["owner"]],
    ["upload logs", { "session-data": ["upload"] }, ["owner", "engineer"]],
    ["edit tracks, bikes, engines, setup sheets, thresholds", { setup: ["edit"] }, ["owner", "engineer"]],
    ["acknowledge findings", { finding: ["acknowledge"] }, ["owner", "engineer"]],
    ["write notes", { note: ["create"] }, ["owner", "engineer", "rider"]],
  ];
  it.each(cases)("may %s: %j → %j", async (_what, permissions, allowed) => {
    for (const role of teamRoles) {
      const res = await auth.api.hasPermission({ headers: people[role].headers, body: { organizationId: teamId, permissions } });
      expect(res.success, `${role}`).toBe(allowed.includes(role));
    }
  });

  it("enforces the roles in the team endpoints themselves", async () => {
    await expect(
      auth.api.createInvitation({ body: { email: email("not-invited"), role: "viewer", organizationId: teamId }, headers: people.engineer.headers }),
    ).rejects.toMatchObject({ statusCode: 403 });
    await expect(
      auth.api.updateOrganization({ body: { organizationId: teamId, data: { name: "Renamed" } }, headers: people.engineer.headers }),
    ).rejects.toMatchObject({ statusCode: 403 });
    const full = await auth.api.getFullOrganization({ query: { organizationId: teamId }, headers: people.owner.headers });
    const viewerMember = full!.members.find((m) => m.userId === people.viewer.userId)!;
    await expect(
      auth.api.updateMemberRole({ body: { organizationId: teamId, memberId: viewerMember.id, role: "owner" }, headers: people.rider.headers }),
    ).rejects.toMatchObject({ statusCode: 403 });
    await expect(
      auth.api.removeMember({ body: { organizationId: teamId, memberIdOrEmail: viewerMember.id }, headers: people.engineer.headers }),
    ).rejects.toThrow(/not allowed to delete/); // better-auth answers this one with 401
    const after = await auth.api.getFullOrganization({ query: { organizationId: teamId }, headers: people.owner.headers });
    expect(after!.members.find((m) => m.id === viewerMember.id)?.role).toBe("viewer");
  });

  it("keeps addMember (which skips role checks) off the HTTP API: server code only", async () => {
    const outsider = await signUpAndIn("outsider");
    const res = await auth.handler(
      new Request(`${config.appUrl}/api/auth/organization/add-member`, {
        method: "POST",
        headers: { "content-type": "application/json", origin: config.appUrl, cookie: people.engineer.headers.get("cookie")! },
        body: JSON.stringify({ userId: outsider.userId, role: "owner", organizationId: teamId }),
      }),
    );
    expect(res.status).toBe(404);
    const full = await auth.api.getFullOrganization({ query: { organizationId: teamId }, headers: people.owner.headers });
    expect(full!.members.some((m) => m.userId === outsider.userId)).toBe(false);
  });

  it("mails an invitation with the accept link, valid for 7 days", async () => {
    const invitee = email("invitee");
    const inv = await auth.api.createInvitation({ body: { email: invitee, role: "engineer", organizationId: teamId }, headers: people.owner.headers });
    const mail = await waitForMail(invitee);
    expect(mail.text).toContain(invitationUrl(inv.id));
    expect(invitationUrl(inv.id)).toBe(`${config.appUrl}/accept-invitation/${inv.id}`);
    expect(mail.html).toContain(`href="${config.appUrl}/accept-invitation/${inv.id}"`);
    const days = (new Date(inv.expiresAt).getTime() - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(6.99);
    expect(days).toBeLessThanOrEqual(7);
  });
});

describe("sign-in rate limit", () => {
  const signIn = (ip: string) =>
    auth.handler(
      new Request(`${config.appUrl}/api/auth/sign-in/email`, {
        method: "POST",
        headers: { "content-type": "application/json", origin: config.appUrl, "x-forwarded-for": ip },
        body: JSON.stringify({ email: email("nobody"), password: "not-the-password-1" }),
      }),
    );

  it(`answers 429 after ${SIGN_IN_RATE_LIMIT.max} attempts a minute from one client, counted in the database`, async () => {
    const ip = "198.51.100.23"; // documentation range (RFC 5737)
    const statuses: number[] = [];
    for (let i = 0; i < SIGN_IN_RATE_LIMIT.max + 2; i++) statuses.push((await signIn(ip)).status);
    expect(statuses.slice(0, SIGN_IN_RATE_LIMIT.max)).toEqual(Array(SIGN_IN_RATE_LIMIT.max).fill(401));
    expect(statuses.slice(SIGN_IN_RATE_LIMIT.max)).toEqual([429, 429]);

    const limited = await signIn(ip);
    expect(Number(limited.headers.get("x-retry-after"))).toBeGreaterThan(0);

    // Another client is not affected.
    expect((await signIn("198.51.100.24")).status).toBe(401);

    const rows = await db.query<{ count: number }>("SELECT `count` FROM rateLimit WHERE `key` LIKE ?", { type: QueryTypes.SELECT, replacements: [`${ip}%sign-in/email`] });
    expect(rows).toHaveLength(1);
    expect(at(rows, 0).count).toBeGreaterThanOrEqual(SIGN_IN_RATE_LIMIT.max);
  });
});
