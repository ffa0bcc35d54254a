/**
 * The demo team's history beyond the first test days, so the season record, setup history and
 * engine screens have something to show: a second event at the same invented circuit with two
 * sessions of rider A on Bike 27, generated now by our own sample-log generator (not committed
 * files), a setup change between them (shock rebound two clicks in) and a rider profile with a
 * little more grip in the second, so the change shows a measurable lap-time effect; and an engine
 * past 80 % of its rebuild interval with its rebuild on record. All names are invented.
 * Idempotent: sessions are found by their file name, setup sheets and history rows by content.
 */
import { QueryTypes, type Sequelize } from "sequelize";
import type { UTApi } from "uploadthing/server";
import { Engine, RaceEvent, RideSession, SetupSheet, type Bike, type Rider, type Track } from "../models";
import { confirmMapping, prepareImport, registerUpload } from "../lib/data/imports";
import type { Mapping } from "../lib/ingest/mapping";
import { RIDERS, generateSession } from "../sample-logs/generate-session";
import { toCsvString } from "../sample-logs/write-formats";
import { ingestNow } from "./ingest/ingest-now";

export interface HistoryInput {
  sequelize: Sequelize;
  teamId: string;
  engineerId: string;
  rider: Rider;
  bike: Bike;
  engine: Engine;
  track: Track;
  utapi: UTApi | null;
  say: (line: string) => void;
}

const BASE_SETUP = {
  forkSpringNmm: 10, forkPreloadMm: 5, forkCompressionClicks: 12, forkReboundClicks: 10, forkOilLevelMm: 110, forkHeightMm: 8,
  shockSpringNmm: 95, shockPreloadMm: 12, shockCompressionLowClicks: 14, shockCompressionHighClicks: 2, shockReboundClicks: 12, rideHeightMm: 10,
  tyreFrontCompound: "Medium slick", tyreRearCompound: "Soft slick", tyreFrontColdBar: 2.1, tyreRearColdBar: 1.6,
  sprocketFrontTeeth: 16, sprocketRearTeeth: 40, tractionControlLevel: 4, engineBrakeLevel: 2, engineMap: "A", notes: null,
};

const SUMMER = [
  {
    file: "summer-round-fp1.csv", title: "Summer FP1", startedAt: "2031-07-12T10:00:00.000Z", conditions: "Dry, track 29 °C, 24 °C air",
    rider: { ...RIDERS.a, lateralG: 1.23 }, seed: 31, brakeOnStraightLaps: [2],
    setup: { ...BASE_SETUP, notes: "Rear pumps on the exit of Turn 6; try two clicks more rebound damping next outing." },
  },
  {
    file: "summer-round-fp2.csv", title: "Summer FP2", startedAt: "2031-07-12T14:00:00.000Z", conditions: "Dry, track 33 °C, 26 °C air",
    rider: { ...RIDERS.a, lateralG: 1.28 }, seed: 32, brakeOnStraightLaps: [] as number[],
    setup: { ...BASE_SETUP, shockReboundClicks: 10, notes: "Shock rebound 12 → 10 clicks out (more damping)." },
  },
];

async function sessionOfFile(sequelize: Sequelize, teamId: string, file: string): Promise<number | null> {
  const rows = await sequelize.query<{ id: number }>("SELECT rs.id FROM ride_sessions rs JOIN log_files lf ON lf.id = rs.log_file_id WHERE rs.team_id = ? AND lf.name = ? ORDER BY rs.id LIMIT 1", {
    replacements: [teamId, file],
    type: QueryTypes.SELECT,
  });
  return rows[0]?.id ?? null;
}

export async function seedHistory(h: HistoryInput): Promise<Record<string, number>> {
  const { sequelize, teamId } = h;
  const [event] = await RaceEvent.findOrCreate({ where: { teamId, name: "Summer round" }, defaults: { teamId, name: "Summer round", trackId: h.track.id, startsOn: "2031-07-12", endsOn: "2031-07-13" } });

  // Engine life: the engine of Bike 27 came from its last rebuild with 24 h and 3,900 km on it
  // (invented), which puts it past 80 % of its 30 h interval once the demo sessions are counted.
  const history = await sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM engine_history WHERE engine_id = ?", { replacements: [h.engine.id], type: QueryTypes.SELECT });
  if (Number(history[0]!.n) === 0) {
    await sequelize.query(
      "INSERT INTO engine_history (team_id, engine_id, kind, on_date, from_bike_id, to_bike_id, hours_before, km_before, note, created_by) VALUES (?, ?, 'rebuild', '2031-02-20', NULL, NULL, 29.5, 4820, ?, ?)",
      { replacements: [teamId, h.engine.id, "Winter rebuild: pistons, rings, valve springs (invented)", h.engineerId], type: QueryTypes.INSERT },
    );
    await Engine.update({ hoursAtInstall: 24, kmAtInstall: 3900 }, { where: { id: h.engine.id } });
    h.say(`engine ${h.engine.serial}: rebuild on record, 24 h since`);
  }

  const ids: Record<string, number> = {};
  if (!h.utapi) return ids;
  for (const d of SUMMER) {
    let sessionId = await sessionOfFile(sequelize, teamId, d.file);
    if (sessionId === null) {
      const generated = generateSession({
        seed: d.seed, flyingLaps: 5, rider: d.rider, sampleRateHz: 50, gpsRateHz: 25, startedAt: d.startedAt, brakeOnStraightLaps: d.brakeOnStraightLaps,
        revCeilingLap: null, pitOverspeed: null, sessionKind: "practice",
      });
      const up = await h.utapi.uploadFiles(new File([toCsvString(generated)], d.file, { type: "text/csv" }));
      if (up.error || !up.data) throw new Error(`uploading ${d.file} failed: ${up.error?.message ?? "no data"}`);
      ({ sessionId } = await registerUpload(sequelize, { teamId, userId: h.engineerId, file: { key: up.data.key, name: d.file, size: up.data.size, ufsUrl: up.data.ufsUrl, fileHash: up.data.fileHash } }));
    }
    ids[d.file] = sessionId;
    if (!(await SetupSheet.findOne({ where: { teamId, sessionId } }))) {
      await SetupSheet.create({ teamId, sessionId, bikeId: h.bike.id, version: 1, fields: d.setup, createdBy: h.engineerId });
    }
    let s = (await RideSession.findByPk(sessionId))!;
    if (s.status === "ready") continue;
    await s.update({ title: d.title, kind: "practice", riderId: h.rider.id, bikeId: h.bike.id, engineId: h.engine.id, eventId: event.id, conditions: d.conditions });
    if (s.status === "failed" || s.status === "uploaded") s = await prepareImport(sequelize, sessionId);
    if (s.status === "mapping") await confirmMapping(sequelize, teamId, sessionId, s.mapping as Mapping, "Team logger CSV");
    const outcome = await ingestNow(sequelize, sessionId, "seed");
    h.say(`${d.file}: session ${sessionId} ${outcome === "no-job" ? "is with the ingest worker" : outcome}`);
  }
  return ids;
}
