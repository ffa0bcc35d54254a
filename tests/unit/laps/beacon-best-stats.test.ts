import { describe, expect, it } from "vitest";
import { bestSectorLap } from "@/lib/laps/best-sector-lap";
import { detectLapsFromBeacon } from "@/lib/laps/detect-laps-from-beacon";
import { lapStats } from "@/lib/laps/lap-stats";
import type { Lap } from "@/lib/laps/types";
import { at } from "../../fixtures/at";

describe("detectLapsFromBeacon", () => {
  it("times each rising edge at its first high sample (100 Hz → within 10 ms) and drops a double pulse", () => {
    const hz = 100;
    const cross = [12.3456, 95.1234, 178.9, 180.2, 262.05]; // 180.2: a second pulse 1.3 s later
    const n = 300 * hz;
    const timeS = Float64Array.from({ length: n }, (_, i) => i / hz);
    const beacon = new Float32Array(n);
    for (const c of cross) for (let i = Math.ceil(c * hz); i < Math.ceil(c * hz) + 5; i++) beacon[i] = 1;
    beacon[500] = NaN; // a missing sample is skipped
    const laps = detectLapsFromBeacon(timeS, beacon);
    expect(laps.map((l) => [l.outLap, l.complete, l.inLap])).toEqual([
      [true, false, false],
      [false, true, false],
      [false, true, false],
      [false, true, false],
      [false, false, true],
    ]);
    const edges = [12.3456, 95.1234, 178.9, 262.05];
    for (let k = 1; k <= 3; k++) {
      // Edge quantised up to the next sample: error in [0, 10) ms at each end.
      expect(Math.abs(at(laps, k).lapTimeMs - (at(edges, k) - at(edges, k - 1)) * 1000)).toBeLessThan(10);
      expect(at(laps, k).sectorTimesMs).toEqual([at(laps, k).lapTimeMs]);
    }
    expect(at(laps, 0).sectorTimesMs).toEqual([null]);
  });
});

function lap(number: number, sectors: number[], flags: Partial<Lap> = {}): Lap {
  const lapTimeMs = sectors.reduce((a, b) => a + b, 0);
  return { number, startTimeS: 0, endTimeS: lapTimeMs / 1000, lapTimeMs, sectorTimesMs: sectors, outLap: false, inLap: false, pitPass: false, complete: true, ...flags };
}

describe("bestSectorLap", () => {
  it("sums the best sector of each flying lap and says which lap each came from", () => {
    const laps = [
      lap(1, [20000, 30000, 25000], { outLap: true, complete: false }), // out-lap: excluded
      lap(2, [31000, 40100, 29900]),
      lap(3, [30500, 40300, 29950]),
      lap(4, [30800, 39900, 30100]),
      lap(5, [29000, 39000, 28000], { pitPass: true }), // pit pass: excluded
      lap(6, [30000, 39000, 28000], { invalid: true }), // marked invalid: excluded
    ];
    // Hand sum: 30500 (lap 3) + 39900 (lap 4) + 29900 (lap 2) = 100300 ms.
    expect(bestSectorLap(laps)).toEqual({
      timeMs: 100300,
      sectors: [
        { sector: 0, timeMs: 30500, lapNumber: 3 },
        { sector: 1, timeMs: 39900, lapNumber: 4 },
        { sector: 2, timeMs: 29900, lapNumber: 2 },
      ],
    });
  });

  it("is null with no flying lap", () => {
    expect(bestSectorLap([lap(1, [1000], { inLap: true })])).toBeNull();
  });
});

describe("lapStats", () => {
  it("top/min speed from the front wheel and mean/SD of a channel over the lap's samples only", () => {
    // 1..100 over the lap: mean 50.5, sample SD √(n(n+1)/12) = √(841.6667) = 29.0115 (arithmetic of 1..n).
    const n = 200;
    const timeS = Float64Array.from({ length: n }, (_, i) => i * 0.01);
    const throttle = Float32Array.from({ length: n }, (_, i) => (i >= 50 && i < 150 ? i - 49 : 1000));
    const speed = Float32Array.from({ length: n }, (_, i) => (i >= 50 && i < 150 ? 20 + (i % 7) : 99));
    const laps = { number: 1, startTimeS: 0.5, endTimeS: 1.49, lapTimeMs: 990, sectorTimesMs: [990], outLap: false, inLap: false, pitPass: false, complete: true };
    const s = lapStats({ timeS, channels: { throttle, speed_front: speed } }, laps, ["throttle"]);
    expect(s.speedSource).toBe("speed_front");
    expect(s.topSpeedMps).toBe(26);
    expect(s.minSpeedMps).toBe(20);
    expect(s.channels.throttle!.n).toBe(100);
    expect(s.channels.throttle!.mean).toBeCloseTo(50.5, 12);
    expect(s.channels.throttle!.sd).toBeCloseTo(Math.sqrt((100 * 101) / 12), 12);
  });
});
