/**
 * Sequelize models of Lapbench's own tables (schema: models/migrations/0002-domain.ts).
 * Only lib/data/ and workers/ import these; UI code gets plain objects from lib/data/.
 */
import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional, type Sequelize } from "sequelize";
import { getSequelize } from "./db";

export type SessionKind = "practice" | "qualifying" | "race" | "test";
export type SessionStatus = "uploaded" | "mapping" | "queued" | "parsing" | "ready" | "failed";

export class Rider extends Model<InferAttributes<Rider>, InferCreationAttributes<Rider>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare name: string;
  declare raceNumber: string | null;
  declare userId: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Bike extends Model<InferAttributes<Bike>, InferCreationAttributes<Bike>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare name: string;
  declare className: string | null;
  declare wheelCircFrontMm: number | null;
  declare wheelCircRearMm: number | null;
  declare primaryRatio: number | null;
  declare gearboxRatios: number[] | null;
  declare sprocketFront: number | null;
  declare sprocketRear: number | null;
  declare revCeilingRpm: number | null;
  declare forkStrokeMm: number | null;
  declare shockStrokeMm: number | null;
  /** Rear tyre crown radius (mm). */
  declare tyreCrownRadiusMm: number | null;
  declare tyreCrownRadiusFrontMm: CreationOptional<number | null>;
  declare calibrations: Record<string, unknown> | null;
  declare thresholds: Record<string, number> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Engine extends Model<InferAttributes<Engine>, InferCreationAttributes<Engine>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare bikeId: number | null;
  declare serial: string;
  declare rebuildIntervalH: number | null;
  declare rebuildIntervalKm: number | null;
  declare hoursAtInstall: CreationOptional<number>;
  declare kmAtInstall: CreationOptional<number>;
  declare notes: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

// The JSON shapes of a track's gates and corners live with the geometry types, so the browser-side
// gate editor can use them without importing the database models.
import type { TrackGates, TrackCorner } from "../lib/geo/stored-track";
export type { GatePoint, Gate, TrackGates, TrackCorner } from "../lib/geo/stored-track";

export class Track extends Model<InferAttributes<Track>, InferCreationAttributes<Track>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare name: string;
  declare centerLat: number | null;
  declare centerLon: number | null;
  declare lengthM: number | null;
  declare gates: TrackGates | null;
  declare corners: TrackCorner[] | null;
  declare outline: [number, number][] | null;
  declare pitSpeedLimitKmh: number | null;
  /** IANA time zone (e.g. "Europe/Madrid"): start times written without a zone are read in it. */
  declare timeZone: CreationOptional<string | null>;
  declare thresholds: Record<string, number> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class RaceEvent extends Model<InferAttributes<RaceEvent>, InferCreationAttributes<RaceEvent>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare trackId: number | null;
  declare name: string;
  declare startsOn: string | null;
  declare endsOn: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class LogFile extends Model<InferAttributes<LogFile>, InferCreationAttributes<LogFile>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare uploadKey: string;
  declare name: string;
  declare bytes: number;
  declare sha256: string | null;
  declare contentType: string | null;
  declare url: string | null;
  declare uploadedBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class ImportProfile extends Model<InferAttributes<ImportProfile>, InferCreationAttributes<ImportProfile>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare name: string;
  declare headerSignature: string;
  declare format: CreationOptional<string>;
  declare mapping: unknown;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class RideSession extends Model<InferAttributes<RideSession>, InferCreationAttributes<RideSession>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare eventId: number | null;
  declare bikeId: number | null;
  declare engineId: number | null;
  declare riderId: number | null;
  declare trackId: number | null;
  declare logFileId: number | null;
  declare importProfileId: number | null;
  declare kind: CreationOptional<SessionKind>;
  declare title: string | null;
  declare startedAt: Date | null;
  declare conditions: string | null;
  declare status: CreationOptional<SessionStatus>;
  declare statusReason: string | null;
  declare progress: CreationOptional<number>;
  declare sharedWithRiders: CreationOptional<boolean>;
  declare mapping: unknown;
  declare summary: unknown;
  declare durationS: number | null;
  declare createdBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Channel extends Model<InferAttributes<Channel>, InferCreationAttributes<Channel>> {
  declare id: CreationOptional<number>;
  declare sessionId: number;
  declare name: string;
  declare role: string;
  declare unit: string;
  declare sourceColumn: string | null;
  declare sampleCount: CreationOptional<number>;
  declare rateHz: number | null;
  declare minValue: number | null;
  declare maxValue: number | null;
  declare valueType: CreationOptional<"f32" | "f64">;
  declare chunkSize: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Lap extends Model<InferAttributes<Lap>, InferCreationAttributes<Lap>> {
  declare id: CreationOptional<number>;
  declare sessionId: number;
  declare number: number;
  declare startTimeS: number;
  declare endTimeS: number;
  declare lapTimeMs: number;
  declare distanceM: number | null;
  declare isOutLap: CreationOptional<boolean>;
  declare isInLap: CreationOptional<boolean>;
  declare isInvalid: CreationOptional<boolean>;
  declare pitPass: CreationOptional<boolean>;
  declare sectorTimesMs: number[] | null;
  declare topSpeedMps: number | null;
  declare stats: unknown;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Finding extends Model<InferAttributes<Finding>, InferCreationAttributes<Finding>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare sessionId: number;
  declare kind: string;
  declare lapNumber: number | null;
  declare startTimeS: number | null;
  declare endTimeS: number | null;
  declare distanceM: number | null;
  declare lat: number | null;
  declare lon: number | null;
  declare severity: CreationOptional<"info" | "warning" | "critical">;
  declare measuredValue: number | null;
  declare thresholdValue: number | null;
  declare unit: string | null;
  declare message: string;
  declare acknowledgedBy: string | null;
  declare acknowledgedAt: Date | null;
  declare note: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class SetupSheet extends Model<InferAttributes<SetupSheet>, InferCreationAttributes<SetupSheet>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare sessionId: number | null;
  declare bikeId: number | null;
  declare version: CreationOptional<number>;
  declare fields: Record<string, unknown>;
  declare createdBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Note extends Model<InferAttributes<Note>, InferCreationAttributes<Note>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare sessionId: number;
  declare lapNumber: number | null;
  declare authorId: string;
  declare text: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Job extends Model<InferAttributes<Job>, InferCreationAttributes<Job>> {
  declare id: CreationOptional<number>;
  declare kind: CreationOptional<string>;
  declare sessionId: number | null;
  declare state: CreationOptional<"queued" | "running" | "done" | "failed">;
  declare attempts: CreationOptional<number>;
  declare maxAttempts: CreationOptional<number>;
  declare lockedBy: string | null;
  declare lockedAt: Date | null;
  declare heartbeatAt: Date | null;
  declare runAfter: CreationOptional<Date>;
  declare error: string | null;
  declare payload: unknown;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

// Sequelize writes into attribute definitions (field names), so each use needs a fresh object:
// these are getters, not shared constants.
const defs = {
  get id() { return { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true }; },
  get teamId() { return { type: DataTypes.STRING(64), allowNull: false }; },
  get ts() { return { createdAt: DataTypes.DATE(3), updatedAt: DataTypes.DATE(3) }; },
  get dbl() { return { type: DataTypes.DOUBLE, allowNull: true }; },
  get intN() { return { type: DataTypes.INTEGER, allowNull: true }; },
  get json() { return { type: DataTypes.JSON, allowNull: true }; },
  get bool() { return { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false }; },
};

let initialised: Sequelize | undefined;

/** Register the models on a connection (once per connection). */
export function initModels(sequelize: Sequelize = getSequelize()): Sequelize {
  if (initialised === sequelize) return sequelize;
  const opts = (tableName: string) => ({ sequelize, tableName, underscored: true, timestamps: true });
  Rider.init({ id: defs.id, teamId: defs.teamId, name: DataTypes.STRING(120), raceNumber: DataTypes.STRING(8), userId: DataTypes.STRING(64), ...defs.ts }, opts("riders"));
  Bike.init(
    {
      id: defs.id, teamId: defs.teamId, name: DataTypes.STRING(120), className: DataTypes.STRING(80), wheelCircFrontMm: defs.dbl, wheelCircRearMm: defs.dbl,
      primaryRatio: defs.dbl, gearboxRatios: defs.json, sprocketFront: defs.intN, sprocketRear: defs.intN, revCeilingRpm: defs.dbl, forkStrokeMm: defs.dbl,
      shockStrokeMm: defs.dbl, tyreCrownRadiusMm: defs.dbl, tyreCrownRadiusFrontMm: defs.dbl, calibrations: defs.json, thresholds: defs.json, ...defs.ts,
    },
    opts("bikes"),
  );
  Engine.init(
    {
      id: defs.id, teamId: defs.teamId, bikeId: defs.intN, serial: DataTypes.STRING(80), rebuildIntervalH: defs.dbl, rebuildIntervalKm: defs.dbl,
      hoursAtInstall: { type: DataTypes.DOUBLE, defaultValue: 0 }, kmAtInstall: { type: DataTypes.DOUBLE, defaultValue: 0 },
      notes: DataTypes.TEXT, ...defs.ts,
    },
    opts("engines"),
  );
  Track.init(
    {
      id: defs.id, teamId: defs.teamId, name: DataTypes.STRING(120), centerLat: defs.dbl, centerLon: defs.dbl, lengthM: defs.dbl, gates: defs.json, corners: defs.json,
      outline: defs.json, pitSpeedLimitKmh: defs.dbl, timeZone: { type: DataTypes.STRING(64), allowNull: true }, thresholds: defs.json, ...defs.ts,
    },
    opts("tracks"),
  );
  RaceEvent.init({ id: defs.id, teamId: defs.teamId, trackId: defs.intN, name: DataTypes.STRING(160), startsOn: DataTypes.DATEONLY, endsOn: DataTypes.DATEONLY, ...defs.ts }, opts("events"));
  LogFile.init(
    {
      id: defs.id, teamId: defs.teamId, uploadKey: DataTypes.STRING(191), name: DataTypes.STRING(255), bytes: DataTypes.BIGINT, sha256: DataTypes.CHAR(64),
      contentType: DataTypes.STRING(120), url: DataTypes.STRING(1024), uploadedBy: DataTypes.STRING(64), ...defs.ts,
    },
    opts("log_files"),
  );
  ImportProfile.init(
    { id: defs.id, teamId: defs.teamId, name: DataTypes.STRING(160), headerSignature: DataTypes.CHAR(64), format: { type: DataTypes.STRING(16), defaultValue: "csv" }, mapping: { type: DataTypes.JSON, allowNull: false }, ...defs.ts },
    opts("import_profiles"),
  );
  RideSession.init(
    {
      id: defs.id, teamId: defs.teamId, eventId: defs.intN, bikeId: defs.intN, engineId: defs.intN, riderId: defs.intN, trackId: defs.intN, logFileId: defs.intN, importProfileId: defs.intN,
      kind: { type: DataTypes.ENUM("practice", "qualifying", "race", "test"), defaultValue: "practice" },
      title: DataTypes.STRING(160), startedAt: DataTypes.DATE(3), conditions: DataTypes.STRING(255),
      status: { type: DataTypes.ENUM("uploaded", "mapping", "queued", "parsing", "ready", "failed"), defaultValue: "uploaded" },
      statusReason: DataTypes.TEXT, progress: { type: DataTypes.INTEGER, defaultValue: 0 }, sharedWithRiders: defs.bool,
      mapping: defs.json, summary: defs.json, durationS: defs.dbl, createdBy: DataTypes.STRING(64), ...defs.ts,
    },
    opts("ride_sessions"),
  );
  Channel.init(
    {
      id: defs.id, sessionId: { type: DataTypes.INTEGER, allowNull: false }, name: DataTypes.STRING(160), role: DataTypes.STRING(32),
      unit: DataTypes.STRING(24), sourceColumn: DataTypes.STRING(255), sampleCount: { type: DataTypes.INTEGER, defaultValue: 0 },
      rateHz: defs.dbl, minValue: defs.dbl, maxValue: defs.dbl, valueType: { type: DataTypes.ENUM("f32", "f64"), defaultValue: "f32" },
      chunkSize: { type: DataTypes.INTEGER, defaultValue: 10000 }, ...defs.ts,
    },
    opts("channels"),
  );
  Lap.init(
    {
      id: defs.id, sessionId: { type: DataTypes.INTEGER, allowNull: false }, number: DataTypes.INTEGER, startTimeS: DataTypes.DOUBLE,
      endTimeS: DataTypes.DOUBLE, lapTimeMs: DataTypes.INTEGER, distanceM: defs.dbl, isOutLap: defs.bool, isInLap: defs.bool, isInvalid: defs.bool,
      pitPass: defs.bool, sectorTimesMs: defs.json, topSpeedMps: defs.dbl, stats: defs.json, ...defs.ts,
    },
    opts("laps"),
  );
  Finding.init(
    {
      id: defs.id, teamId: defs.teamId, sessionId: { type: DataTypes.INTEGER, allowNull: false }, kind: DataTypes.STRING(40), lapNumber: defs.intN,
      startTimeS: defs.dbl, endTimeS: defs.dbl, distanceM: defs.dbl, lat: defs.dbl, lon: defs.dbl,
      severity: { type: DataTypes.ENUM("info", "warning", "critical"), defaultValue: "warning" },
      measuredValue: defs.dbl, thresholdValue: defs.dbl, unit: DataTypes.STRING(24), message: { type: DataTypes.TEXT, allowNull: false },
      acknowledgedBy: DataTypes.STRING(64), acknowledgedAt: DataTypes.DATE(3), note: DataTypes.TEXT, ...defs.ts,
    },
    opts("findings"),
  );
  SetupSheet.init(
    { id: defs.id, teamId: defs.teamId, sessionId: defs.intN, bikeId: defs.intN, version: { type: DataTypes.INTEGER, defaultValue: 1 }, fields: { type: DataTypes.JSON, allowNull: false }, createdBy: DataTypes.STRING(64), ...defs.ts },
    opts("setup_sheets"),
  );
  Note.init({ id: defs.id, teamId: defs.teamId, sessionId: { type: DataTypes.INTEGER, allowNull: false }, lapNumber: defs.intN, authorId: DataTypes.STRING(64), text: DataTypes.TEXT, ...defs.ts }, opts("notes"));
  Job.init(
    {
      id: defs.id, kind: { type: DataTypes.STRING(32), defaultValue: "ingest" }, sessionId: defs.intN,
      state: { type: DataTypes.ENUM("queued", "running", "done", "failed"), defaultValue: "queued" },
      attempts: { type: DataTypes.INTEGER, defaultValue: 0 }, maxAttempts: { type: DataTypes.INTEGER, defaultValue: 3 },
      lockedBy: DataTypes.STRING(120), lockedAt: DataTypes.DATE(3), heartbeatAt: DataTypes.DATE(3),
      runAfter: DataTypes.DATE(3), error: DataTypes.TEXT, payload: defs.json, ...defs.ts,
    },
    opts("jobs"),
  );
  initialised = sequelize;
  return sequelize;
}
