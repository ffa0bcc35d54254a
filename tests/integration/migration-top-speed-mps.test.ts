/**
 * Migration 0055 renames speeds from …Ms (which reads as milliseconds) to …Mps on a database that
 * holds data: the lap column top_speed_ms and the speed keys inside the stored JSON keep their
 * values, other keys and rows are left alone, and going down gives back the old names.
 * Runs on a database of its own, migrated step by step on the real MariaDB.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QueryTypes, type Sequelize } from "sequelize";
import { createSequelize, getSequelize } from "@/models/db";
import { migrator } from "@/models/migrate";
import { initModels, Bike } from "@/models";

const dbName = `${process.env.LAPBENCH_DB_NAME}_m55`;
let admin: Sequelize;
let db: Sequelize;

async function one<T extends object>(sql: string): Promise<T> {
  const rows = await db.query<T>(sql, { type: QueryTypes.SELECT });
  if (!rows[0]) throw new Error(`no row: ${sql}`);
  return rows[0];
}
const json = (v: unknown) => (typeof v === "string" ? JSON.parse(v) : v);

beforeAll(async () => {
  admin = createSequelize(process.env.LAPBENCH_DB_NAME!, { pool: 1 });
  await admin.query(`DROP DATABASE IF EXISTS \`${dbName}\``, { type: QueryTypes.RAW });
  await admin.query(`CREATE DATABASE \`${dbName}\``, { type: QueryTypes.RAW });
  db = createSequelize(dbName, { pool: 1 });
  await migrator(db, { quiet: true }).up({ to: "0040-analysis-version" });
  await db.query(`INSERT INTO bikes (id, team_id, name, thresholds) VALUES (1, 't', 'Old bike', '{"gpsJumpMaxSpeedMs": 90, "wheelieDecelMs2": 6.5, "revCeilingRpm": 14000}'), (2, 't', 'Plain bike', NULL)`, { type: QueryTypes.INSERT });
  await db.query(`INSERT INTO tracks (id, team_id, name, thresholds) VALUES (1, 't', 'Old track', '{"pitSpeedLimitMs": 16.6667, "sensorFlatMinSpeedMs": 12}')`, { type: QueryTypes.INSERT });
  await db.query(`INSERT INTO ride_sessions (id, team_id) VALUES (1, 't')`, { type: QueryTypes.INSERT });
  await db.query(
    `INSERT INTO laps (session_id, number, start_time_s, end_time_s, lap_time_ms, top_speed_ms, stats) VALUES
      (1, 1, 0, 90, 90000, 71.25, '{"topSpeedMs": 71.25, "minSpeedMs": 17.5, "speedSource": "wheel", "complete": true}'),
      (1, 2, 90, 181, 91000, NULL, NULL)`,
    { type: QueryTypes.INSERT },
  );
});

afterAll(async () => {
  await db?.close();
  await admin?.query(`DROP DATABASE IF EXISTS \`${dbName}\``, { type: QueryTypes.RAW });
  await admin?.close();
});

describe("migration 0055: speeds named in metres per second", () => {
  it("renames the lap column and the JSON keys, keeping every value", async () => {
    await migrator(db, { quiet: true }).up({ to: "0055-top-speed-mps" });
    const cols = await db.query<{ COLUMN_NAME: string }>(
      `SELECT COLUMN_NAME FROM information_schema.COLUMNS WHERE TABLE_SCHEMA = ? AND TABLE_NAME = 'laps' AND COLUMN_NAME LIKE 'top_speed%'`,
      { replacements: [dbName], type: QueryTypes.SELECT },
    );
    expect(cols.map((c) => c.COLUMN_NAME)).toEqual(["top_speed_mps"]);
    const laps = await db.query<{ number: number; v: number | null; stats: unknown }>("SELECT number, top_speed_mps AS v, stats FROM laps ORDER BY number", { type: QueryTypes.SELECT });
    expect(laps.map((l) => l.v)).toEqual([71.25, null]);
    expect(json(laps[0].stats)).toEqual({ topSpeedMps: 71.25, minSpeedMps: 17.5, speedSource: "wheel", complete: true });
    expect(laps[1].stats).toBeNull();
    const bike = await one<{ thresholds: unknown }>("SELECT thresholds FROM bikes WHERE id = 1");
    expect(json(bike.thresholds)).toEqual({ gpsJumpMaxSpeedMps: 90, wheelieDecelMps2: 6.5, revCeilingRpm: 14000 });
    expect((await one<{ thresholds: unknown }>("SELECT thresholds FROM bikes WHERE id = 2")).thresholds).toBeNull();
    const track = await one<{ thresholds: unknown }>("SELECT thresholds FROM tracks WHERE id = 1");
    expect(json(track.thresholds)).toEqual({ pitSpeedLimitMps: 16.6667, sensorFlatMinSpeedMps: 12 });
  });

  it("going down gives back the old names and values", async () => {
    await migrator(db, { quiet: true }).down({ to: "0055-top-speed-mps" });
    const lap = await one<{ v: number; stats: unknown }>("SELECT top_speed_ms AS v, stats FROM laps WHERE number = 1");
    expect(lap.v).toBe(71.25);
    expect(json(lap.stats)).toEqual({ topSpeedMs: 71.25, minSpeedMs: 17.5, speedSource: "wheel", complete: true });
    expect(json((await one<{ thresholds: unknown }>("SELECT thresholds FROM bikes WHERE id = 1")).thresholds)).toEqual({ gpsJumpMaxSpeedMs: 90, wheelieDecelMs2: 6.5, revCeilingRpm: 14000 });
    await migrator(db, { quiet: true }).up();
  });

  it("the application writes thresholds as a JSON object, the form the migration's key rename works on", async () => {
    initModels();
    const b = await Bike.create({ teamId: "m55", name: "Written bike", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: null, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: { gpsJumpMaxSpeedMps: 80 } });
    try {
      const [row] = await getSequelize().query<{ t: string; has: number }>("SELECT JSON_TYPE(thresholds) AS t, JSON_CONTAINS_PATH(thresholds, 'one', '$.gpsJumpMaxSpeedMps') AS has FROM bikes WHERE id = ?", { replacements: [b.id], type: QueryTypes.SELECT });
      expect(row).toEqual({ t: "OBJECT", has: 1 });
    } finally {
      await b.destroy();
    }
  });
});
