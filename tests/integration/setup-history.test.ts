/**
 * Setup history against the real MariaDB: older versions stay readable in full, and the effect of
 * a change between two sessions of one bike at one track carries the lap figures and sectors of
 * each. A rider sees effects only over sessions they rode.
 */
import { describe, it, expect, beforeAll } from "vitest";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { buildWorld, type World } from "./helpers/record-world";
import { requireTeam } from "@/lib/auth/guard";
import { getSetupEffects, EFFECT_CAUTION } from "@/lib/data/setup-history";
import { getSetupSheetView } from "@/lib/data/setup-sheets";
import type { TeamRole } from "@/lib/auth/permissions";
import { at } from "../fixtures/at";

let team: TestTeam;
let world: World;
const ctx = (role: TeamRole) => requireTeam(new Headers({ cookie: team.members[role].cookie }));

beforeAll(async () => {
  team = await createTeamWithRoles("Setup history team");
  world = await buildWorld(team, [
    { title: "FP1", event: "a", rider: "own", bike: "one", startedAt: "2031-04-05T09:00:00Z", lapsMs: [92_000, 92_400, 92_600], sectorsMs: [[30_000, 29_000, 33_000], [30_100, 29_100, 33_200], [30_200, 29_200, 33_200]], conditions: "dry, track 31 °C", setup: [{ forkPreloadMm: 5, shockReboundClicks: 12 }, { forkPreloadMm: 5, shockReboundClicks: 10 }] },
    { title: "FP2", event: "a", rider: "own", bike: "one", startedAt: "2031-04-05T13:00:00Z", lapsMs: [91_500, 91_700, 91_900], sectorsMs: [[29_950, 28_500, 33_050], [30_000, 28_600, 33_100], [30_100, 28_700, 33_100]], conditions: "dry, track 38 °C", setup: [{ forkPreloadMm: 6, shockReboundClicks: 10 }] },
    { title: "Other bike", event: "a", rider: "other", bike: "two", startedAt: "2031-04-05T10:00:00Z", lapsMs: [94_000], setup: [{ forkPreloadMm: 3 }] },
    { title: "Other bike 2", event: "a", rider: "other", bike: "two", startedAt: "2031-04-05T14:00:00Z", lapsMs: [93_000], setup: [{ forkPreloadMm: 4 }] },
  ]);
});

describe("setup history", () => {
  it("keeps every version of a sheet readable in full", async () => {
    const view = await getSetupSheetView(await ctx("viewer"), at(world.sessions, "FP1"));
    const v1 = view.versions.find((v) => v.version === 1)!;
    expect(v1.values.shockReboundClicks).toBe(12);
    expect(at(view.versions, 0).changed).toEqual(["shockReboundClicks"]);
  });

  it("shows the effect of the change between FP1's last setup and FP2", async () => {
    const { effects } = await getSetupEffects(await ctx("engineer"), { bikeId: world.bikes.one.id });
    expect(effects).toHaveLength(1);
    const e = at(effects, 0);
    expect([e.before.sessionId, e.after.sessionId]).toEqual([world.sessions.FP1, world.sessions.FP2]);
    // FP1 ended on version 2 (rebound 10), so only the preload changed.
    expect(e.changes).toEqual([{ field: "forkPreloadMm", before: 5, after: 6 }]);
    expect(e.before.setupVersion).toBe(2);
    expect(e.bestLapDeltaMs).toBe(91_500 - 92_000);
    expect(e.bestThreeMeanDeltaMs).toBeCloseTo((91_500 + 91_700 + 91_900) / 3 - (92_000 + 92_400 + 92_600) / 3, 6);
    expect(e.before.conditions).toBe("dry, track 31 °C");
    expect(e.after.conditions).toBe("dry, track 38 °C");
    // Best sectors: S1 30000→29950 (−50), S2 29000→28500 (−500), S3 33000→33050 (+50).
    expect(at(e.sectors, 0)).toEqual({ sector: 2, beforeMs: 29_000, afterMs: 28_500, deltaMs: -500 });
    expect(e.bikeName).toBe("Bike 11");
    expect(EFFECT_CAUTION).toMatch(/One change rarely explains a lap time alone/);
  });

  it("filters by session and hides other riders' sessions from a rider", async () => {
    expect((await getSetupEffects(await ctx("owner"), { sessionId: world.sessions["Other bike 2"] })).effects).toHaveLength(1);
    const rider = await getSetupEffects(await ctx("rider"));
    expect(rider.effects.map((e) => e.after.sessionId)).toEqual([world.sessions.FP2]);
  });
});
