/**
 * The rider rule (own sessions and those shared with riders) in two lists that used to count every
 * session of the team: the Engine ledger's session list and the session counts on the track list.
 * The engine's life still counts every session it ran: that figure is about the engine.
 */
import { describe, it, expect, beforeAll, vi } from "vitest";
import { initModels, Bike, Engine, RideSession, Rider, Track } from "@/models";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { at } from "../fixtures/at";

vi.mock("next/headers", () => ({ headers: async () => new Headers() }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

const { enginesOfBike } = await import("@/lib/data/engines");
const { listTracks } = await import("@/lib/data/track-editor");
const { requireTeam } = await import("@/lib/auth/guard");

let a: TestTeam;
let bikeId: number;
let trackId: number;

function session(teamId: string, extra: Partial<Parameters<typeof RideSession.create>[0]>) {
  return RideSession.create({
    teamId, eventId: null, bikeId: null, engineId: null, riderId: null, trackId: null, logFileId: null, importProfileId: null, title: "s", startedAt: null,
    conditions: null, statusReason: null, mapping: null, summary: null, durationS: null, createdBy: null, ...extra,
  });
}

beforeAll(async () => {
  initModels();
  a = await createTeamWithRoles("Visibility A");
  const mine = await Rider.create({ teamId: a.teamId, name: "Rider with sign-in", raceNumber: "11", userId: a.members.rider.userId });
  const other = await Rider.create({ teamId: a.teamId, name: "Team-mate", raceNumber: "12", userId: null });
  bikeId = (await Bike.create({ teamId: a.teamId, name: "Vis bike", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: 14000, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null })).id;
  const engineId = (await Engine.create({ teamId: a.teamId, bikeId, serial: "VIS-1", rebuildIntervalH: 10, rebuildIntervalKm: null, notes: null })).id;
  trackId = (await Track.create({ teamId: a.teamId, name: "Vis track", centerLat: null, centerLon: null, lengthM: null, gates: null, corners: null, outline: null, pitSpeedLimitKmh: null, thresholds: null })).id;
  const summary = { engine: { runningS: 1800, hours: 0.5, distanceM: 60_000, rpmThreshold: 12600, timeAboveRpmS: 10, ceilingRpm: 14000, ceilingExceedances: 0 } };
  await session(a.teamId, { title: "Mine", status: "ready", engineId, bikeId, trackId, riderId: mine.id, summary });
  await session(a.teamId, { title: "Team-mate's", status: "ready", engineId, bikeId, trackId, riderId: other.id, summary });
  await session(a.teamId, { title: "Shared", status: "ready", engineId, bikeId, trackId, riderId: other.id, sharedWithRiders: true, summary });
});

const ctxOf = (role: "rider" | "engineer" | "viewer") => requireTeam(new Headers({ cookie: a.members[role].cookie }));

describe("Engine ledger session list", () => {
  it("a rider sees their own and shared sessions; the engine's life still counts all three", async () => {
    const { engines } = await enginesOfBike(await ctxOf("rider"), bikeId);
    expect(at(engines, 0).sessions.map((s) => s.title).sort()).toEqual(["Mine", "Shared"]);
    expect(at(engines, 0).ledger.hours).toBeCloseTo(1.5, 9);
  });

  it.each(["engineer", "viewer"] as const)("%s sees all three", async (role) => {
    const { engines } = await enginesOfBike(await ctxOf(role), bikeId);
    expect(at(engines, 0).sessions.map((s) => s.title).sort()).toEqual(["Mine", "Shared", "Team-mate's"]);
  });
});

describe("track list counts", () => {
  it("count only the sessions the caller may see", async () => {
    const count = async (role: "rider" | "engineer") => (await listTracks(await ctxOf(role))).find((t) => t.id === trackId)?.sessionCount;
    expect(await count("rider")).toBe(2);
    expect(await count("engineer")).toBe(3);
  });
});
