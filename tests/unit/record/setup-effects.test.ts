/**
 * Setup effects between consecutive sessions. Worked examples by hand: the differences are plain
 * subtraction of lap times (after − before, negative = quicker), sectors ordered by the size of
 * their move.
 */
import { describe, it, expect } from "vitest";
import { setupEffects, type EffectSession } from "@/lib/record/setup-effects";
import { at } from "../../fixtures/at";

const s = (id: number, startedAt: string, setup: Record<string, number | string | null> | null, best: number | null, mean: number | null, sectors: number[] | null, bikeId = 1, trackId = 1): EffectSession => ({
  sessionId: id, title: `S${id}`, startedAt, bikeId, trackId, conditions: null, setupVersion: 1, setup, bestLapMs: best, bestThreeMeanMs: mean, bestSectorsMs: sectors,
});

describe("setupEffects", () => {
  it("pairs consecutive sessions of one bike at one track where the setup changed", () => {
    const out = setupEffects(
      [
        s(2, "2031-04-05T11:00:00Z", { forkPreloadMm: 6, shockReboundClicks: 10 }, 91_400, 91_900, [30_100, 28_000, 33_300]),
        s(1, "2031-04-05T09:00:00Z", { forkPreloadMm: 5, shockReboundClicks: 10 }, 92_000, 92_300, [30_200, 28_600, 33_200]),
        s(3, "2031-04-05T13:00:00Z", { forkPreloadMm: 6, shockReboundClicks: 10 }, 91_300, null, null),
        s(4, "2031-04-05T10:00:00Z", { forkPreloadMm: 9 }, 95_000, null, null, 2),
      ],
      ["forkPreloadMm", "shockReboundClicks"],
      2,
    );
    expect(out).toHaveLength(1);
    const e = at(out, 0);
    expect([e.before.sessionId, e.after.sessionId]).toEqual([1, 2]);
    expect(e.changes).toEqual([{ field: "forkPreloadMm", before: 5, after: 6 }]);
    expect(e.bestLapDeltaMs).toBe(-600);
    expect(e.bestThreeMeanDeltaMs).toBe(-400);
    // Sector 2 moved 600 ms, sector 1 100 ms, sector 3 100 ms: the two largest, ties by number.
    expect(e.sectors).toEqual([
      { sector: 2, beforeMs: 28_600, afterMs: 28_000, deltaMs: -600 },
      { sector: 1, beforeMs: 30_200, afterMs: 30_100, deltaMs: -100 },
    ]);
  });

  it("skips sessions without a setup, bike or track, and reports missing figures as null", () => {
    const out = setupEffects([s(1, "2031-01-01", { a: 1 }, null, null, null), s(2, "2031-01-02", null, 90_000, null, null), s(3, "2031-01-03", { a: 2 }, 90_000, null, null)], ["a"]);
    expect(out).toHaveLength(1);
    expect(at(out, 0).bestLapDeltaMs).toBeNull();
    expect(at(out, 0).sectors).toEqual([]);
  });
});
