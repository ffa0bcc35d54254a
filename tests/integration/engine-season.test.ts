/**
 * Engines across the season against the real MariaDB: life since the last rebuild from the hours
 * when fitted plus the sessions' stored use, over-revs and time above the chosen rpm, sessions and
 * events, the Team home mark at 80 % (Lapbench's default), a dated move between bikes and a rebuild
 * that starts the count again. Riders and viewers change nothing.
 */
import { describe, it, expect, beforeAll } from "vitest";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { buildWorld, type World } from "./helpers/record-world";
import { requireTeam } from "@/lib/auth/guard";
import { initModels, Engine, RideSession } from "@/models";
import { listSeasonEngines, enginesNearingRebuild, moveEngine, recordRebuild } from "@/lib/data/engine-season";
import type { TeamRole } from "@/lib/auth/permissions";
import { at } from "../fixtures/at";

let team: TestTeam;
let world: World;
const ctx = (role: TeamRole) => requireTeam(new Headers({ cookie: team.members[role].cookie }));
const RPM = 13_000;

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Engine team");
  world = await buildWorld(team, [
    { title: "E1", event: "a", rider: "own", bike: "one", startedAt: "2031-04-05T09:00:00Z", lapsMs: [92_000] },
    { title: "E2", event: "b", rider: "own", bike: "one", startedAt: "2031-06-14T09:00:00Z", lapsMs: [92_000] },
  ]);
  // Stored per-session use, as the ingest analysis writes it (hours, km, time above the rpm it was counted at).
  for (const [title, hours, km, above, over] of [["E1", 0.5, 80, 12, 1], ["E2", 0.7, 110, 20, 2]] as const) {
    await RideSession.update({ summary: { engine: { hours, distanceKm: km, timeAboveRpmS: above, ceilingExceedances: over, rpmThreshold: RPM } } }, { where: { id: world.sessions[title] } });
  }
  await Engine.update({ hoursAtInstall: 7.2, kmAtInstall: 500 }, { where: { id: world.engine.id } });
});

describe("engines across the season", () => {
  it("sums life since the rebuild, over-revs, time above the rpm, sessions and events", async () => {
    const e = (await listSeasonEngines(await ctx("viewer"), RPM)).find((x) => x.id === world.engine.id)!;
    // 7.2 + 0.5 + 0.7 = 8.4 h of a 10 h interval → 84 %; 500 + 80 + 110 = 690 km of 2000 km.
    expect(e.ledger.hours).toBeCloseTo(8.4, 9);
    expect(e.ledger.km).toBeCloseTo(690, 9);
    expect(e.ledger.usedPct).toBeCloseTo(84, 9);
    expect(e.ledger.timeAboveRpmS).toBe(32);
    expect(e.ledger.ceilingExceedances).toBe(3);
    expect(e.sessions.map((s) => s.title)).toEqual(["E1", "E2"]);
    expect(e.events).toEqual(["Round 1", "Round 2"]);
    expect(e.ledger.warning?.level).toBe("near");
  });

  it("marks the engine on Team home for engineers and owners", async () => {
    expect((await enginesNearingRebuild(await ctx("engineer"))).map((e) => e.serial)).toEqual([world.engine.serial]);
  });

  it("moves the engine to another bike with a dated record; riders may not", async () => {
    await expect(moveEngine(await ctx("rider"), world.engine.id, { toBikeId: String(world.bikes.two.id), onDate: "2031-06-20" })).rejects.toMatchObject({ status: 403 });
    await expect(moveEngine(await ctx("engineer"), world.engine.id, { toBikeId: String(world.bikes.two.id), onDate: "20/06/2031" })).rejects.toThrow(/Enter a date such as/);
    await moveEngine(await ctx("engineer"), world.engine.id, { toBikeId: String(world.bikes.two.id), onDate: "2031-06-20", note: "Spare for Bike 12" });
    const e = (await listSeasonEngines(await ctx("owner"), RPM)).find((x) => x.id === world.engine.id)!;
    expect(e.bikeName).toBe("Bike 12");
    expect(e.history[0]).toMatchObject({ kind: "move", onDate: "2031-06-20", fromBike: "Bike 11", toBike: "Bike 12", note: "Spare for Bike 12" });
    // The sessions it ran in Bike 11 still count towards its life.
    expect(e.ledger.hours).toBeCloseTo(8.4, 9);
  });

  it("a rebuild keeps the life so far on record and starts the count again", async () => {
    await recordRebuild(await ctx("owner"), world.engine.id, { onDate: "2031-06-21", note: "Top end" });
    const e = (await listSeasonEngines(await ctx("owner"), RPM)).find((x) => x.id === world.engine.id)!;
    expect(e.history[0]).toMatchObject({ kind: "rebuild", onDate: "2031-06-21", note: "Top end" });
    expect(at(e.history, 0).hoursBefore).toBeCloseTo(8.4, 9);
    expect(e.ledger.hours).toBe(0);
    expect(e.sessions).toHaveLength(0);
    expect(e.lastRebuild).toBe("2031-06-21");
    expect(await enginesNearingRebuild(await ctx("owner"))).toHaveLength(0);
  });
});
