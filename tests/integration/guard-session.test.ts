/**
 * The guard's own session resolution against the real MariaDB: the signed cookie is checked, the
 * session, user and memberships come from one query, and changes in the database (a revoked
 * session, a removed member, a new active team) count on the very next request.
 */
import { describe, it, expect, beforeAll } from "vitest";
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import { initModels } from "@/models";
import { requireTeam } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import { createTeamWithRoles, createUser, signInCookie, testAuth, type TestTeam } from "./helpers/teams";
import { at } from "../fixtures/at";

let a: TestTeam;
let b: TestTeam;

beforeAll(async () => {
  initModels();
  [a, b] = await Promise.all([createTeamWithRoles("Guard A"), createTeamWithRoles("Guard B")]);
});

const headersOf = (cookie: string) => new Headers({ cookie });
async function statusOf(p: Promise<unknown>): Promise<number> {
  try {
    await p;
    return 200;
  } catch (e) {
    if (e instanceof HttpError) return e.status;
    throw e;
  }
}
/** Only the session-token cookie, without better-auth's short-lived session_data cache cookie. */
const tokenCookie = (cookie: string) => cookie.split("; ").find((c) => c.startsWith("better-auth.session_token="))!;
const tokenOf = (cookie: string) => at(decodeURIComponent(at(tokenCookie(cookie).split("="), 1)).split("."), 0);

describe("requireTeam", () => {
  it("answers with the member's team and role from one database query", async () => {
    const sequelize = getSequelize();
    const seen: string[] = [];
    const hook = (sql: string) => void seen.push(sql);
    const original = sequelize.query.bind(sequelize);
    // Count every query that goes through Sequelize while the guard runs.
    sequelize.query = ((sql: string, opts: unknown) => (hook(String(sql)), original(sql as never, opts as never))) as typeof sequelize.query;
    try {
      const ctx = await requireTeam(headersOf(a.members.engineer.cookie));
      expect(ctx).toMatchObject({ teamId: a.teamId, role: "engineer", userId: a.members.engineer.userId, email: a.members.engineer.email });
      expect(ctx.memberships).toHaveLength(1);
    } finally {
      sequelize.query = original;
    }
    expect(seen).toHaveLength(1);
  });

  it("refuses a cookie whose signature does not match, or no cookie (401)", async () => {
    const token = tokenOf(a.members.owner.cookie);
    expect(await statusOf(requireTeam(headersOf(`better-auth.session_token=${encodeURIComponent(`${token}.${"A".repeat(43)}=`)}`)))).toBe(401);
    expect(await statusOf(requireTeam(headersOf(`better-auth.session_token=${token}`)))).toBe(401);
    expect(await statusOf(requireTeam(new Headers()))).toBe(401);
    // The same token with its own signature passes: the refusals above are the signature's.
    expect(await statusOf(requireTeam(headersOf(tokenCookie(a.members.owner.cookie))))).toBe(200);
  });

  it("refuses a session deleted in the database on the next request, even with the cookie cache present", async () => {
    const u = await createUser("revoked");
    await testAuth().api.addMember({ body: { userId: u.userId, role: "viewer", organizationId: a.teamId } });
    const cookie = await signInCookie(u.email);
    expect(cookie).toContain("session_data"); // better-auth's signed cache cookie is in the request
    expect(await statusOf(requireTeam(headersOf(cookie)))).toBe(200);
    await getSequelize().query("DELETE FROM session WHERE token = ?", { replacements: [tokenOf(cookie)], type: QueryTypes.DELETE });
    expect(await statusOf(requireTeam(headersOf(cookie)))).toBe(401);
  });

  it("refuses an expired session (401)", async () => {
    const u = await createUser("expired");
    const cookie = await signInCookie(u.email);
    await getSequelize().query("UPDATE session SET expiresAt = NOW(3) - INTERVAL 1 MINUTE WHERE token = ?", { replacements: [tokenOf(cookie)], type: QueryTypes.UPDATE });
    expect(await statusOf(requireTeam(headersOf(tokenCookie(cookie))))).toBe(401);
  });

  it("a member removed from the team is refused at once (403: no team), and roles are enforced (403)", async () => {
    const u = await createUser("removed");
    await testAuth().api.addMember({ body: { userId: u.userId, role: "engineer", organizationId: b.teamId } });
    const cookie = await signInCookie(u.email);
    expect((await requireTeam(headersOf(cookie), { roles: ["engineer"] })).teamId).toBe(b.teamId);
    expect(await statusOf(requireTeam(headersOf(cookie), { roles: ["owner"] }))).toBe(403);
    await getSequelize().query("DELETE FROM member WHERE userId = ?", { replacements: [u.userId], type: QueryTypes.DELETE });
    expect(await statusOf(requireTeam(headersOf(cookie)))).toBe(403);
  });

  it("follows the session's active team among several memberships", async () => {
    const u = await createUser("two-teams");
    const auth = testAuth();
    await auth.api.addMember({ body: { userId: u.userId, role: "viewer", organizationId: a.teamId } });
    await auth.api.addMember({ body: { userId: u.userId, role: "engineer", organizationId: b.teamId } });
    const cookie = await signInCookie(u.email);
    const token = tokenOf(cookie);
    await getSequelize().query("UPDATE session SET activeOrganizationId = ? WHERE token = ?", { replacements: [b.teamId, token], type: QueryTypes.UPDATE });
    const ctx = await requireTeam(headersOf(tokenCookie(cookie)));
    expect(ctx).toMatchObject({ teamId: b.teamId, role: "engineer" });
    expect(ctx.memberships.map((m) => m.teamId).sort()).toEqual([a.teamId, b.teamId].sort());
  });

  it("extends a session that is due for it, as better-auth's own getSession does", async () => {
    const u = await createUser("refresh");
    await testAuth().api.addMember({ body: { userId: u.userId, role: "viewer", organizationId: a.teamId } });
    const cookie = await signInCookie(u.email);
    const token = tokenOf(cookie);
    // better-auth's defaults: expiresIn 7 days, updateAge 1 day. Two days left = used five days ago.
    await getSequelize().query("UPDATE session SET expiresAt = NOW(3) + INTERVAL 2 DAY WHERE token = ?", { replacements: [token], type: QueryTypes.UPDATE });
    expect(await statusOf(requireTeam(headersOf(tokenCookie(cookie))))).toBe(200);
    const row = at(await getSequelize().query<{ left: number }>("SELECT TIMESTAMPDIFF(HOUR, NOW(3), expiresAt) AS `left` FROM session WHERE token = ?", { replacements: [token], type: QueryTypes.SELECT }), 0);
    expect(Number(row.left)).toBeGreaterThan(6 * 24);
  });
});
