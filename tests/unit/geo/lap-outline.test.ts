/**
 * Track outline from a recorded trace: on the invented demo circuit (sample-logs/circuit.ts,
 * whose centreline length is known by construction) three laps plus a standstill in the pit box
 * give back one lap of the circuit's length; a drive from A to B gives no outline.
 */
import { describe, it, expect } from "vitest";
import { lapOutline } from "@/lib/geo/lap-outline";
import { pathDistances } from "@/lib/geo/path-distances";
import { CIRCUIT } from "@/sample-logs/circuit";
import { at } from "../../fixtures/at";

describe("lapOutline", () => {
  it("gives one closed lap of the demo circuit from three laps", () => {
    const lap = CIRCUIT.centreline.slice(0, -1);
    const trace = [...Array(20).fill(lap[0]), ...lap, ...lap, ...lap, ...Array(20).fill(lap[5])];
    const outline = lapOutline(trace.map((p) => p.lat), trace.map((p) => p.lon))!;
    expect(outline).not.toBeNull();
    expect(outline[0]).toEqual(outline[outline.length - 1]);
    const d = pathDistances(outline);
    // The circuit's length by construction; the loop closes within one 5 m step.
    expect(Math.abs(at(d, d.length - 1) - CIRCUIT.lengthM)).toBeLessThan(10);
  });

  it("gives null for a path that never comes back", () => {
    const lat = Array.from({ length: 500 }, (_, i) => 46 + i * 1e-4);
    const lon = Array.from({ length: 500 }, () => -35);
    expect(lapOutline(lat, lon)).toBeNull();
  });

  it("skips missing fixes", () => {
    const lap = CIRCUIT.centreline;
    const lat = lap.flatMap((p) => [p.lat, NaN]);
    const lon = lap.flatMap((p) => [p.lon, NaN]);
    expect(lapOutline([...lat, ...lat], [...lon, ...lon])).not.toBeNull();
  });
});

describe("pathDistances", () => {
  it("adds up the steps: 0.001° of latitude at 46° N ≈ 111.16 m (WGS-84 meridian arc, geographiclib figure from memory)", () => {
    const d = pathDistances([[46, -35], [46.001, -35], [46.002, -35]]);
    expect(d[0]).toBe(0);
    expect(d[2]).toBeCloseTo(2 * 111.16, 0);
  });
});
