/**
 * The invented demo circuit of sample-logs/circuit.ts as a Track description: gates, corners,
 * pit-lane limit and the centreline outline. Used by the seed and by tests that need the track
 * the sample logs were generated on.
 */
import { CIRCUIT, TRACK_LENGTH_M, toLatLon, trackPointAt } from "../sample-logs/circuit";
import type { TrackInput } from "../lib/data/tracks";

/** Outline spacing, m: fine enough to draw braking points on, ~2 000 points for a 4 km lap. */
const OUTLINE_STEP_M = 2;

const gate = (name: string) => {
  const g = CIRCUIT.gates.find((x) => x.name === name);
  if (!g) throw new Error(`the demo circuit has no ${name} gate`);
  return { a: { lat: g.a.lat, lon: g.a.lon }, b: { lat: g.b.lat, lon: g.b.lon } };
};

/** 1e-7° is ~1 cm: more digits only make the JSON longer. */
const round7 = (x: number) => Math.round(x * 1e7) / 1e7;

export function demoTrackInput(): TrackInput {
  const outline: [number, number][] = [];
  const steps = Math.round(TRACK_LENGTH_M / OUTLINE_STEP_M);
  for (let k = 0; k <= steps; k++) {
    const p = trackPointAt((k * TRACK_LENGTH_M) / steps);
    const ll = toLatLon(p.x, p.y);
    outline.push([round7(ll.lat), round7(ll.lon)]);
  }
  return {
    name: CIRCUIT.name,
    gates: {
      startFinish: gate("start_finish"),
      sectors: [gate("sector_1"), gate("sector_2")],
      pitEntry: gate("pit_entry"),
      pitExit: gate("pit_exit"),
    },
    corners: CIRCUIT.corners.map((c) => ({ name: c.name, distanceM: c.apexDistanceM })),
    outline,
    lengthM: TRACK_LENGTH_M,
    pitSpeedLimitKmh: CIRCUIT.pitLane.speedLimitKmh,
  };
}
