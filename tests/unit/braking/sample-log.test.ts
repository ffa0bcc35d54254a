import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { brakingPoints } from "@/lib/braking/braking-points";
import { findCorners } from "@/lib/braking/find-corners";
import { readSampleCsv } from "../findings/read-sample-csv";
import { at } from "../../fixtures/at";

/**
 * Braking points and corners on the generated three-lap sample log, against the generator's
 * ground truth (invented circuit and data). Lap distance here is the front wheel speed
 * integrated from the lap's start and rescaled to the lap's true length, as the lap distance
 * channel does with the GPS length.
 */
const CSV = path.resolve(__dirname, "../../../sample-logs/files/three-laps-20hz.csv");

interface CornerTruth { name: string; apexDistanceM: number; minSpeedMps: number; brakeOnsetDistanceM: number | null }
interface LapTruth { number: number; kind: string; startS: number; endS: number; distanceM: number; corners: CornerTruth[] }
interface Truth { brakeOnsetThresholdBar: number; laps: LapTruth[] }

describe("braking on the generated three-lap sample log", () => {
  const truth: Truth = JSON.parse(readFileSync(CSV.replace(/\.csv$/, ".truth.json"), "utf8"));
  const s = readSampleCsv(CSV);
  const t = s.timeS;
  const flying = truth.laps.filter((l) => l.kind === "flying");

  function lapData(l: LapTruth) {
    let a = 0;
    while (at(t, a) < l.startS) a++;
    let b = a;
    while (b < t.length && at(t, b) < l.endS) b++;
    const v = s.channels.speed_front!.subarray(a, b);
    const d = new Float64Array(b - a);
    for (let i = 1; i < d.length; i++) d[i] = at(d, i - 1) + 0.5 * (at(v, i) + at(v, i - 1)) * (at(t, a + i) - at(t, a + i - 1));
    const k = l.distanceM / at(d, d.length - 1);
    for (let i = 0; i < d.length; i++) d[i]! *= k;
    return { distanceM: d, speedMps: v, brakeFrontPa: s.channels.brake_front!.subarray(a, b) };
  }

  it("has flying laps with corners", () => {
    expect(flying.length).toBeGreaterThanOrEqual(3);
  });

  it.each(flying.map((l) => [l.number, l] as const))("lap %d: brake onset within 1.5 m of the truth at every corner", (_n, lap) => {
    const pts = brakingPoints(lapData(lap), lap.corners.map((c) => ({ name: c.name, distanceM: c.apexDistanceM })), {
      thresholdPa: truth.brakeOnsetThresholdBar * 1e5, // bar → Pa (NIST SP 811, exact)
    });
    lap.corners.forEach((c, i) => {
      if (c.brakeOnsetDistanceM === null) expect(at(pts, i).braked).toBe(false);
      else expect(Math.abs(at(pts, i).onsetDistanceM! - c.brakeOnsetDistanceM), c.name).toBeLessThan(1.5);
    });
  });

  it.each(flying.map((l) => [l.number, l] as const))("lap %d: every corner found is a true corner (apex ±15 m, minimum speed ±0.5 m/s)", (_n, lap) => {
    const d = lapData(lap);
    const found = findCorners(d.speedMps, d.distanceM);
    for (const c of found) {
      const match = lap.corners.find((tc) => Math.abs(tc.apexDistanceM - c.distanceM) <= 15);
      expect(match, `found corner at ${c.distanceM.toFixed(0)} m`).toBeDefined();
      expect(Math.abs(match!.minSpeedMps - c.minSpeedMps)).toBeLessThan(0.5);
    }
    // All but one: the invented circuit's second corner is a fast kink taken with a ~1 m/s dip,
    // below the 5 m/s prominence setting, so it is not a speed minimum worth the name.
    expect(found.length).toBe(lap.corners.length - 1);
  });
});
