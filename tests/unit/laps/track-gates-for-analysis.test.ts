/**
 * Stored gates → lap-detection gates, the one definition ingest, re-analysis and the page
 * analyses' fallback share. The 90 m/s ceiling of a lap's average speed is common practice (no
 * circuit lap averages 324 km/h); the rest is the stored JSON's own shape.
 */
import { describe, expect, it } from "vitest";
import { MAX_LAP_AVERAGE_MPS, trackGatesForAnalysis } from "@/lib/laps/track-gates-for-analysis";

const gate = (lat: number) => ({ a: { lat, lon: 10 }, b: { lat, lon: 10.001 } });

describe("trackGatesForAnalysis", () => {
  it("without a usable start/finish gate there is nothing to detect laps with", () => {
    expect(trackGatesForAnalysis({ gates: null, lengthM: 4000, thresholds: null })).toBeNull();
    expect(trackGatesForAnalysis({ gates: { sectors: [gate(1)] }, lengthM: 4000, thresholds: null })).toBeNull();
    expect(trackGatesForAnalysis({ gates: { startFinish: { a: { lat: NaN, lon: 1 }, b: { lat: 1, lon: 1 } } }, lengthM: 4000, thresholds: null })).toBeNull();
  });

  it("minimum lap time from the track's threshold first, then from its length", () => {
    const gates = { startFinish: gate(45) };
    expect(trackGatesForAnalysis({ gates, lengthM: 4500, thresholds: { minLapTimeS: 70 } })?.minLapTimeS).toBe(70);
    // 4500 m at 90 m/s = 50 s.
    expect(trackGatesForAnalysis({ gates, lengthM: 4500, thresholds: null })?.minLapTimeS).toBeCloseTo(50, 12);
    expect(MAX_LAP_AVERAGE_MPS).toBe(90);
    expect(trackGatesForAnalysis({ gates, lengthM: null, thresholds: { minLapTimeS: -3 } })).not.toHaveProperty("minLapTimeS");
  });

  it("reads JSON text as MariaDB may return it, and drops sector gates with a missing end", () => {
    const stored = JSON.stringify({ startFinish: gate(45), sectors: [gate(45.01), { a: { lat: 45.02, lon: 10 } }, null, gate(45.03)], pitEntry: gate(45.04), pitExit: null });
    const g = trackGatesForAnalysis({ gates: stored, lengthM: 3600, thresholds: '{"minLapTimeS": 55}' });
    expect(g).toEqual({ startFinish: gate(45), sectors: [gate(45.01), gate(45.03)], pitEntry: gate(45.04), pitExit: undefined, minLapTimeS: 55 });
  });
});
