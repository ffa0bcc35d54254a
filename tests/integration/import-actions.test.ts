/**
 * What the import screen and the session page's actions do, through the lib functions they call
 * (lib/data/session-edit.ts, session-overview.ts, session-list.ts) against the real MariaDB and
 * the real upload path: details saved with team checks, the mapping confirmed into an Import
 * profile and parsed, channels shown in display units, refusals by role and by team, re-import.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import { initModels, RideSession, ImportProfile, RaceEvent, Bike, Engine, Rider } from "@/models";
import { runIngestJob } from "@/workers/ingest/run-ingest-job";
import { confirmSessionImport, getImportScreen, reimportSession, sessionFormOptions, updateSessionDetails } from "@/lib/data/session-edit";
import { getSessionOverview } from "@/lib/data/session-overview";
import { listSessions } from "@/lib/data/session-list";
import { importFormSchema, sessionDetailsSchema, type ImportFormInput } from "@/lib/forms/session-form";
import { fieldErrors } from "@/lib/forms/form-state";
import type { TeamContext } from "@/lib/auth/guard";
import type { TeamRole } from "@/lib/auth/permissions";
import { HttpError } from "@/lib/http/http-error";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";
import { at } from "../fixtures/at";

let team: TestTeam;
let other: TestTeam;
let up: UploadHarness;
const sequelize = () => getSequelize();
const refs: { eventId: number; bikeId: number; bike2Id: number; engineId: number; riderId: number; otherEventId: number } = {} as never;

function ctxOf(t: TestTeam, role: TeamRole): TeamContext {
  const m = t.members[role];
  return { teamId: t.teamId, teamName: "t", teamSlug: "t", role, userId: m.userId, userName: role, email: m.email, memberships: [] };
}

/** 50 Hz: front wheel speed in km/h, front brake in bar, fork in mm — each a different display conversion. */
function exportCsv(rows: number, header = "Time [s],Front wheel speed [km/h],Front brake [bar],Fork [mm]", badRow?: number): string {
  const lines = ["# logger: bench unit 9", "# started at: 2031-05-17T10:02:00Z", header];
  for (let i = 0; i < rows; i++) {
    const t = i / 50;
    const v = i === badRow ? "abc" : (120 + 60 * Math.sin(t / 3)).toFixed(2);
    lines.push(`${t.toFixed(2)},${v},${(i % 200 < 20 ? 9.5 : 0).toFixed(1)},${(40 + 30 * Math.sin(t)).toFixed(1)}`);
  }
  return lines.join("\n") + "\n";
}

async function uploadCsv(name: string, text: string): Promise<number> {
  const { sessionId } = await up.upload(new File([text], name, { type: "text/csv" }), team.members.engineer.cookie);
  return sessionId;
}

/** Run this session's parse directly (not via the shared queue, which other test files use too). */
async function parse(sessionId: number): Promise<"ready" | "failed"> {
  const r = await runIngestJob(sequelize(), sessionId);
  await sequelize().query("UPDATE jobs SET state = 'done' WHERE session_id = ? AND state = 'queued'", { replacements: [sessionId], type: QueryTypes.UPDATE });
  return r;
}

function formFromScreen(s: Awaited<ReturnType<typeof getImportScreen>>, extra: Partial<ImportFormInput> = {}): ImportFormInput {
  return {
    title: "FP1 Bike 27",
    kind: "practice",
    eventId: String(refs.eventId),
    bikeId: String(refs.bikeId),
    engineId: String(refs.engineId),
    riderId: String(refs.riderId),
    startedAt: "2031-05-17T10:02",
    conditions: "dry, 24 °C track",
    sharedWithRiders: false,
    profileName: "Bench unit 9",
    timeFormat: s.timeFormat,
    columns: s.columns.map((c) => ({ index: c.index, role: c.role, unit: c.unit, scale: c.scale, offset: c.offset })),
    ...extra,
  };
}

async function expectHttp(p: Promise<unknown>, status: number): Promise<HttpError> {
  const e = await p.then(
    () => null,
    (err: unknown) => err,
  );
  expect(e).toBeInstanceOf(HttpError);
  expect((e as HttpError).status).toBe(status);
  return e as HttpError;
}

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Import actions team");
  other = await createTeamWithRoles("Another team");
  up = await startUploadHarness();
  const ev = await RaceEvent.create({ teamId: team.teamId, trackId: null, name: "Spring test", startsOn: "2031-05-17", endsOn: "2031-05-18" });
  const bikes = await Bike.bulkCreate([
    { teamId: team.teamId, name: "Bike 27", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: null, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null },
    { teamId: team.teamId, name: "Bike 64", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: null, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null },
  ]);
  const b1 = at(bikes, 0), b2 = at(bikes, 1);
  const eng = await Engine.create({ teamId: team.teamId, bikeId: b1.id, serial: "IA-E1", rebuildIntervalH: 30, rebuildIntervalKm: null, notes: null });
  const rider = await Rider.create({ teamId: team.teamId, name: "Test Rider", raceNumber: "27", userId: team.members.rider.userId });
  const otherEv = await RaceEvent.create({ teamId: other.teamId, trackId: null, name: "Not yours", startsOn: null, endsOn: null });
  Object.assign(refs, { eventId: ev.id, bikeId: b1.id, bike2Id: b2.id, engineId: eng.id, riderId: rider.id, otherEventId: otherEv.id });
});
afterAll(async () => {
  await up?.close();
});

describe("import screen → confirm → parse → session page", () => {
  let sessionId: number;

  it("the import screen shows the header, first values and the suggestion for a new CSV layout", async () => {
    sessionId = await uploadCsv("fp1.csv", exportCsv(1500));
    const s = await getImportScreen(ctxOf(team, "engineer"), sessionId);
    expect(s.status).toBe("mapping");
    expect(s.format).toBe("csv");
    expect(s.fileName).toBe("fp1.csv");
    expect(s.delimiter).toBe("comma");
    expect(s.metadata).toMatchObject({ logger: "bench unit 9" });
    expect(s.profileName).toBe("bench unit 9");
    expect(s.details.startedAt).toBe("2031-05-17T10:02:00.000Z");
    expect(s.columns.map((c) => [c.name, c.fileUnit, c.role, c.unit])).toEqual([
      ["Time", "s", "time", "s"],
      ["Front wheel speed", "km/h", "speed_front", "km/h"],
      ["Front brake", "bar", "brake_front", "bar"],
      ["Fork", "mm", "fork_travel", "mm"],
    ]);
    expect(at(s.columns, 1).samples[0]).toBe("120.00");
    expect(at(s.columns, 1).confidence).toBeGreaterThan(0.8);
    expect(at(s.columns, 1).reason).toMatch(/name says wheel speed, front/);
  });

  it("riders and viewers cannot open it; another team's engineer gets 404", async () => {
    await expectHttp(getImportScreen(ctxOf(team, "rider"), sessionId), 403);
    await expectHttp(getImportScreen(ctxOf(team, "viewer"), sessionId), 403);
    await expectHttp(getImportScreen(ctxOf(other, "engineer"), sessionId), 404);
  });

  it("a mapping with a role twice or a missing unit is refused field by field by the form schema", () => {
    const bad = importFormSchema.safeParse({
      title: "",
      kind: "practice",
      eventId: "",
      bikeId: "",
      engineId: "",
      riderId: "",
      startedAt: "17/05/2031",
      conditions: "",
      sharedWithRiders: false,
      profileName: "p",
      timeFormat: "seconds",
      columns: [
        { index: 0, role: "time", unit: "s", scale: 1, offset: 0 },
        { index: 1, role: "speed_front", unit: "km/h", scale: Number.NaN, offset: 0 },
        { index: 2, role: "speed_front", unit: "bar", scale: 1, offset: 0 },
        { index: 3, role: "fork_travel", unit: "", scale: 1, offset: 0 },
      ],
    });
    expect(bad.success).toBe(false);
    const errors = fieldErrors(bad.error!.issues);
    expect(errors.title).toMatch(/title/);
    expect(errors.startedAt).toMatch(/date and time/);
    expect(errors["columns.1.scale"]).toMatch(/number/);
    expect(errors["columns.2.role"]).toMatch(/Already used by column 2/);
    expect(errors["columns.2.unit"]).toMatch(/Not a unit of speed/);
    expect(errors["columns.3.unit"]).toMatch(/Choose the unit/);
  });

  it("an engine fitted to another bike, or another team's event, comes back on that field and nothing is queued", async () => {
    const screen = await getImportScreen(ctxOf(team, "engineer"), sessionId);
    const v = importFormSchema.parse(formFromScreen(screen, { bikeId: String(refs.bike2Id), eventId: String(refs.otherEventId) }));
    const e = await expectHttp(confirmSessionImport(sequelize(), ctxOf(team, "engineer"), sessionId, v), 422);
    expect(e.details).toMatchObject({ eventId: expect.stringMatching(/not one of your team's/), engineId: expect.stringMatching(/IA-E1 is fitted to another bike/) });
    const s = await RideSession.findByPk(sessionId);
    expect(s?.status).toBe("mapping");
    expect(s?.eventId).toBeNull();
  });

  it("confirming saves the details and the Import profile, queues the parse, and the channels read back in display units", async () => {
    const screen = await getImportScreen(ctxOf(team, "engineer"), sessionId);
    const v = importFormSchema.parse(formFromScreen(screen));
    await confirmSessionImport(sequelize(), ctxOf(team, "engineer"), sessionId, v);
    const s = await RideSession.findByPk(sessionId);
    expect(s?.status).toBe("queued");
    expect(s?.title).toBe("FP1 Bike 27");
    expect(s?.eventId).toBe(refs.eventId);
    expect(s?.engineId).toBe(refs.engineId);
    expect(s?.conditions).toBe("dry, 24 °C track");
    expect(s?.startedAt?.toISOString()).toBe("2031-05-17T10:02:00.000Z");
    const profile = await ImportProfile.findOne({ where: { teamId: team.teamId } });
    expect(profile?.name).toBe("Bench unit 9");

    // A second confirm while it is queued is refused: the mapping cannot change under the worker.
    await expectHttp(confirmSessionImport(sequelize(), ctxOf(team, "engineer"), sessionId, v), 409);

    expect(await parse(sessionId)).toBe("ready");
    const o = await getSessionOverview(ctxOf(team, "viewer"), sessionId);
    expect(o.eventName).toBe("Spring test");
    expect(o.bikeName).toBe("Bike 27");
    expect(o.engineSerial).toBe("IA-E1");
    expect(o.riderName).toBe("Test Rider");
    expect(o.session.durationS).toBeCloseTo(1499 / 50, 6);
    const byName = Object.fromEntries(o.channels.map((c) => [c.name, c]));
    expect(byName["Front wheel speed"]).toMatchObject({ roleLabel: "Front wheel speed", unit: "km/h", samples: 1500, min: "60.0", max: "180.0" });
    expect(at(byName, "Front wheel speed").rateHz).toBeCloseTo(50, 6);
    expect(byName["Front brake"]).toMatchObject({ unit: "bar", min: "0.00", max: "9.50" });
    expect(byName["Fork"]).toMatchObject({ roleLabel: "Fork travel", unit: "mm", min: "10.0", max: "70.0" });
  });

  it("the next upload with the same columns skips the mapping: the Import profile is reused", async () => {
    const id = await uploadCsv("fp2.csv", exportCsv(300));
    const s = await RideSession.findByPk(id);
    expect(s?.status).toBe("queued");
    expect(await parse(id)).toBe("ready");
  });
});

describe("session details on the session page", () => {
  let sessionId: number;
  const details = (over: Record<string, unknown> = {}) =>
    sessionDetailsSchema.parse({ title: "Race 1", kind: "race", eventId: String(refs.eventId), bikeId: "", engineId: "", riderId: String(refs.riderId), startedAt: "", conditions: "", sharedWithRiders: true, ...over });

  beforeAll(async () => {
    sessionId = await uploadCsv("race1.csv", exportCsv(200, "Time [s],Front wheel speed [km/h],Front brake [bar],Fork [mm]"));
  });

  it("an engineer and the owner update them", async () => {
    await updateSessionDetails(sequelize(), ctxOf(team, "engineer"), sessionId, details());
    let s = await RideSession.findByPk(sessionId);
    expect(s).toMatchObject({ title: "Race 1", kind: "race", riderId: refs.riderId, sharedWithRiders: true, conditions: null, startedAt: null });
    await updateSessionDetails(sequelize(), ctxOf(team, "owner"), sessionId, details({ title: "Race 1 (wet)", conditions: "wet" }));
    s = await RideSession.findByPk(sessionId);
    expect(s).toMatchObject({ title: "Race 1 (wet)", conditions: "wet" });
  });

  it("riders and viewers are refused and nothing changes", async () => {
    await expectHttp(updateSessionDetails(sequelize(), ctxOf(team, "rider"), sessionId, details({ title: "Mine now" })), 403);
    await expectHttp(updateSessionDetails(sequelize(), ctxOf(team, "viewer"), sessionId, details({ title: "Mine now" })), 403);
    expect((await RideSession.findByPk(sessionId))?.title).toBe("Race 1 (wet)");
  });

  it("another team's owner gets 404 for this session, and cannot attach its own event either", async () => {
    await expectHttp(updateSessionDetails(sequelize(), ctxOf(other, "owner"), sessionId, details({ eventId: "" })), 404);
    await expectHttp(getSessionOverview(ctxOf(other, "owner"), sessionId), 404);
    const e = await expectHttp(updateSessionDetails(sequelize(), ctxOf(team, "owner"), sessionId, details({ eventId: String(refs.otherEventId) })), 422);
    expect(e.details).toMatchObject({ eventId: expect.any(String) });
    expect((await RideSession.findByPk(sessionId))?.eventId).toBe(refs.eventId);
  });

  it("a non-existent id is 404, not an error", async () => {
    await expectHttp(updateSessionDetails(sequelize(), ctxOf(team, "owner"), 2_000_000_000, details()), 404);
  });

  it("the form's options list only the team's rows", async () => {
    const o = await sessionFormOptions(team.teamId);
    expect(o.events.map((e) => e.id)).toEqual([refs.eventId]);
    expect(o.bikes.map((b) => b.label).sort()).toEqual(["Bike 27", "Bike 64"]);
    expect(o.engines).toEqual([{ id: refs.engineId, label: "IA-E1", bikeId: refs.bikeId }]);
    expect(o.riders).toEqual([{ id: refs.riderId, label: "Test Rider #27" }]);
  });
});

describe("failure and re-import", () => {
  it("a bad cell fails the session with line and column; re-import goes back to the mapping with the stored file", async () => {
    const header = "Time [s],Front wheel speed [km/h],Front brake [bar],Fork [mm]";
    // Same header as the profile saved above: queued at once, and the bad cell fails it.
    // Data row 123 (0-based) sits on file line 127: two metadata lines and the header come first.
    const id = await uploadCsv("bad.csv", exportCsv(400, header, 123));
    expect((await RideSession.findByPk(id))?.status).toBe("queued");
    expect(await parse(id)).toBe("failed");
    const failed = await getSessionOverview(ctxOf(team, "engineer"), id);
    expect(failed.session.status).toBe("failed");
    expect(failed.session.statusReason).toMatch(/line 127/i);
    expect(failed.session.statusReason).toMatch(/Front wheel speed/);
    expect(failed.channels).toEqual([]);

    await expectHttp(reimportSession(sequelize(), ctxOf(team, "rider"), id), 403);
    await expectHttp(reimportSession(sequelize(), ctxOf(other, "engineer"), id), 404);
    expect(await reimportSession(sequelize(), ctxOf(team, "engineer"), id)).toEqual({ status: "mapping" });
    const screen = await getImportScreen(ctxOf(team, "engineer"), id);
    expect(screen.status).toBe("mapping");
    // The mapping it failed with is offered again, to be changed.
    expect(screen.columns.map((c) => c.role)).toEqual(["time", "speed_front", "brake_front", "fork_travel"]);
    // Ignore the bad column this time: it parses.
    const v = importFormSchema.parse(formFromScreen(screen, { columns: screen.columns.map((c) => ({ index: c.index, role: c.index === 1 ? "ignore" : c.role, unit: c.unit, scale: 1, offset: 0 })) }));
    await confirmSessionImport(sequelize(), ctxOf(team, "engineer"), id, v);
    expect(await parse(id)).toBe("ready");
    const o = await getSessionOverview(ctxOf(team, "engineer"), id);
    expect(o.channels.map((c) => c.name)).not.toContain("Front wheel speed");
  });
});

describe("the sessions list", () => {
  it("filters by event and rider; a rider sees only own and shared sessions", async () => {
    const all = await listSessions(ctxOf(team, "viewer"));
    expect(all.sessions.length).toBeGreaterThanOrEqual(4);
    const byEvent = await listSessions(ctxOf(team, "viewer"), { eventId: refs.eventId });
    expect(byEvent.sessions.length).toBeGreaterThanOrEqual(2);
    expect(byEvent.sessions.every((s) => s.eventName === "Spring test")).toBe(true);
    const byRider = await listSessions(ctxOf(team, "viewer"), { riderId: refs.riderId });
    expect(byRider.sessions.every((s) => s.riderName === "Test Rider")).toBe(true);

    // The rider is linked to "Test Rider": sessions with that rider, or shared, and nothing else.
    const rider = await listSessions(ctxOf(team, "rider"));
    const visible = await RideSession.findAll({ where: { teamId: team.teamId } });
    const expected = visible.filter((s) => s.riderId === refs.riderId || s.sharedWithRiders).map((s) => s.id).sort();
    expect(rider.sessions.map((s) => s.id).sort()).toEqual(expected);
    const hidden = visible.find((s) => s.riderId !== refs.riderId && !s.sharedWithRiders);
    expect(hidden).toBeDefined();
    await expectHttp(getSessionOverview(ctxOf(team, "rider"), hidden!.id), 404);
    // A filter cannot widen what a rider sees.
    const riderFiltered = await listSessions(ctxOf(team, "rider"), { eventId: refs.eventId });
    expect(riderFiltered.sessions.every((s) => expected.includes(s.id))).toBe(true);
  });

  it("another team's list holds none of these sessions", async () => {
    const theirs = await listSessions(ctxOf(other, "owner"));
    expect(theirs.sessions).toEqual([]);
    expect(theirs.events.map((e) => e.name)).toEqual(["Not yours"]);
  });
});
