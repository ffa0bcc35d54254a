/**
 * The rider-visibility rule has one definition (lib/data/sessions.ts) in two forms: raw SQL for
 * hot paths and a Sequelize condition for finders. One table of cases runs through both paths
 * against the real MariaDB, and both must give the same visible set, which must be the rule:
 * a rider sees sessions shared with riders and those of rider rows linked to their sign-in; every
 * other role sees all of the team's; nobody sees another team's. (The rule is the product's own.)
 */
import { describe, it, expect, beforeAll, vi } from "vitest";
import { QueryTypes } from "sequelize";
import { initModels, RideSession, Rider } from "@/models";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import type { TeamRole } from "@/lib/auth/permissions";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";

vi.mock("next/headers", () => ({ headers: async () => new Headers() }));

const { sessionVisibility, sessionVisibilitySql } = await import("@/lib/data/sessions");

let a: TestTeam;
let b: TestTeam;
const ids = new Map<string, number>();

function session(teamId: string, title: string, riderId: number | null, sharedWithRiders: boolean) {
  return RideSession.create({
    teamId, eventId: null, bikeId: null, engineId: null, riderId, trackId: null, logFileId: null, importProfileId: null, title, startedAt: null,
    conditions: null, statusReason: null, mapping: null, summary: null, durationS: null, createdBy: null, sharedWithRiders,
  });
}

beforeAll(async () => {
  initModels();
  a = await createTeamWithRoles("Rule A");
  b = await createTeamWithRoles("Rule B");
  const mine = await Rider.create({ teamId: a.teamId, name: "Signed-in rider", raceNumber: "21", userId: a.members.rider.userId });
  // The same person entered twice (e.g. two race numbers): both rows are theirs.
  const mineToo = await Rider.create({ teamId: a.teamId, name: "Signed-in rider, 2nd number", raceNumber: "121", userId: a.members.rider.userId });
  const mate = await Rider.create({ teamId: a.teamId, name: "Team-mate", raceNumber: "22", userId: null });
  // In team B the same user has a rider row too: it must not open team A's sessions, nor A's B's.
  const elsewhere = await Rider.create({ teamId: b.teamId, name: "Same user in team B", raceNumber: "23", userId: a.members.rider.userId });
  const rows: [string, string, number | null, boolean][] = [
    ["own", a.teamId, mine.id, false],
    ["own, second number", a.teamId, mineToo.id, false],
    ["mate's", a.teamId, mate.id, false],
    ["mate's, shared", a.teamId, mate.id, true],
    ["no rider", a.teamId, null, false],
    ["no rider, shared", a.teamId, null, true],
    ["team B, shared", b.teamId, null, true],
    ["team B, same user's row", b.teamId, elsewhere.id, false],
  ];
  for (const [title, teamId, riderId, shared] of rows) ids.set(title, (await session(teamId, title, riderId, shared)).id);
});

const ctx = (team: () => TestTeam, role: TeamRole, userOf: TeamRole = role): TeamContext => {
  const t = team();
  return { teamId: t.teamId, teamName: "t", teamSlug: "t", role, userId: t.members[userOf].userId, userName: "u", email: t.members[userOf].email, memberships: [] };
};

const ALL_A = ["own", "own, second number", "mate's", "mate's, shared", "no rider", "no rider, shared"];

const cases: { label: string; ctx: () => TeamContext; visible: string[] }[] = [
  { label: "rider with two linked rows", ctx: () => ctx(() => a, "rider"), visible: ["own", "own, second number", "mate's, shared", "no rider, shared"] },
  { label: "rider without a linked row", ctx: () => ctx(() => a, "rider", "viewer"), visible: ["mate's, shared", "no rider, shared"] },
  { label: "engineer", ctx: () => ctx(() => a, "engineer"), visible: ALL_A },
  { label: "viewer", ctx: () => ctx(() => a, "viewer"), visible: ALL_A },
  { label: "owner", ctx: () => ctx(() => a, "owner"), visible: ALL_A },
  { label: "team B's rider (the same user has a row there)", ctx: () => ({ ...ctx(() => b, "rider"), userId: a.members.rider.userId }), visible: ["team B, shared", "team B, same user's row"] },
];

async function viaSql(c: TeamContext): Promise<string[]> {
  const { sql, replacements } = sessionVisibilitySql(c, "s");
  const rows = await getSequelize().query<{ id: number }>(`SELECT s.id FROM ride_sessions s WHERE ${sql} AND s.id IN (?)`, { replacements: [...replacements, [...ids.values()]], type: QueryTypes.SELECT });
  return titles(rows.map((r) => r.id));
}

async function viaSequelize(c: TeamContext): Promise<string[]> {
  const rows = await RideSession.findAll({ where: { ...(await sessionVisibility(c)), id: [...ids.values()] }, attributes: ["id"] });
  return titles(rows.map((r) => r.id));
}

function titles(found: number[]): string[] {
  return [...ids].filter(([, id]) => found.includes(id)).map(([t]) => t).sort();
}

describe("rider visibility: SQL path and Sequelize path over one table", () => {
  it.each(cases)("$label", async ({ ctx: make, visible }) => {
    const c = make();
    const [sql, orm] = await Promise.all([viaSql(c), viaSequelize(c)]);
    expect(sql).toEqual(orm);
    expect(orm).toEqual([...visible].sort());
  });

  it("a user id with a quote in it is data, not SQL, on the Sequelize path", async () => {
    const c = { ...ctx(() => a, "rider"), userId: "x' OR '1'='1" };
    expect(await viaSequelize(c)).toEqual(["mate's, shared", "no rider, shared"]);
    expect(await viaSql(c)).toEqual(["mate's, shared", "no rider, shared"]);
  });
});
