/**
 * The season record against the real MariaDB: rows per session with their figures, events in date
 * order, filters, best lap per rider and bike at the track, the progression across events, and a
 * rider seeing only the sessions they rode. Another team sees none of it.
 */
import { describe, it, expect, beforeAll } from "vitest";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { buildWorld, type World } from "./helpers/record-world";
import { requireTeam } from "@/lib/auth/guard";
import { getSeasonRecord } from "@/lib/data/season-record";
import type { TeamRole } from "@/lib/auth/permissions";
import { at } from "../fixtures/at";

let team: TestTeam;
let other: TestTeam;
let world: World;
const ctx = (t: TestTeam, role: TeamRole) => requireTeam(new Headers({ cookie: t.members[role].cookie }));

beforeAll(async () => {
  team = await createTeamWithRoles("Season team");
  other = await createTeamWithRoles("Other team");
  world = await buildWorld(team, [
    { title: "R1 FP", event: "a", rider: "own", bike: "one", startedAt: "2031-04-05T09:00:00Z", lapsMs: [120_000, 93_000, 92_500, 92_800, 110_000], topSpeedsMs: [60, 80, 81, 80.5, 50], conditions: "dry, 24 °C", findings: { open: 2, acknowledged: 1 }, setup: [{ forkPreloadMm: 5 }, { forkPreloadMm: 6 }] },
    { title: "R1 FP other", event: "a", rider: "other", bike: "two", startedAt: "2031-04-05T10:00:00Z", lapsMs: [94_000, 95_000] },
    { title: "R2 Q", event: "b", rider: "own", bike: "one", startedAt: "2031-06-14T09:00:00Z", lapsMs: [91_900, 91_700, 92_000, 92_300] },
  ]);
});

describe("season record", () => {
  it("lists every analysed session with its figures, events in date order", async () => {
    const rec = await getSeasonRecord(await ctx(team, "viewer"));
    expect(rec.rows).toHaveLength(3);
    expect(rec.events.map((e) => e.eventName)).toEqual(["Round 1", "Round 2"]);
    const fp = rec.rows.find((r) => r.sessionId === world.sessions["R1 FP"])!;
    expect(fp.riderName).toBe("Wren Tallis");
    // The first and last laps are counted as flying here too: the fixture has no out/in flags.
    expect(fp.bestLapMs).toBe(92_500);
    expect(fp.bestThreeMeanMs).toBeCloseTo((92_500 + 92_800 + 93_000) / 3, 6);
    expect(fp.topSpeedMps).toBe(81);
    expect(fp.setupVersion).toBe(2);
    expect(fp.findingsOpen).toBe(2);
    expect(fp.findingsAcknowledged).toBe(1);
    expect(fp.conditions).toBe("dry, 24 °C");
    expect(rec.options.years).toEqual([2031]);
  });

  it("keeps the best lap ever per rider and bike at the track, and a progression per event", async () => {
    const rec = await getSeasonRecord(await ctx(team, "owner"));
    const bests = rec.trackBests.find((t) => t.trackId === world.track.id)!.bests;
    expect(bests.map((b) => [b.riderName, b.bestLapMs, b.sessionId])).toEqual([
      ["Wren Tallis", 91_700, world.sessions["R2 Q"]],
      ["Odo Marsh", 94_000, at(bests, 1).sessionId],
    ]);
    expect(rec.progression!.trackId).toBe(world.track.id);
    expect(rec.progression!.points.map((p) => [p.eventName, p.bestLapMs])).toEqual([
      ["Round 1", 92_500],
      ["Round 2", 91_700],
    ]);
    expect(at(rec.progression!.points, 1).bestThreeMeanMs).toBeCloseTo((91_700 + 91_900 + 92_000) / 3, 6);
  });

  it("filters by rider, bike, track and season", async () => {
    const c = await ctx(team, "engineer");
    expect((await getSeasonRecord(c, { riderId: world.riders.other.id })).rows).toHaveLength(1);
    expect((await getSeasonRecord(c, { bikeId: world.bikes.one.id })).rows).toHaveLength(2);
    expect((await getSeasonRecord(c, { trackId: world.track.id })).rows).toHaveLength(3);
    expect((await getSeasonRecord(c, { year: 2030 })).rows).toHaveLength(0);
  });

  it("shows a rider only the sessions they rode, and another team nothing", async () => {
    const rec = await getSeasonRecord(await ctx(team, "rider"));
    expect(rec.riderOnly).toBe(true);
    expect(rec.rows.map((r) => r.riderName)).toEqual(["Wren Tallis", "Wren Tallis"]);
    expect(rec.options.riders.map((r) => r.name)).toEqual(["Wren Tallis"]);
    expect((await getSeasonRecord(await ctx(other, "owner"))).rows).toHaveLength(0);
  });
});
