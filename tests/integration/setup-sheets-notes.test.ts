/**
 * Setup sheets and session notes through their server actions and lib/data, against the real
 * MariaDB with real better-auth users of every role: saving a sheet adds a version and keeps the
 * old ones, only engineers and the owner save, another team's session is a 404, bad fields come
 * back one message each; notes follow the role rules (a rider writes on sessions they rode, not on
 * ones merely shared with them; a viewer never) and the delete rules (author, or the owner).
 * Only Next's request plumbing is replaced (headers, revalidation).
 */
import { describe, it, expect, beforeAll, vi } from "vitest";
import { initModels, Bike, Lap, Note, RideSession, Rider, SetupSheet } from "@/models";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import type { TeamRole } from "@/lib/auth/permissions";
import { at } from "../fixtures/at";

const request = vi.hoisted(() => ({ cookie: "" }));
vi.mock("next/headers", () => ({ headers: async () => new Headers(request.cookie ? { cookie: request.cookie } : {}) }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

const { saveSetupSheetAction } = await import("@/lib/actions/setup-sheets");
const { createNoteAction, deleteNoteAction } = await import("@/lib/actions/session-notes");
const { getSetupSheetView } = await import("@/lib/data/setup-sheets");
const { getSessionNotes } = await import("@/lib/data/session-notes");
const { requireTeam } = await import("@/lib/auth/guard");

const ROLES: TeamRole[] = ["owner", "engineer", "rider", "viewer"];
const EDITORS: TeamRole[] = ["owner", "engineer"];

let a: TestTeam;
let b: TestTeam;
/** Team A: ridden by A's rider user; another rider's, shared with riders; another rider's, not shared. */
let own: number;
let shared: number;
let hidden: number;
let mineRider: number;

function as(team: TestTeam, role: TeamRole) {
  request.cookie = team.members[role].cookie;
}

async function ctxOf(team: TestTeam, role: TeamRole) {
  return requireTeam(new Headers({ cookie: team.members[role].cookie }));
}

function form(values: Record<string, string | number>): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(values)) f.set(k, String(v));
  return f;
}

function session(teamId: string, extra: Partial<Parameters<typeof RideSession.create>[0]>) {
  return RideSession.create({
    teamId, eventId: null, bikeId: null, engineId: null, riderId: null, trackId: null, logFileId: null, importProfileId: null, title: "s", startedAt: null,
    conditions: null, statusReason: null, mapping: null, summary: null, durationS: null, createdBy: null, ...extra,
  });
}

/** A fresh session of team A for tests that count versions from zero. */
async function freshSession(title: string, bikeId: number | null = null, riderId: number | null = null): Promise<number> {
  return (await session(a.teamId, { title, bikeId, riderId })).id;
}

const SHEET = {
  forkSpringNmm: "10", forkPreloadMm: "5", forkCompressionClicks: "12", forkReboundClicks: "10", forkOilLevelMm: "130", forkHeightMm: "4",
  shockSpringNmm: "95", shockPreloadMm: "8", shockCompressionLowClicks: "14", shockCompressionHighClicks: "2", shockReboundClicks: "11", rideHeightMm: "3",
  tyreFrontCompound: "Soft slick", tyreRearCompound: "Medium slick", tyreFrontColdBar: "2.1", tyreRearColdBar: "1.6",
  sprocketFrontTeeth: "16", sprocketRearTeeth: "42", tractionControlLevel: "4", engineBrakeLevel: "2", engineMap: "B", notes: "Baseline for the morning",
};

beforeAll(async () => {
  initModels();
  [a, b] = await Promise.all([createTeamWithRoles("Sheets A"), createTeamWithRoles("Sheets B")]);
  const mine = await Rider.create({ teamId: a.teamId, name: "A rider", raceNumber: "7", userId: a.members.rider.userId });
  mineRider = mine.id;
  const other = await Rider.create({ teamId: a.teamId, name: "Other rider", raceNumber: "8", userId: null });
  own = (await session(a.teamId, { title: "Own", riderId: mine.id })).id;
  shared = (await session(a.teamId, { title: "Shared", riderId: other.id, sharedWithRiders: true })).id;
  hidden = (await session(a.teamId, { title: "Hidden", riderId: other.id })).id;
  for (const n of [1, 2, 3]) {
    await Lap.create({ sessionId: own, number: n, startTimeS: n * 100, endTimeS: n * 100 + 98, lapTimeMs: 98_000, distanceM: 4000, sectorTimesMs: null, topSpeedMps: null, stats: null });
  }
});

describe("setup sheet versions", () => {
  it("saves version 1, then version 2 on top, keeping version 1 as it was", async () => {
    const bike = await Bike.create({ teamId: a.teamId, name: "Sheet bike", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: 15, sprocketRear: 43, revCeilingRpm: null, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null });
    // Ridden by A's rider, so every role of team A sees it.
    const id = await freshSession("Versions", bike.id, mineRider);
    // With nothing saved, the editor starts from the bike's sprockets.
    const empty = await getSetupSheetView(await ctxOf(a, "engineer"), id);
    expect(empty.versions).toEqual([]);
    expect(empty.starting).toMatchObject({ sprocketFrontTeeth: 15, sprocketRearTeeth: 43, forkSpringNmm: null });

    as(a, "engineer");
    const s1 = await saveSetupSheetAction({}, form({ sessionId: id, baseVersion: 0, ...SHEET }));
    expect(s1).toMatchObject({ ok: true, message: "Version 1 saved (22 fields changed)." });
    as(a, "owner");
    const s2 = await saveSetupSheetAction({}, form({ sessionId: id, baseVersion: 1, ...SHEET, forkPreloadMm: "6", tyreRearColdBar: "1,7", engineMap: "" }));
    expect(s2).toMatchObject({ ok: true, message: "Version 2 saved (3 fields changed)." });

    const rows = await SetupSheet.findAll({ where: { sessionId: id }, order: [["version", "ASC"]] });
    expect(rows.map((r) => [r.version, r.createdBy, r.bikeId])).toEqual([
      [1, a.members.engineer.userId, bike.id],
      [2, a.members.owner.userId, bike.id],
    ]);
    const row1 = at(rows, 0);
    const v1 = typeof row1.fields === "string" ? JSON.parse(row1.fields) : row1.fields;
    expect(v1).toMatchObject({ forkPreloadMm: 5, tyreRearColdBar: 1.6, engineMap: "B", tyreFrontCompound: "Soft slick", forkCompressionClicks: 12 });

    // Every role that sees the session reads the same history.
    for (const role of ROLES) {
      const view = await getSetupSheetView(await ctxOf(a, role), id);
      expect(view.canEdit).toBe(EDITORS.includes(role));
      expect(view.versions.map((v) => v.version)).toEqual([2, 1]);
      const latest = at(view.versions, 0), first = at(view.versions, 1);
      expect(latest.values).toMatchObject({ forkPreloadMm: 6, tyreRearColdBar: 1.7, engineMap: null, forkSpringNmm: 10 });
      expect(latest.changed).toEqual(["forkPreloadMm", "tyreRearColdBar", "engineMap"]);
      expect(latest.previous).toEqual({ forkPreloadMm: 5, tyreRearColdBar: 1.6, engineMap: "B" });
      expect(latest.authorName).toBe("owner");
      expect(first.changed).toEqual([]);
      expect(first.authorName).toBe("engineer");
      expect(first.values.forkPreloadMm).toBe(5);
    }
  });

  it("refuses a save on top of an older version (409) and one that changes nothing", async () => {
    const id = await freshSession("Race");
    as(a, "engineer");
    expect(await saveSetupSheetAction({}, form({ sessionId: id, baseVersion: 0, ...SHEET }))).toMatchObject({ ok: true });
    as(a, "owner");
    expect(await saveSetupSheetAction({}, form({ sessionId: id, baseVersion: 1, ...SHEET, forkPreloadMm: "7" }))).toMatchObject({ ok: true });
    // The engineer's form still says version 1: their change must not silently replace the owner's.
    as(a, "engineer");
    const stale = await saveSetupSheetAction({}, form({ sessionId: id, baseVersion: 1, ...SHEET, shockPreloadMm: "9" }));
    expect(stale).toMatchObject({ ok: false, status: 409 });
    expect(stale.message).toMatch(/^Version 2 was saved while you were editing/);
    expect(stale.values?.shockPreloadMm).toBe("9");
    const same = await saveSetupSheetAction({}, form({ sessionId: id, baseVersion: 2, ...SHEET, forkPreloadMm: "7" }));
    expect(same).toMatchObject({ ok: false, status: 422, message: "Nothing changed since version 2, so no new version was saved." });
    expect(await SetupSheet.count({ where: { sessionId: id } })).toBe(2);
    const blank = await freshSession("Blank");
    expect(await saveSetupSheetAction({}, form({ sessionId: blank, baseVersion: 0 }))).toMatchObject({ ok: false, status: 422, message: "Fill in at least one field before saving." });
  });

  it("numbers concurrent saves from the same base without a duplicate version", async () => {
    const id = await freshSession("Concurrent");
    as(a, "engineer");
    const results = await Promise.all([1, 2, 3].map((n) => saveSetupSheetAction({}, form({ sessionId: id, baseVersion: 0, ...SHEET, forkPreloadMm: String(n) }))));
    expect(results.filter((r) => r.ok)).toHaveLength(1);
    expect(results.filter((r) => r.status === 409)).toHaveLength(2);
    expect((await SetupSheet.findAll({ where: { sessionId: id } })).map((r) => r.version)).toEqual([1]);
  });

  it.each(["rider", "viewer"] as const)("%s cannot save a setup sheet (403), even on their own session", async (role) => {
    as(a, role);
    const s = await saveSetupSheetAction({}, form({ sessionId: own, baseVersion: 0, ...SHEET }));
    expect(s).toMatchObject({ ok: false, status: 403 });
    expect(await SetupSheet.count({ where: { sessionId: own } })).toBe(0);
  });

  it.each(ROLES)("%s of another team: the session is a 404 to editors, a 403 before that to others", async (role) => {
    as(b, role);
    const s = await saveSetupSheetAction({}, form({ sessionId: own, baseVersion: 0, ...SHEET }));
    expect(s.status).toBe(EDITORS.includes(role) ? 404 : 403);
    expect(await SetupSheet.count({ where: { sessionId: own } })).toBe(0);
    await expect(getSetupSheetView(await ctxOf(b, role), own)).rejects.toMatchObject({ status: 404 });
  });

  it("reading follows session visibility: a rider sees their own and shared sessions' sheets, not others", async () => {
    const rider = await ctxOf(a, "rider");
    expect((await getSetupSheetView(rider, own)).canEdit).toBe(false);
    expect((await getSetupSheetView(rider, shared)).sessionId).toBe(shared);
    await expect(getSetupSheetView(rider, hidden)).rejects.toMatchObject({ status: 404 });
  });

  it("refuses bad fields one message each, with the unit, and saves nothing", async () => {
    const id = await freshSession("Validation");
    as(a, "engineer");
    const s = await saveSetupSheetAction({}, form({
      sessionId: id, baseVersion: 0, ...SHEET,
      forkSpringNmm: "95", forkCompressionClicks: "12.5", forkOilLevelMm: "deep", shockSpringNmm: "9.5", tyreFrontColdBar: "32", sprocketRearTeeth: "80",
      tractionControlLevel: "-1", tyreRearCompound: "x".repeat(41), notes: "n".repeat(2001),
    }));
    expect(s).toMatchObject({ ok: false, status: 422 });
    expect(s.errors).toEqual({
      forkSpringNmm: "Fork spring rate must be between 2 N/mm and 30 N/mm",
      forkCompressionClicks: "Fork compression must be a whole number",
      forkOilLevelMm: "Fork oil level must be a number in mm",
      shockSpringNmm: "Shock spring rate must be between 30 N/mm and 300 N/mm",
      tyreFrontColdBar: "Front cold pressure must be between 1 bar and 3.5 bar",
      sprocketRearTeeth: "Rear sprocket must be between 25 teeth and 60 teeth",
      tractionControlLevel: "Traction control level must be between 0 and 20",
      tyreRearCompound: "Rear compound must be at most 40 characters",
      notes: "Setup notes must be at most 2000 characters",
    });
    expect(s.values?.forkSpringNmm).toBe("95");
    expect(await SetupSheet.count({ where: { sessionId: id } })).toBe(0);
  });
});

describe("session notes", () => {
  async function add(team: TestTeam, role: TeamRole, sessionId: number, text: string, lapNumber = "") {
    as(team, role);
    return createNoteAction({}, form({ sessionId, text, lapNumber }));
  }

  it.each(ROLES)("%s adding a note on a session they see", async (role) => {
    const s = await add(a, role, own, `From the ${role}`);
    if (role === "viewer") {
      expect(s).toMatchObject({ ok: false, status: 403 });
      expect(await Note.count({ where: { sessionId: own, authorId: a.members.viewer.userId } })).toBe(0);
    } else {
      expect(s).toMatchObject({ ok: true, message: "Note added." });
      const row = await Note.findByPk(s.id!);
      expect(row).toMatchObject({ teamId: a.teamId, sessionId: own, authorId: a.members[role].userId, text: `From the ${role}`, lapNumber: null });
    }
  });

  it("a rider writes on the session they rode, not on one merely shared with them, and never sees a hidden one", async () => {
    const onShared = await add(a, "rider", shared, "Can I?");
    expect(onShared).toMatchObject({ ok: false, status: 403, message: "You can add notes to sessions you rode; this one is shared with you to read." });
    expect(await add(a, "rider", hidden, "And here?")).toMatchObject({ ok: false, status: 404 });
    expect(await Note.count({ where: { sessionId: [shared, hidden] } })).toBe(0);
    // The engineer can write on both.
    expect(await add(a, "engineer", shared, "Shared with the riders for the debrief")).toMatchObject({ ok: true });
    const riderView = await getSessionNotes(await ctxOf(a, "rider"), shared);
    expect(riderView.canCreate).toBe(false);
    expect(riderView.notes.map((n) => n.text)).toEqual(["Shared with the riders for the debrief"]);
    expect((await getSessionNotes(await ctxOf(a, "rider"), own)).canCreate).toBe(true);
    expect((await getSessionNotes(await ctxOf(a, "viewer"), own)).canCreate).toBe(false);
    await expect(getSessionNotes(await ctxOf(a, "rider"), hidden)).rejects.toMatchObject({ status: 404 });
  });

  it.each(ROLES)("%s of another team gets 404 (or 403 first as a viewer)", async (role) => {
    const s = await add(b, role, own, "From outside");
    expect(s.status).toBe(role === "viewer" ? 403 : 404);
    expect(await Note.count({ where: { sessionId: own, text: "From outside" } })).toBe(0);
  });

  it("checks the text and the lap", async () => {
    expect((await add(a, "engineer", own, "   ")).errors).toEqual({ text: "Write the note first" });
    expect((await add(a, "engineer", own, "y".repeat(2001))).errors).toEqual({ text: "Keep the note to 2000 characters" });
    expect(await add(a, "engineer", own, "y".repeat(2000))).toMatchObject({ ok: true });
    const badLap = await add(a, "engineer", own, "Lap 9 felt loose", "9");
    expect(badLap).toMatchObject({ ok: false, status: 422, errors: { lapNumber: "Lap 9 is not a lap of this session" } });
    expect(badLap.values?.text).toBe("Lap 9 felt loose");
    expect((await add(a, "engineer", own, "Lap 2 front pushed", "two")).errors).toEqual({ lapNumber: "Choose a lap from the list" });
    const ok = await add(a, "rider", own, "Front pushed into turn 3", "2");
    expect(ok).toMatchObject({ ok: true });
    expect((await Note.findByPk(ok.id!))?.lapNumber).toBe(2);
  });

  it("lists notes newest first with author, time and lap", async () => {
    const id = await freshSession("Listing");
    await add(a, "engineer", id, "first");
    await add(a, "owner", id, "second");
    await add(a, "engineer", id, "third");
    const view = await getSessionNotes(await ctxOf(a, "engineer"), id);
    expect(view.notes.map((n) => [n.text, n.authorName])).toEqual([
      ["third", "engineer"],
      ["second", "owner"],
      ["first", "engineer"],
    ]);
    expect(view.notes.every((n) => !Number.isNaN(Date.parse(n.createdAt)))).toBe(true);
    // The engineer may delete their own notes only.
    expect(view.notes.map((n) => n.canDelete)).toEqual([true, false, true]);
    expect((await getSessionNotes(await ctxOf(a, "owner"), id)).notes.every((n) => n.canDelete)).toBe(true);
    expect((await getSessionNotes(await ctxOf(a, "owner"), own)).laps).toEqual([1, 2, 3]);
  });

  it("deletes: the author their own, the owner any; others 403; another team 404", async () => {
    const id = await freshSession("Deleting");
    const byEngineer = (await add(a, "engineer", id, "engineer's")).id!;
    const byOwner = (await add(a, "owner", id, "owner's")).id!;
    const byRider = (await add(a, "rider", own, "rider's")).id!;
    const del = (team: TestTeam, role: TeamRole, noteId: number) => {
      as(team, role);
      return deleteNoteAction({}, form({ noteId }));
    };
    expect(await del(a, "engineer", byOwner)).toMatchObject({ ok: false, status: 403 });
    expect(await del(a, "viewer", byEngineer)).toMatchObject({ ok: false, status: 403 });
    expect(await del(a, "rider", byEngineer)).toMatchObject({ ok: false, status: 404 }); // not their session: not confirmed to exist
    expect(await del(b, "owner", byEngineer)).toMatchObject({ ok: false, status: 404 });
    expect(await Note.count({ where: { id: [byEngineer, byOwner, byRider] } })).toBe(3);

    expect(await del(a, "engineer", byEngineer)).toMatchObject({ ok: true });
    expect(await del(a, "rider", byRider)).toMatchObject({ ok: true });
    const another = (await add(a, "engineer", id, "another engineer note")).id!;
    expect(await del(a, "owner", another)).toMatchObject({ ok: true });
    expect(await del(a, "owner", byOwner)).toMatchObject({ ok: true });
    expect(await Note.count({ where: { id: [byEngineer, byOwner, byRider, another] } })).toBe(0);
    expect(await del(a, "owner", byOwner)).toMatchObject({ ok: false, status: 404 });
  });
});
