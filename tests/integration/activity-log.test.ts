/**
 * The activity log through the real server actions (only Next's request plumbing is replaced):
 * a setup save, an acknowledgement and a note deletion each leave one entry naming who did it;
 * owners and engineers read the team's log, riders and viewers may not; everyone who sees a
 * session reads its entries; another team sees none.
 */
import { describe, it, expect, beforeAll, vi } from "vitest";
import { initModels, Finding, Note } from "@/models";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { buildWorld, type World } from "./helpers/record-world";
import type { TeamRole } from "@/lib/auth/permissions";
import { at } from "../fixtures/at";

const request = vi.hoisted(() => ({ cookie: "" }));
vi.mock("next/headers", () => ({ headers: async () => new Headers(request.cookie ? { cookie: request.cookie } : {}) }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

const { saveSetupSheetAction } = await import("@/lib/actions/setup-sheets");
const { acknowledgeFindingAction } = await import("@/lib/actions/findings");
const { deleteNoteAction } = await import("@/lib/actions/session-notes");
const { listTeamActivity, listSessionActivity } = await import("@/lib/data/activity-log");
const { requireTeam } = await import("@/lib/auth/guard");

let team: TestTeam;
let other: TestTeam;
let world: World;
const as = (role: TeamRole) => (request.cookie = team.members[role].cookie);
const ctx = (t: TestTeam, role: TeamRole) => requireTeam(new Headers({ cookie: t.members[role].cookie }));
const form = (v: Record<string, string | number>) => {
  const f = new FormData();
  for (const [k, x] of Object.entries(v)) f.set(k, String(x));
  return f;
};

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Activity team");
  other = await createTeamWithRoles("Activity other");
  world = await buildWorld(team, [{ title: "Act FP", event: "a", rider: "own", bike: "one", startedAt: "2031-04-05T09:00:00Z", lapsMs: [92_000], findings: { open: 1, acknowledged: 0 } }]);
});

describe("activity log", () => {
  it("records a setup save, an acknowledgement and a deletion with who did it", async () => {
    const sessionId = at(world.sessions, "Act FP");
    as("engineer");
    expect((await saveSetupSheetAction({}, form({ sessionId, baseVersion: 0, forkPreloadMm: "5" }))).ok).toBe(true);
    const finding = (await Finding.findOne({ where: { sessionId } }))!;
    expect((await acknowledgeFindingAction({}, form({ findingId: finding.id, note: "Checked the rev limiter" }))).ok).toBe(true);
    const note = await Note.create({ teamId: team.teamId, sessionId, lapNumber: null, authorId: team.members.owner.userId, text: "to delete" });
    as("owner");
    expect((await deleteNoteAction({}, form({ noteId: note.id }))).ok).toBe(true);

    const log = await listTeamActivity(await ctx(team, "owner"));
    expect(log.map((e) => e.action)).toEqual(["note.delete", "finding.acknowledge", "setup.save"]);
    expect(log[2]).toMatchObject({ sessionId, actorName: "engineer", summary: "Saved setup version 1 (1 changed: forkPreloadMm)" });
    expect(at(log, 1).summary).toMatch(/Checked the rev limiter/);
    expect(at(log, 0).actorName).toBe("owner");
  });

  it("shows the team's log to owners and engineers only, the session's entries to whoever sees the session", async () => {
    expect(await listTeamActivity(await ctx(team, "engineer"))).toHaveLength(3);
    await expect(listTeamActivity(await ctx(team, "rider"))).rejects.toMatchObject({ status: 403 });
    await expect(listTeamActivity(await ctx(team, "viewer"))).rejects.toMatchObject({ status: 403 });
    expect(await listSessionActivity(await ctx(team, "viewer"), at(world.sessions, "Act FP"))).toHaveLength(3);
    expect(await listSessionActivity(await ctx(team, "rider"), at(world.sessions, "Act FP"))).toHaveLength(3);
    await expect(listSessionActivity(await ctx(other, "owner"), at(world.sessions, "Act FP"))).rejects.toMatchObject({ status: 404 });
    expect(await listTeamActivity(await ctx(other, "owner"))).toHaveLength(0);
  });
});
