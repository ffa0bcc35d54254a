/**
 * Start/finish gate suggestions against the invented demo circuit, whose layout is known by
 * construction (sample-logs/circuit.ts): the main straight runs 520 m before the start/finish line
 * and 380 m after it, so its middle lies 70 m before the line; Turn 7 is a 300 m-radius kink
 * between a 700 m and a 150 m straight and must not count as straight. Positions come from the
 * generator's own 10 Hz GPS with 0.3 m noise, pit lane and standstills included. Geometry only:
 * distances on the local plane (lib/geo/to-local-metres, checked against Vincenty elsewhere).
 */
import { describe, it, expect } from "vitest";
import { longestStraightGate } from "@/lib/geo/longest-straight-gate";
import { beaconGate } from "@/lib/geo/beacon-gate";
import { lapOutline } from "@/lib/geo/lap-outline";
import { detectLaps } from "@/lib/laps/detect-laps";
import { CIRCUIT, TRACK_LENGTH_M, toLocal, trackPointAt } from "@/sample-logs/circuit";
import { generateSession } from "@/sample-logs/generate-session";
import { at } from "../../fixtures/at";

const session = generateSession({ seed: 7, flyingLaps: 3, sampleRateHz: 50, gpsRateHz: 10 });
const lat = session.channels.find((c) => c.role === "gps_lat")!.data;
const lon = session.channels.find((c) => c.role === "gps_lon")!.data;

function offTrackPoint(p: { lat: number; lon: number }, sM: number): number {
  const q = toLocal(p);
  const c = trackPointAt(sM);
  return Math.hypot(q.x - c.x, q.y - c.y);
}

describe("longestStraightGate", () => {
  it("puts the gate in the middle of the 900 m main straight, not on the straights joined by the 300 m kink", () => {
    const outline = lapOutline(lat, lon)!;
    const g = longestStraightGate(outline)!;
    expect(g).not.toBeNull();
    // By construction: 520 m + 380 m with the line between them (the corners' transitions shave a little off).
    expect(g.straightM).toBeGreaterThan(800);
    expect(g.straightM).toBeLessThan(960);
    // Middle of the straight: 70 m before the start/finish line, within 25 m (half a GPS-noise-smoothed window).
    expect(offTrackPoint(g.at, TRACK_LENGTH_M - 70)).toBeLessThan(25);
  });

  it("splits the session into the generator's laps: same count, flying lap times within 0.1 s of the truth", () => {
    const g = longestStraightGate(lapOutline(lat, lon)!)!;
    const laps = detectLaps({ timeS: session.timeS, channels: { gps_lat: lat, gps_lon: lon } }, { startFinish: g.gate, sectors: [] });
    const truthFlying = session.truth.laps.filter((l) => l.kind === "flying");
    const flying = laps.filter((l) => !l.outLap && !l.inLap);
    expect(flying.length).toBe(truthFlying.length);
    // A line 70 m before the true one shifts each lap's ends by the time over those 70 m on two
    // consecutive laps; the generator's laps differ little there (ground truth: its lap times).
    flying.forEach((l, k) => expect(Math.abs(l.lapTimeMs - at(truthFlying, k).lapTimeMs)).toBeLessThan(100));
  });

  it("works on sparse points too: every third outline point (~9 m apart, as 10 Hz fixes at speed)", () => {
    const sparse = lapOutline(lat, lon)!.filter((_, i) => i % 3 === 0);
    sparse.push(at(sparse, 0));
    const g = longestStraightGate(sparse)!;
    expect(g).not.toBeNull();
    expect(offTrackPoint(g.at, TRACK_LENGTH_M - 70)).toBeLessThan(30);
  });

  it("finds no straight on a circle of 150 m radius", () => {
    const pts: [number, number][] = Array.from({ length: 400 }, (_, i) => {
      const a = (2 * Math.PI * i) / 400;
      return [46 + (150 * Math.sin(a)) / 111_160, -35 + (150 * Math.cos(a)) / 77_400] as [number, number];
    });
    pts.push(at(pts, 0));
    expect(longestStraightGate(pts)).toBeNull();
  });
});

describe("beaconGate", () => {
  it("puts the gate where the beacon fires: on the start/finish line within 10 m", () => {
    // A beacon beside the line pulses for 0.1 s each time a lap starts (the generator's truth).
    const beacon = new Float32Array(session.timeS.length);
    for (const lap of session.truth.laps.slice(1)) {
      for (let i = 0; i < session.timeS.length; i++) if (at(session.timeS, i) >= lap.startS && at(session.timeS, i) < lap.startS + 0.1) beacon[i] = 1;
    }
    const g = beaconGate(session.timeS, beacon, lat, lon)!;
    expect(g).not.toBeNull();
    expect(g.pulses).toBeGreaterThanOrEqual(3);
    // 0.1 s at up to 80 m/s between a pulse and the nearest 10 Hz fix: within 10 m of the line.
    expect(offTrackPoint(g.at, 0)).toBeLessThan(10);
  });

  it("needs two pulses with positions", () => {
    const beacon = new Float32Array(session.timeS.length);
    beacon[1000] = 1;
    expect(beaconGate(session.timeS, beacon, lat, lon)).toBeNull();
  });
});

it("the demo circuit's length by construction is what the outline measures (sanity for the fixtures above)", () => {
  expect(CIRCUIT.lengthM).toBeCloseTo(TRACK_LENGTH_M, 3);
});
