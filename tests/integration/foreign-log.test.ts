/**
 * A log from a logger Lapbench has not seen, start to finish through the lib functions the screens
 * call, against the real MariaDB and the real upload path: suggested mapping, one role fixed by
 * hand, a ready session whose event's track lies far from its GPS (refused, with the distance),
 * Import profiles listed, edited and deleted, "Map again" keeping notes and acknowledgements, a
 * track made from the session with the suggested start/finish gate (laps at once, checked against
 * the generator's ground truth), another track refused by distance, and the same bytes uploaded
 * again held back for a choice.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import { initModels, ImportProfile, Lap, RaceEvent, RideSession, Finding } from "@/models";
import { runIngestJob } from "@/workers/ingest/run-ingest-job";
import { confirmSessionImport, getImportScreen, reimportSession } from "@/lib/data/session-edit";
import { importFormSchema, type ImportFormInput } from "@/lib/forms/session-form";
import { listImportProfiles, updateImportProfile, deleteImportProfile } from "@/lib/data/import-profiles";
import { getSessionTrackPanel, changeSessionTrack, createTrackWithSuggestedGate, getHeldDuplicate } from "@/lib/data/session-track";
import { resolveDuplicate } from "@/lib/data/imports";
import { defaultCompareLaps } from "@/lib/data/compare-default";
import { createSessionNote, getSessionNotes } from "@/lib/data/session-notes";
import { acknowledgeFinding, listSessionFindings } from "@/lib/data/findings";
import type { TeamContext } from "@/lib/auth/guard";
import type { TeamRole } from "@/lib/auth/permissions";
import { HttpError } from "@/lib/http/http-error";
import { haversineM } from "@/lib/geo/haversine-m";
import { CIRCUIT } from "@/sample-logs/circuit";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";
import { createSampleTrackAndBike } from "./helpers/demo-track";
import { foreignLoggerCsv, FOREIGN_ORIGIN, type ForeignLog } from "../fixtures/foreign-logger";
import { at } from "../fixtures/at";

let team: TestTeam;
let other: TestTeam;
let up: UploadHarness;
let log: ForeignLog;
let demoTrackId: number;
let eventId: number;
let sessionId: number;
const sequelize = () => getSequelize();

function ctxOf(t: TestTeam, role: TeamRole): TeamContext {
  const m = t.members[role];
  return { teamId: t.teamId, teamName: "t", teamSlug: "t", role, userId: m.userId, userName: role, email: m.email, memberships: [] };
}

async function parse(id: number): Promise<"ready" | "failed"> {
  const r = await runIngestJob(sequelize(), id);
  await sequelize().query("UPDATE jobs SET state = 'done' WHERE session_id = ? AND state = 'queued'", { replacements: [id], type: QueryTypes.UPDATE });
  return r;
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

function form(screen: Awaited<ReturnType<typeof getImportScreen>>, roles: Record<string, string> = {}, extra: Partial<ImportFormInput> = {}): ImportFormInput {
  return {
    title: "Test day, bike from another logger",
    kind: "test",
    eventId: String(eventId),
    bikeId: "",
    engineId: "",
    riderId: "",
    startedAt: "",
    conditions: "",
    sharedWithRiders: false,
    profileName: screen.profileName,
    timeFormat: screen.timeFormat,
    columns: screen.columns.map((c) => ({ index: c.index, role: roles[c.name] ?? c.role, unit: c.unit, scale: c.scale, offset: c.offset })),
    ...extra,
  };
}

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Foreign log team");
  other = await createTeamWithRoles("Foreign log other team");
  up = await startUploadHarness();
  const { track } = await createSampleTrackAndBike(team.teamId);
  demoTrackId = track.id;
  const ev = await RaceEvent.create({ teamId: team.teamId, trackId: demoTrackId, name: "Round at the demo circuit", startsOn: "2031-05-17", endsOn: "2031-05-18" });
  eventId = ev.id;
  log = foreignLoggerCsv({ seed: 23, flyingLaps: 3 });
});
afterAll(async () => {
  await up?.close();
});

describe("a first upload from an unfamiliar logger", () => {
  it("suggests every column's role from names, units and values but the pot named only by its input", async () => {
    ({ sessionId } = await up.upload(new File([log.text], "fieldbox-day1.csv", { type: "text/csv" }), team.members.engineer.cookie));
    const screen = await getImportScreen(ctxOf(team, "engineer"), sessionId);
    expect(screen.status).toBe("mapping");
    expect(screen.delimiter).toBe("semicolon");
    expect(screen.decimalComma).toBe(true);
    expect(screen.timeFormat).toBe("milliseconds");
    expect(screen.existingProfile).toBeNull();
    const got = screen.columns.map((c) => c.role);
    const expected = log.columns.map((c) => (c.header.startsWith("Pot 3") ? "other" : c.role));
    expect(got).toEqual(expected);
    expect(screen.columns.every((c) => (c.reason ?? "").length > 0)).toBe(true);
  });

  it("the fixed mapping reads the file; the event's track is 1 000+ km away, so the session is not put on it", async () => {
    const screen = await getImportScreen(ctxOf(team, "engineer"), sessionId);
    const v = importFormSchema.parse(form(screen, { "Pot 3": "shock_travel" }));
    await confirmSessionImport(sequelize(), ctxOf(team, "engineer"), sessionId, v);
    expect(await parse(sessionId)).toBe("ready");
    const s = await RideSession.findByPk(sessionId);
    expect(s!.trackId).toBeNull();
    const panel = await getSessionTrackPanel(ctxOf(team, "engineer"), sessionId);
    expect(panel.refused).toMatchObject({ trackId: demoTrackId, via: "event" });
    // Demo circuit centre to the moved circuit (haversine, our own implementation checked against published values elsewhere).
    const expectedM = haversineM(CIRCUIT.origin.lat, CIRCUIT.origin.lon, FOREIGN_ORIGIN.lat, FOREIGN_ORIGIN.lon);
    expect(Math.abs(panel.refused!.distanceM - expectedM)).toBeLessThan(5_000);
    expect(panel.refused!.distanceM).toBeGreaterThan(1_000_000);
    expect(await Lap.count({ where: { sessionId } })).toBe(0);
  });

  it("the Import profile is listed with its columns, last use and the session it read; riders and other teams are kept out", async () => {
    const list = await listImportProfiles(ctxOf(team, "engineer"));
    expect(list).toHaveLength(1);
    const p = at(list, 0);
    expect(p.name).toBe("Fieldbox 12 (invented)");
    expect(p.columns.find((c) => c.name === "Pot 3")!.role).toBe("shock_travel");
    expect(p.sessionCount).toBe(1);
    expect(at(p.sessions, 0).id).toBe(sessionId);
    expect(p.lastUsedAt).not.toBeNull();
    await expectHttp(listImportProfiles(ctxOf(team, "rider")), 403);
    await expectHttp(updateImportProfile(ctxOf(other, "engineer"), p.id, { name: "x", timeFormat: "milliseconds", columns: [] }), 404);
  });

  it("a profile edit is checked like the mapping screen, then saved: renamed, the battery left out", async () => {
    const p = at(await listImportProfiles(ctxOf(team, "engineer")), 0);
    const cols = p.columns.map(({ index, role, unit, scale, offset }) => ({ index, role, unit, scale, offset }));
    const twice = cols.map((c) => (c.role === "brake_rear" ? { ...c, role: "brake_front" } : c));
    const e = await expectHttp(updateImportProfile(ctxOf(team, "engineer"), p.id, { name: "Fieldbox 12", timeFormat: "milliseconds", columns: twice }), 422);
    expect(JSON.stringify(e.details ?? e.message)).toMatch(/once/);
    const badUnit = cols.map((c) => (c.role === "throttle" ? { ...c, unit: "bar" } : c));
    await expectHttp(updateImportProfile(ctxOf(team, "engineer"), p.id, { name: "Fieldbox 12", timeFormat: "milliseconds", columns: badUnit }), 422);
    const batt = p.columns.find((c) => c.name === "Batt")!.index;
    await updateImportProfile(ctxOf(team, "engineer"), p.id, { name: "Fieldbox 12", timeFormat: "milliseconds", columns: cols.map((c) => (c.index === batt ? { ...c, role: "ignore" } : c)) });
    const after = at(await listImportProfiles(ctxOf(team, "engineer")), 0);
    expect(after.name).toBe("Fieldbox 12");
    expect(after.columns.find((c) => c.index === batt)!.role).toBe("ignore");
  });

  it("Map again starts from the edited profile, reads the file again and keeps notes and acknowledgements", async () => {
    await createSessionNote(ctxOf(team, "engineer"), sessionId, { text: "Rear pot re-zeroed before the run" });
    const { findings } = await listSessionFindings(ctxOf(team, "engineer"), sessionId);
    expect(findings.length).toBeGreaterThan(0);
    await acknowledgeFinding(ctxOf(team, "engineer"), at(findings, 0).id, "Seen; lever checked");

    expect(await reimportSession(sequelize(), ctxOf(team, "engineer"), sessionId)).toEqual({ status: "mapping" });
    const screen = await getImportScreen(ctxOf(team, "engineer"), sessionId);
    expect(screen.existingProfile?.name).toBe("Fieldbox 12");
    expect(screen.mappedBefore).toBe(true);
    expect(screen.columns.find((c) => c.name === "Batt")!.role).toBe("ignore");
    // For this session only: the profile stays as edited.
    const v = importFormSchema.parse(form(screen, { "Ang": "ignore" }, { updateProfile: false }));
    await confirmSessionImport(sequelize(), ctxOf(team, "engineer"), sessionId, v);
    expect(await parse(sessionId)).toBe("ready");
    const p = at(await listImportProfiles(ctxOf(team, "engineer")), 0);
    expect(p.columns.find((c) => c.name === "Ang")!.role).toBe("lean_angle");
    const channels = await sequelize().query<{ name: string }>("SELECT name FROM channels WHERE session_id = ?", { replacements: [sessionId], type: QueryTypes.SELECT });
    expect(channels.map((c) => c.name)).not.toContain("Ang");
    expect(channels.map((c) => c.name)).not.toContain("Batt");
    expect((await getSessionNotes(ctxOf(team, "engineer"), sessionId)).notes.map((n) => n.text)).toContain("Rear pot re-zeroed before the run");
    const acked = await Finding.findAll({ where: { sessionId } });
    expect(acked.some((f) => f.acknowledgedAt != null && f.note === "Seen; lever checked")).toBe(true);
  });

  it("a track far from the GPS cannot be chosen: 422 with the distance", async () => {
    const e = await expectHttp(changeSessionTrack(ctxOf(team, "engineer"), sessionId, demoTrackId), 422);
    expect(e.message).toMatch(/\d[\d,]* km from this log's positions/);
    await expectHttp(changeSessionTrack(ctxOf(team, "viewer"), sessionId, null), 403);
  });

  it("a track made from the session with the suggested gate gives its laps at once, matching the generator's lap times", async () => {
    const panel = await getSessionTrackPanel(ctxOf(team, "engineer"), sessionId);
    expect(panel.trackId).toBeNull();
    expect(panel.suggestion?.source).toBe("straight");
    expect(panel.suggestion!.straightM).toBeGreaterThan(800);
    const r = await createTrackWithSuggestedGate(ctxOf(team, "engineer"), sessionId, "Fieldbox test circuit");
    expect(r.laps).toBeGreaterThanOrEqual(4);
    const laps = await Lap.findAll({ where: { sessionId }, order: [["number", "ASC"]] });
    const flying = laps.filter((l) => !l.isOutLap && !l.isInLap);
    const truth = log.session.truth.laps.filter((l) => l.kind === "flying");
    expect(flying).toHaveLength(truth.length);
    // The gate lies ~70 m before the generator's line: lap times agree within 0.1 s (ground truth: the generator).
    flying.forEach((l, k) => expect(Math.abs(l.lapTimeMs - at(truth, k).lapTimeMs)).toBeLessThan(100));
    const after = await getSessionTrackPanel(ctxOf(team, "engineer"), sessionId);
    expect(after.trackId).toBe(r.trackId);
    expect(after.refused).toBeNull();
    await expectHttp(createTrackWithSuggestedGate(ctxOf(team, "engineer"), sessionId, "Again"), 409);
  });

  it("the same bytes uploaded again are held back: go to the existing session, or import again on purpose", async () => {
    const again = await up.upload(new File([log.text], "fieldbox-day1 (copy).csv", { type: "text/csv" }), team.members.engineer.cookie);
    const held = await RideSession.findByPk(again.sessionId);
    expect(held!.status).toBe("uploaded");
    expect(await getHeldDuplicate(ctxOf(team, "viewer"), again.sessionId)).toMatchObject({ sessionId });
    expect(await resolveDuplicate(sequelize(), team.teamId, again.sessionId, "existing")).toEqual({ sessionId, status: "existing" });
    expect(await RideSession.findByPk(again.sessionId)).toBeNull();
    await expectHttp(resolveDuplicate(sequelize(), other.teamId, sessionId, "import"), 404);

    const third = await up.upload(new File([log.text], "fieldbox-day1.csv", { type: "text/csv" }), team.members.engineer.cookie);
    const r = await resolveDuplicate(sequelize(), team.teamId, third.sessionId, "import");
    // The team's profile for this header reads it without asking.
    expect(r).toEqual({ sessionId: third.sessionId, status: "queued" });
    await parse(third.sessionId);
    // Another team uploading the same bytes is not told about this team's session.
    const theirs = await up.upload(new File([log.text], "x.csv", { type: "text/csv" }), other.members.engineer.cookie);
    expect((await RideSession.findByPk(theirs.sessionId))!.status).toBe("mapping");
  });

  it("deleting the profile: the next file with this header asks for a mapping again", async () => {
    const p = at(await listImportProfiles(ctxOf(team, "engineer")), 0);
    await expectHttp(deleteImportProfile(ctxOf(team, "viewer"), p.id), 403);
    await deleteImportProfile(ctxOf(team, "engineer"), p.id);
    expect(await ImportProfile.count({ where: { teamId: team.teamId } })).toBe(0);
    const changed = log.text.replace("# logger: Fieldbox 12 (invented)", "# logger: Fieldbox 12 (invented), unit 2");
    const next = await up.upload(new File([changed], "day2.csv", { type: "text/csv" }), team.members.engineer.cookie);
    expect((await RideSession.findByPk(next.sessionId))!.status).toBe("mapping");
  });

  it("Compare with no laps named opens on the latest ready session's two fastest flying laps", async () => {
    const d = await defaultCompareLaps(ctxOf(team, "engineer"));
    expect(d).not.toBeNull();
    const latest = await RideSession.findOne({ where: { teamId: team.teamId, status: "ready" }, order: [["startedAt", "DESC"], ["id", "DESC"]] });
    expect(d!.sessionId).toBe(latest!.id);
    const flying = (await Lap.findAll({ where: { sessionId: d!.sessionId, isOutLap: false, isInLap: false, isInvalid: false, pitPass: false } })).sort((a, b) => a.lapTimeMs - b.lapTimeMs);
    expect(flying.length).toBeGreaterThanOrEqual(2);
    expect(d!.laps).toEqual([at(flying, 0).number, at(flying, 1).number]);
    // A rider with no own or shared sessions gets nothing to open on.
    expect(await defaultCompareLaps(ctxOf(team, "rider"))).toBeNull();
  });
});
