/**
 * The invented sample-log circuit and bike as a team's Track and Bike rows, and one sample file
 * taken through the real upload → mapping → ingest path onto them.
 */
import { ingestNow } from "@/workers/ingest/ingest-now";
import fs from "node:fs";
import path from "node:path";
import { getSequelize } from "@/models/db";
import { initModels, Bike, RideSession, Track, Rider } from "@/models";
import { CIRCUIT } from "@/sample-logs/circuit";
import { confirmMapping } from "@/lib/data/imports";
import type { Mapping } from "@/lib/ingest/mapping";
import type { UploadHarness } from "./ingest-harness";

const gate = (name: string) => {
  const g = CIRCUIT.gates.find((x) => x.name === name)!;
  return { a: g.a, b: g.b };
};

export async function createSampleTrackAndBike(teamId: string) {
  initModels();
  const track = await Track.create({
    teamId,
    name: CIRCUIT.name,
    centerLat: CIRCUIT.origin.lat,
    centerLon: CIRCUIT.origin.lon,
    lengthM: CIRCUIT.lengthM,
    gates: { startFinish: gate("start_finish"), sectors: [gate("sector_1"), gate("sector_2")], pitEntry: gate("pit_entry"), pitExit: gate("pit_exit") },
    corners: CIRCUIT.corners.map((c) => ({ name: c.name, distanceM: c.apexDistanceM })),
    outline: null,
    pitSpeedLimitKmh: CIRCUIT.pitLane.speedLimitKmh,
    thresholds: null,
  });
  // The generator's bike (sample-logs/README.md): ratios, sprockets, circumferences, strokes.
  const bike = await Bike.create({
    teamId,
    name: "Sample 1000",
    className: "Superbike",
    wheelCircFrontMm: 1850,
    wheelCircRearMm: 1960,
    primaryRatio: 1.75,
    gearboxRatios: [2.5, 1.95, 1.63, 1.42, 1.26, 1.13],
    sprocketFront: 16,
    sprocketRear: 40,
    revCeilingRpm: 14200,
    forkStrokeMm: 120,
    shockStrokeMm: 65,
    tyreCrownRadiusMm: 95,
    tyreCrownRadiusFrontMm: 80,
    calibrations: null,
    thresholds: null,
  });
  return { track, bike };
}

/** Upload a sample file as `cookie`, confirm the suggested mapping, attach track/bike/rider, ingest. */
export async function ingestSampleFile(
  up: UploadHarness,
  cookie: string,
  teamId: string,
  file: string,
  link: { trackId: number; bikeId: number; riderId?: number | null; sharedWithRiders?: boolean },
): Promise<number> {
  const body = fs.readFileSync(path.resolve(__dirname, "../../../sample-logs/files", file));
  const { sessionId } = await up.upload(new File([body], file, { type: "text/csv" }), cookie);
  const s = await RideSession.findByPk(sessionId);
  await s!.update({ trackId: link.trackId, bikeId: link.bikeId, riderId: link.riderId ?? null, sharedWithRiders: link.sharedWithRiders ?? false });
  if (s!.status === "mapping") await confirmMapping(getSequelize(), teamId, sessionId, s!.mapping as Mapping, `Profile ${sessionId}`);
  // This session's own job only: other test files may have left jobs in the shared queue.
  const r = await ingestNow(getSequelize(), sessionId, `analysis-test-${process.pid}`);
  if (r !== "ready") throw new Error(`ingest of ${file} failed (${r}): ${(await RideSession.findByPk(sessionId))?.statusReason}`);
  return sessionId;
}

export async function createRider(teamId: string, userId: string | null, name = "Sample Rider") {
  initModels();
  return Rider.create({ teamId, name, raceNumber: "7", userId });
}
