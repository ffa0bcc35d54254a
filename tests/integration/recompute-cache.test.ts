/**
 * Settings that recompute an analysis from the samples on request (Engine ledger rpm, suspension
 * boundary, slip lean) are restricted to a finite set of values and their results are reused, so
 * a stream of requests with made-up values cannot keep the server reading samples.
 */
import { describe, it, expect, beforeAll, vi } from "vitest";
import { initModels, Bike, Engine, RideSession } from "@/models";
import { getSequelize } from "@/models/db";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { recomputeCount, roundBoundaryMs, roundRpm } from "@/lib/data/recompute-cache";
import { at } from "../fixtures/at";

vi.mock("next/headers", () => ({ headers: async () => new Headers() }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

const { enginesOfBike } = await import("@/lib/data/engines");
const { suspensionAnalysis, slipAnalysis } = await import("@/lib/data/analysis");
const { requireTeam } = await import("@/lib/auth/guard");

let a: TestTeam;
let bikeId: number;
let sessionId: number;

beforeAll(async () => {
  initModels();
  a = await createTeamWithRoles("Recompute A");
  bikeId = (await Bike.create({ teamId: a.teamId, name: "RC bike", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: 14000, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null })).id;
  const engineId = (await Engine.create({ teamId: a.teamId, bikeId, serial: "RC-1", rebuildIntervalH: 10, rebuildIntervalKm: null, notes: null })).id;
  const summary = { engine: { runningS: 600, hours: 1 / 6, distanceM: 20_000, rpmThreshold: 12600, timeAboveRpmS: 5, ceilingRpm: 14000, ceilingExceedances: 0 } };
  for (const title of ["RC1", "RC2"]) {
    const s = await RideSession.create({
      teamId: a.teamId, eventId: null, bikeId, engineId, riderId: null, trackId: null, logFileId: null, importProfileId: null, title, startedAt: null,
      conditions: null, statusReason: null, mapping: null, summary, durationS: null, createdBy: null, status: "ready",
    });
    sessionId = s.id;
  }
});

describe("restricted values", () => {
  it("rpm in steps of 50 between 1 000 and 25 000; boundary in whole mm/s between 5 and 2 000", () => {
    expect([roundRpm(13517), roundRpm(13524), roundRpm(13526), roundRpm(10), roundRpm(1e9)]).toEqual([13500, 13500, 13550, 1000, 25000]);
    expect([roundBoundaryMs(0.1234), roundBoundaryMs(0.0001), roundBoundaryMs(50)]).toEqual([0.123, 0.005, 2]);
  });
});

describe("results reused", () => {
  it("Engine ledger: another rpm reads each session's samples once; nearby values share the result", async () => {
    const ctx = await requireTeam(new Headers({ cookie: a.members.engineer.cookie }));
    const c0 = recomputeCount();
    const first = await enginesOfBike(ctx, bikeId, 13517);
    expect(first.rpm).toBe(13500);
    expect(recomputeCount() - c0).toBe(2); // two sessions
    const again = await Promise.all([enginesOfBike(ctx, bikeId, 13490), enginesOfBike(ctx, bikeId, 13510)]);
    expect(again.map((r) => r.rpm)).toEqual([13500, 13500]);
    expect(recomputeCount() - c0).toBe(2);
    expect(at(at(again, 0).engines, 0).ledger).toEqual(at(first.engines, 0).ledger);
    await enginesOfBike(ctx, bikeId, 13600);
    expect(recomputeCount() - c0).toBe(4);
  });

  it("Engine ledger: a changed session is read again", async () => {
    const ctx = await requireTeam(new Headers({ cookie: a.members.engineer.cookie }));
    await enginesOfBike(ctx, bikeId, 12000);
    const c0 = recomputeCount();
    await RideSession.update({ title: "RC2 renamed" }, { where: { id: sessionId } });
    await enginesOfBike(ctx, bikeId, 12000);
    expect(recomputeCount() - c0).toBe(1);
  });

  it("suspension boundary and slip lean: one computation per distinct setting", async () => {
    const sequelize = getSequelize();
    const c0 = recomputeCount();
    const s1 = await suspensionAnalysis(sequelize, sessionId, { boundaryMs: 0.1234 });
    await suspensionAnalysis(sequelize, sessionId, { boundaryMs: 0.1231 });
    expect(s1.boundaryMs).toBe(0.123);
    expect(recomputeCount() - c0).toBe(1);
    await slipAnalysis(sequelize, sessionId, { lean: true });
    await slipAnalysis(sequelize, sessionId, { lean: true });
    expect(recomputeCount() - c0).toBe(2);
  });
});
