/**
 * Tracks, bikes, engines and events through their server actions, against the real MariaDB:
 * engineers and owners change them, riders and viewers get 403, another team's rows answer 404,
 * bad input comes back field by field, and the Engine ledger adds up stored session summaries.
 * Only Next's request plumbing is replaced (headers, revalidation, redirect); auth is real.
 */
import { describe, it, expect, beforeAll, vi } from "vitest";
import { QueryTypes } from "sequelize";
import { initModels, Bike, Engine, RaceEvent, RideSession, Track } from "@/models";
import { getSequelize } from "@/models/db";
import { writeSessionSamples } from "@/lib/data/samples";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import type { TeamRole } from "@/lib/auth/permissions";
import { CIRCUIT } from "@/sample-logs/circuit";
import { gateAcrossPath } from "@/lib/geo/gate-across-path";
import { at } from "../fixtures/at";

const request = vi.hoisted(() => ({ cookie: "" }));
class Redirected extends Error {
  constructor(public readonly url: string) {
    super(`redirect to ${url}`);
  }
}
vi.mock("next/headers", () => ({ headers: async () => new Headers(request.cookie ? { cookie: request.cookie } : {}) }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
vi.mock("next/navigation", () => ({
  redirect: (url: string) => {
    throw new Redirected(url);
  },
  notFound: () => {
    throw new Error("not found");
  },
}));

const { createBikeAction, updateBikeAction, createEngineAction, updateEngineAction } = await import("@/lib/actions/bikes");
const { createTrackAction, saveTrackAction } = await import("@/lib/actions/tracks");
const { createEventAction, updateEventAction } = await import("@/lib/actions/events");
const { enginesOfBike } = await import("@/lib/data/engines");
const { getTrackEditor } = await import("@/lib/data/track-editor");
const { requireTeam } = await import("@/lib/auth/guard");

const ROLES: TeamRole[] = ["owner", "engineer", "rider", "viewer"];
const EDITORS: TeamRole[] = ["owner", "engineer"];

let a: TestTeam;
let b: TestTeam;
let aBike: number;
let aEngine: number;
let aTrack: number;
let aEvent: number;

function as(team: TestTeam, role: TeamRole) {
  request.cookie = team.members[role].cookie;
}

function form(values: Record<string, string | number>): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(values)) f.set(k, String(v));
  return f;
}

/** Run an action that redirects on success; returns the target or the refused state. */
async function redirectOf(p: Promise<unknown>): Promise<{ url?: string; state?: Record<string, unknown> }> {
  try {
    return { state: (await p) as Record<string, unknown> };
  } catch (e) {
    if (e instanceof Redirected) return { url: e.url };
    throw e;
  }
}

const BIKE_OK = {
  name: "Bike 9", className: "Supersport", wheelCircFrontMm: "1850", wheelCircRearMm: "1960", primaryRatio: "1.667", gearboxRatios: "2.6, 2.05, 1.71, 1.5, 1.36, 1.25",
  sprocketFront: "16", sprocketRear: "41", revCeilingRpm: "14200", forkStrokeMm: "120", shockStrokeMm: "65", tyreCrownRadiusMm: "95",
};

function session(teamId: string, extra: Partial<Parameters<typeof RideSession.create>[0]>) {
  return RideSession.create({
    teamId, eventId: null, bikeId: null, engineId: null, riderId: null, trackId: null, logFileId: null, importProfileId: null, title: "s", startedAt: null,
    conditions: null, statusReason: null, mapping: null, summary: null, durationS: null, createdBy: null, ...extra,
  });
}

beforeAll(async () => {
  initModels();
  [a, b] = await Promise.all([createTeamWithRoles("Setup A"), createTeamWithRoles("Setup B")]);
  const bike = await Bike.create({ teamId: a.teamId, name: "A bike", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: 14200, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null });
  aBike = bike.id;
  aEngine = (await Engine.create({ teamId: a.teamId, bikeId: aBike, serial: "A-E1", rebuildIntervalH: 10, rebuildIntervalKm: 5000, notes: null })).id;
  aTrack = (await Track.create({ teamId: a.teamId, name: "A track", centerLat: null, centerLon: null, lengthM: null, gates: null, corners: null, outline: null, pitSpeedLimitKmh: null, thresholds: null })).id;
  aEvent = (await RaceEvent.create({ teamId: a.teamId, trackId: null, name: "A meeting", startsOn: "2026-05-01", endsOn: "2026-05-02" })).id;
});

describe("bikes", () => {
  it.each(ROLES)("%s creating a bike", async (role) => {
    as(a, role);
    const before = await Bike.count({ where: { teamId: a.teamId } });
    const r = await redirectOf(createBikeAction({}, form({ name: `Bike of ${role}`, className: "" })));
    if (EDITORS.includes(role)) {
      expect(r.url).toMatch(/^\/bikes\/\d+$/);
      const id = Number(r.url!.split("/").pop());
      expect((await Bike.findByPk(id))?.teamId).toBe(a.teamId);
    } else {
      expect(r.state).toMatchObject({ ok: false, status: 403 });
      expect(await Bike.count({ where: { teamId: a.teamId } })).toBe(before);
    }
  });

  it.each(ROLES)("%s saving the bike settings", async (role) => {
    as(a, role);
    const s = await updateBikeAction({}, form({ bikeId: aBike, ...BIKE_OK, name: `A bike by ${role}` }));
    if (EDITORS.includes(role)) {
      expect(s).toMatchObject({ ok: true });
      const row = await Bike.findByPk(aBike);
      expect(row?.name).toBe(`A bike by ${role}`);
      expect(row?.wheelCircRearMm).toBe(1960);
      expect(row?.sprocketRear).toBe(41);
    } else {
      expect(s).toMatchObject({ ok: false, status: 403 });
      expect((await Bike.findByPk(aBike))?.name).not.toBe(`A bike by ${role}`);
    }
  });

  it.each(ROLES)("%s of another team gets 404 for the bike", async (role) => {
    as(b, role);
    const s = await updateBikeAction({}, form({ bikeId: aBike, ...BIKE_OK, name: "hijacked" }));
    // Roles that cannot edit at all are stopped at the role check, before the row is looked up.
    expect(s.status).toBe(EDITORS.includes(role) ? 404 : 403);
    expect((await Bike.findByPk(aBike))?.name).not.toBe("hijacked");
  });

  it("refuses bad settings field by field and keeps the bike as it was", async () => {
    as(a, "engineer");
    const before = (await Bike.findByPk(aBike))!.toJSON();
    const s = await updateBikeAction({}, form({ bikeId: aBike, ...BIKE_OK, name: " ", wheelCircRearMm: "196", gearboxRatios: "2.6, 2.9", sprocketFront: "15.5", revCeilingRpm: "fast", primaryRatio: "1,667" }));
    expect(s.ok).toBe(false);
    expect(s.status).toBe(422);
    expect(s.errors).toEqual({
      name: "Name the bike, e.g. its race number",
      wheelCircRearMm: "Rear rolling circumference must be between 1000 mm and 2600 mm",
      gearboxRatios: "Gear 2 (2.9) must be a lower ratio than gear 1 (2.6): list 1st gear first",
      sprocketFront: "Front sprocket must be a whole number",
      revCeilingRpm: "Rev ceiling must be a number in rpm",
    });
    // What was typed comes back so the form can show it again.
    expect(s.values?.wheelCircRearMm).toBe("196");
    expect((await Bike.findByPk(aBike))!.toJSON()).toEqual(before);
  });

  it("reads a decimal comma as a decimal point", async () => {
    as(a, "engineer");
    const s = await updateBikeAction({}, form({ bikeId: aBike, ...BIKE_OK, primaryRatio: "1,652" }));
    expect(s.ok).toBe(true);
    expect((await Bike.findByPk(aBike))?.primaryRatio).toBe(1.652);
  });
});

describe("engines", () => {
  it.each(ROLES)("%s adding an engine", async (role) => {
    as(a, role);
    const s = await createEngineAction({}, form({ serial: `E-${role}`, bikeId: aBike, rebuildIntervalH: "30", rebuildIntervalKm: "", hoursAtInstall: "", kmAtInstall: "", notes: "" }));
    const row = await Engine.findOne({ where: { teamId: a.teamId, serial: `E-${role}` } });
    if (EDITORS.includes(role)) {
      expect(s).toMatchObject({ ok: true });
      expect(row).toMatchObject({ bikeId: aBike, rebuildIntervalH: 30, rebuildIntervalKm: null, hoursAtInstall: 0 });
    } else {
      expect(s).toMatchObject({ ok: false, status: 403 });
      expect(row).toBeNull();
    }
  });

  it("another team's engineer cannot fit an engine to our bike, nor edit our engine", async () => {
    as(b, "engineer");
    const fit = await createEngineAction({}, form({ serial: "B-E", bikeId: aBike, rebuildIntervalH: "", rebuildIntervalKm: "", hoursAtInstall: "", kmAtInstall: "", notes: "" }));
    expect(fit.status).toBe(404);
    expect(await Engine.count({ where: { serial: "B-E" } })).toBe(0);
    const edit = await updateEngineAction({}, form({ engineId: aEngine, serial: "stolen", bikeId: "", rebuildIntervalH: "", rebuildIntervalKm: "", hoursAtInstall: "", kmAtInstall: "", notes: "" }));
    expect(edit.status).toBe(404);
    expect((await Engine.findByPk(aEngine))?.serial).toBe("A-E1");
  });

  it("refuses a missing serial and impossible intervals", async () => {
    as(a, "owner");
    const s = await updateEngineAction({}, form({ engineId: aEngine, serial: "", bikeId: aBike, rebuildIntervalH: "0", rebuildIntervalKm: "-5", hoursAtInstall: "x", kmAtInstall: "", notes: "" }));
    expect(s.errors).toEqual({
      serial: "Enter the engine's serial",
      rebuildIntervalH: "Rebuild interval (hours) must be between 0.5 h and 2000 h",
      rebuildIntervalKm: "Rebuild interval (distance) must be between 10 km and 200000 km",
      hoursAtInstall: "Hours at install must be a number in h",
    });
  });
});

describe("Engine ledger", () => {
  let bikeId: number;
  let engineId: number;
  beforeAll(async () => {
    // Rev ceiling 14 200 rpm → the default "time above" rpm is 90 % of it, 12 780 rpm, as at ingest.
    bikeId = (await Bike.create({ teamId: a.teamId, name: "Ledger bike", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: 14200, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null })).id;
    engineId = (await Engine.create({ teamId: a.teamId, bikeId, serial: "LEDGER-1", rebuildIntervalH: 1, rebuildIntervalKm: 1000, hoursAtInstall: 0.1, kmAtInstall: 10, notes: null })).id;
    const engine = (hours: number, distanceM: number, above: number, exceed: number) => ({ engine: { runningS: hours * 3600, hours, distanceM, rpmThreshold: 12780, timeAboveRpmS: above, ceilingRpm: 14200, ceilingExceedances: exceed } });
    await session(a.teamId, { title: "FP1", status: "ready", engineId, bikeId, summary: engine(0.4, 50_000, 30, 1) });
    await session(a.teamId, { title: "FP2", status: "ready", engineId, bikeId, summary: engine(0.3, 40_000, 12.5, 2) });
    // Neither counts: not analysed yet, and another engine.
    await session(a.teamId, { title: "queued", status: "queued", engineId, bikeId, summary: engine(5, 1e6, 999, 9) });
    await session(a.teamId, { title: "other engine", status: "ready", engineId: aEngine, bikeId, summary: engine(5, 1e6, 999, 9) });
  });

  it("adds the two sessions' summaries to the life at install and warns at 80 %", async () => {
    const ctx = await requireTeam(new Headers({ cookie: a.members.viewer.cookie }));
    const { rpm, engines } = await enginesOfBike(ctx, bikeId);
    expect(rpm).toBeCloseTo(12780, 6);
    expect(engines).toHaveLength(1);
    const l = at(engines, 0).ledger;
    expect(l.sessionCount).toBe(2);
    // 0.1 h when fitted + 0.4 h + 0.3 h = 0.8 h of a 1 h interval → 80 % → the warning starts.
    expect(l.hours).toBeCloseTo(0.8, 9);
    expect(l.km).toBeCloseTo(10 + 50 + 40, 9);
    expect(l.hoursUsedPct).toBeCloseTo(80, 9);
    expect(l.kmUsedPct).toBeCloseTo(10, 9);
    expect(l.timeAboveRpmS).toBeCloseTo(42.5, 9);
    expect(l.ceilingExceedances).toBe(3);
    expect(l.warning?.level).toBe("near");
    expect(l.warning?.caution).toMatch(/symptom, not a diagnosis/);
    expect(at(engines, 0).sessions.map((s) => [s.title, s.source])).toEqual([["FP1", "summary"], ["FP2", "summary"]]);
  });

  it("no warning below 80 %; due at 100 %", async () => {
    const ctx = await requireTeam(new Headers({ cookie: a.members.engineer.cookie }));
    await Engine.update({ hoursAtInstall: 0.05 }, { where: { id: engineId } });
    expect(at((await enginesOfBike(ctx, bikeId)).engines, 0).ledger.warning).toBeNull(); // 75 %
    await Engine.update({ hoursAtInstall: 0.3 }, { where: { id: engineId } });
    const l = at((await enginesOfBike(ctx, bikeId)).engines, 0).ledger; // 100 %
    expect(l.warning?.level).toBe("due");
    await Engine.update({ hoursAtInstall: 0.1 }, { where: { id: engineId } });
  });

  it("another rpm than the stored one is counted from the samples (none stored here: 0 s)", async () => {
    const ctx = await requireTeam(new Headers({ cookie: a.members.engineer.cookie }));
    const { engines } = await enginesOfBike(ctx, bikeId, 13500);
    expect(at(engines, 0).ledger.timeAboveRpmS).toBe(0);
    expect(at(engines, 0).ledger.hours).toBeCloseTo(0.8, 9);
    expect(at(engines, 0).sessions.every((s) => s.source === "samples")).toBe(true);
  });

  it("another team cannot read the ledger", async () => {
    const ctx = await requireTeam(new Headers({ cookie: b.members.owner.cookie }));
    await expect(enginesOfBike(ctx, bikeId)).rejects.toMatchObject({ status: 404 });
  });
});

describe("events", () => {
  it.each(ROLES)("%s adding and editing an event", async (role) => {
    as(a, role);
    const s = await createEventAction({}, form({ name: `Meeting of ${role}`, trackId: aTrack, startsOn: "2026-06-06", endsOn: "2026-06-07" }));
    const u = await updateEventAction({}, form({ eventId: aEvent, name: `Renamed by ${role}`, trackId: "", startsOn: "2026-05-01", endsOn: "2026-05-03" }));
    if (EDITORS.includes(role)) {
      expect(s).toMatchObject({ ok: true });
      expect(await RaceEvent.findByPk(s.id!)).toMatchObject({ trackId: aTrack, startsOn: "2026-06-06", endsOn: "2026-06-07" });
      expect(u).toMatchObject({ ok: true });
      expect((await RaceEvent.findByPk(aEvent))?.name).toBe(`Renamed by ${role}`);
    } else {
      expect(s).toMatchObject({ ok: false, status: 403 });
      expect(u).toMatchObject({ ok: false, status: 403 });
      expect(await RaceEvent.count({ where: { name: `Meeting of ${role}` } })).toBe(0);
    }
  });

  it("another team gets 404 for our event and cannot use our track", async () => {
    as(b, "engineer");
    expect((await updateEventAction({}, form({ eventId: aEvent, name: "x y", trackId: "", startsOn: "", endsOn: "" }))).status).toBe(404);
    expect((await createEventAction({}, form({ name: "B meeting", trackId: aTrack, startsOn: "", endsOn: "" }))).status).toBe(404);
  });

  it("refuses a last day before the first and a made-up date", async () => {
    as(a, "engineer");
    const s = await createEventAction({}, form({ name: "X", trackId: "", startsOn: "2026-06-07", endsOn: "2026-06-06" }));
    expect(s.errors).toEqual({ name: "Name the event (at least 2 characters)", endsOn: "The last day cannot be before the first day" });
    const t = await createEventAction({}, form({ name: "Test day", trackId: "", startsOn: "7 June", endsOn: "" }));
    expect(t.errors).toEqual({ startsOn: "First day: enter a date such as 2026-04-11" });
  });
});

describe("tracks", () => {
  const lap = CIRCUIT.centreline;
  const gateAt = (i: number) => gateAcrossPath(at(lap, i), at(lap, i + 1), 30);
  const goodTrack = () => ({ name: "A track", gates: { startFinish: gateAt(0), sectors: [gateAt(200), gateAt(500)], pitEntry: null, pitExit: null }, corners: [{ name: "Turn 1", distanceM: 450 }], pitSpeedLimitKmh: 60 });
  const save = (id: number, payload: unknown) => saveTrackAction({}, form({ trackId: id, payload: JSON.stringify(payload) }));

  it.each(ROLES)("%s creating a track", async (role) => {
    as(a, role);
    const r = await redirectOf(createTrackAction({}, form({ name: `Circuit of ${role}`, sessionId: "" })));
    if (EDITORS.includes(role)) expect(r.url).toMatch(/^\/tracks\/\d+$/);
    else {
      expect(r.state).toMatchObject({ ok: false, status: 403 });
      expect(await Track.count({ where: { name: `Circuit of ${role}` } })).toBe(0);
    }
  });

  it.each(ROLES)("%s saving gates", async (role) => {
    as(a, role);
    const s = await save(aTrack, { ...goodTrack(), name: `A track by ${role}` });
    const row = await Track.findByPk(aTrack);
    if (EDITORS.includes(role)) {
      expect(s).toMatchObject({ ok: true, message: "Track saved. No analysed sessions on it yet." });
      expect(row?.name).toBe(`A track by ${role}`);
      const gates = typeof row!.gates === "string" ? JSON.parse(row!.gates) : row!.gates;
      expect(gates.sectors).toHaveLength(2);
      expect(gates.startFinish.a.lat).toBeCloseTo(gateAt(0).a.lat, 9);
      expect(row?.pitSpeedLimitKmh).toBe(60);
    } else {
      expect(s).toMatchObject({ ok: false, status: 403 });
      expect(row?.name).not.toBe(`A track by ${role}`);
    }
  });

  it("another team's engineer gets 404 and changes nothing", async () => {
    as(b, "engineer");
    expect((await save(aTrack, { ...goodTrack(), name: "hijacked" })).status).toBe(404);
    expect((await Track.findByPk(aTrack))?.name).not.toBe("hijacked");
    const ctx = await requireTeam(new Headers({ cookie: b.members.viewer.cookie }));
    await expect(getTrackEditor(ctx, aTrack)).rejects.toMatchObject({ status: 404 });
  });

  it("explains what is wrong with the gates, corners and limit, each at its place", async () => {
    as(a, "engineer");
    const far = { a: lap[0], b: lap[200] }; // hundreds of metres apart: not a gate
    const s = await save(aTrack, {
      name: "A track",
      gates: { startFinish: null, sectors: [gateAt(100), far], pitEntry: gateAt(300), pitExit: null },
      corners: [{ name: "Hairpin", distanceM: 100 }, { name: "hairpin", distanceM: 300 }, { name: "", distanceM: -3 }],
      pitSpeedLimitKmh: 400,
    });
    expect(s.status).toBe(422);
    expect(s.errors?.["gates.startFinish"]).toBe("Sectors are timed from the start/finish gate: place it before sector gates.");
    expect(s.errors?.["gates.pitExit"]).toBe("Pit passes need both gates: place the pit entry and the pit exit, or neither.");
    expect(s.errors?.["gates.sectors.1"]).toMatch(/^This gate is not usable: gate length \d+\.\d m is outside 1–200 m\.$/);
    expect(s.errors?.["corners.1.name"]).toBe('"hairpin" is already the name of corner 1');
    expect(s.errors?.["corners.2.name"]).toBe("Name the corner");
    expect(s.errors?.["corners.2.distanceM"]).toBe("Distance along the lap cannot be negative");
    expect(s.errors?.pitSpeedLimitKmh).toBe("Pit-lane speed limit must be at most 150 km/h");
    const limit = await save(aTrack, { ...goodTrack(), pitSpeedLimitKmh: "sixty" });
    expect(limit.errors?.pitSpeedLimitKmh).toBe("Pit-lane speed limit must be a number of km/h");
  });

  describe("made from a session's GPS", () => {
    let sessionId: number;
    beforeAll(async () => {
      // Three laps of the invented circuit at 50 m/s, a fix every 5 m (10 Hz).
      const pts = [...lap.slice(0, -1), ...lap.slice(0, -1), ...lap];
      const n = pts.length;
      const timeS = Float64Array.from({ length: n }, (_, i) => i * 0.1);
      const lat = Float64Array.from(pts, (p) => p.lat);
      const lon = Float64Array.from(pts, (p) => p.lon);
      const speed = new Float32Array(n).fill(50);
      const ch = (name: string, role: "gps_lat" | "gps_lon" | "gps_speed", unit: string, values: Float64Array | Float32Array) => ({ name, role, unit, values, sampleCount: n, min: Math.min(...values), max: Math.max(...values) });
      const s = await session(a.teamId, { title: "GPS only", status: "ready", durationS: timeS[n - 1] });
      sessionId = s.id;
      const sequelize = getSequelize();
      await sequelize.transaction((t) =>
        writeSessionSamples(sequelize, t, s.id, { timeS, rows: n, metadata: {}, channels: [ch("Latitude", "gps_lat", "deg", lat), ch("Longitude", "gps_lon", "deg", lon), ch("GPS speed", "gps_speed", "m/s", speed)] }),
      );
    });

    it("takes one lap as the outline, joins the session to the track, and re-analyses it on save", async () => {
      as(a, "engineer");
      const r = await redirectOf(createTrackAction({}, form({ name: "From GPS", sessionId })));
      expect(r.url).toMatch(/^\/tracks\/\d+$/);
      const id = Number(r.url!.split("/").pop());
      const t = (await Track.findByPk(id))!;
      // The circuit's length by construction (sample-logs/circuit.ts); the loop closes within one 5 m step.
      expect(Math.abs(t.lengthM! - CIRCUIT.lengthM)).toBeLessThan(10);
      expect((await RideSession.findByPk(sessionId))?.trackId).toBe(id);

      const ctx = await requireTeam(new Headers({ cookie: a.members.viewer.cookie }));
      const ed = await getTrackEditor(ctx, id);
      expect(ed.outlineSource).toBe("track");
      expect(ed.sessions.map((s) => s.id)).toEqual([sessionId]);

      const s = await save(id, { ...goodTrack(), name: "From GPS" });
      expect(s).toMatchObject({ ok: true, message: "Track saved. 1 session analysed again." });
      // The analysis now finds laps with the new start/finish gate.
      const laps = await getSequelize().query<{ n: number }>("SELECT COUNT(*) AS n FROM laps WHERE session_id = ?", { replacements: [sessionId], type: QueryTypes.SELECT });
      expect(Number(at(laps, 0).n)).toBeGreaterThanOrEqual(2);
    });

    it("refuses a session that already has a track, and another team's session", async () => {
      as(a, "engineer");
      const again = await createTrackAction({}, form({ name: "Twice", sessionId }));
      expect(again).toMatchObject({ ok: false, status: 409, errors: { sessionId: "Pick a session without a track" } });
      as(b, "engineer");
      expect((await createTrackAction({}, form({ name: "Theirs", sessionId }))).status).toBe(404);
    });
  });
});
