/**
 * Season-record figures of one session. The mean of the best three is checked against
 * simple-statistics' mean (a reference library) and a worked example by hand; which laps count as
 * flying (not out-lap, in-lap, pit pass or invalid) is common practice of timing sheets.
 */
import { describe, it, expect } from "vitest";
import { mean } from "simple-statistics";
import { lapFigures, type RecordLap } from "@/lib/record/lap-figures";
import { bestPerPair } from "@/lib/record/best-per-pair";
import { eventProgression } from "@/lib/record/event-progression";
import { storedLapState } from "@/lib/laps/stored-lap-state";

const lap = (number: number, lapTimeMs: number, extra: Partial<RecordLap> = {}): RecordLap => ({ number, lapTimeMs, isOutLap: false, isInLap: false, isInvalid: false, pitPass: false, topSpeedMps: null, ...extra });

describe("lapFigures", () => {
  it("takes the best lap and the mean of the three quickest flying laps", () => {
    const laps = [lap(0, 120_000, { isOutLap: true }), lap(1, 92_400), lap(2, 91_800, { topSpeedMps: 80.5 }), lap(3, 92_100), lap(4, 93_000, { topSpeedMps: 81.2 }), lap(5, 80_000, { isInvalid: true }), lap(6, 130_000, { isInLap: true })];
    const f = lapFigures(laps);
    expect(f.bestLapMs).toBe(91_800);
    expect(f.bestLapNumber).toBe(2);
    expect(f.flyingLapCount).toBe(4);
    // By hand: (91.8 + 92.1 + 92.4) / 3 = 92.1 s; and simple-statistics agrees.
    expect(f.bestThreeMeanMs).toBeCloseTo(92_100, 9);
    expect(f.bestThreeMeanMs).toBeCloseTo(mean([91_800, 92_100, 92_400]), 9);
    // Top speed over every lap, flying or not.
    expect(f.topSpeedMps).toBe(81.2);
  });

  it("gives no best-three mean with fewer than three flying laps, and nothing without laps", () => {
    expect(lapFigures([lap(1, 90_000), lap(2, 91_000), lap(3, 50_000, { pitPass: true })]).bestThreeMeanMs).toBeNull();
    const none = lapFigures([]);
    expect(none).toMatchObject({ bestLapMs: null, bestThreeMeanMs: null, topSpeedMps: null, flyingLapCount: 0 });
  });
});

describe("the lap rules the record shares with the session pages", () => {
  // A lap that two missed crossings merged (suspect) or one the log's end cut off (not complete)
  // is not a flying lap on a timing sheet (common practice); the record now reads both states.
  it("leaves suspect and incomplete laps out, as isFlyingLap does", () => {
    const laps = [lap(1, 92_000), lap(2, 91_000), lap(3, 184_500, { suspect: true }), lap(4, 60_000, { complete: false }), lap(5, 93_000)];
    const f = lapFigures(laps);
    expect(f.flyingLapCount).toBe(3);
    expect(f.bestLapMs).toBe(91_000);
    expect(f.bestThreeMeanMs).toBeCloseTo(mean([91_000, 92_000, 93_000]), 9);
  });

  it("storedLapState: rows without the keys are complete unless out- or in-lap, never suspect", () => {
    expect(storedLapState(null, false, false)).toEqual({ complete: true, suspect: false });
    expect(storedLapState(null, true, false)).toEqual({ complete: false, suspect: false });
    expect(storedLapState({}, false, true)).toEqual({ complete: false, suspect: false });
    expect(storedLapState({ complete: true }, true, false)).toEqual({ complete: true, suspect: false });
    expect(storedLapState({ complete: false, suspect: true }, false, false)).toEqual({ complete: false, suspect: true });
    expect(storedLapState({ complete: "yes", suspect: 1 }, false, false)).toEqual({ complete: true, suspect: false });
  });
});

describe("bestPerPair and eventProgression", () => {
  it("keeps the quickest row per rider and bike", () => {
    const rows = [
      { sessionId: 1, riderId: 1, bikeId: 1, bestLapMs: 92_000, startedAt: "2031-01-01" },
      { sessionId: 2, riderId: 1, bikeId: 1, bestLapMs: 91_000, startedAt: "2031-02-01" },
      { sessionId: 3, riderId: 1, bikeId: 2, bestLapMs: 93_000, startedAt: "2031-02-01" },
      { sessionId: 4, riderId: 2, bikeId: 2, bestLapMs: null, startedAt: "2031-02-01" },
    ];
    expect(bestPerPair(rows).map((r) => r.sessionId)).toEqual([2, 3]);
  });

  it("puts events in date order with the quickest figures of each", () => {
    const pts = eventProgression([
      { eventId: 2, eventName: "B", eventDate: "2031-06-01", bestLapMs: 90_000, bestThreeMeanMs: 91_000 },
      { eventId: 1, eventName: "A", eventDate: "2031-04-01", bestLapMs: 92_000, bestThreeMeanMs: null },
      { eventId: 1, eventName: "A", eventDate: "2031-04-01", bestLapMs: 93_000, bestThreeMeanMs: 93_500 },
      { eventId: null, eventName: null, eventDate: null, bestLapMs: 80_000, bestThreeMeanMs: 80_000 },
    ]);
    expect(pts).toEqual([
      { eventId: 1, eventName: "A", eventDate: "2031-04-01", bestLapMs: 92_000, bestThreeMeanMs: 93_500 },
      { eventId: 2, eventName: "B", eventDate: "2031-06-01", bestLapMs: 90_000, bestThreeMeanMs: 91_000 },
    ]);
  });
});
