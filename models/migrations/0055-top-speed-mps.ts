/**
 * Speeds in metres per second are named …Mps (a name ending in Ms reads as milliseconds, as in
 * lap_time_ms beside it). Renames the lap column top_speed_ms to top_speed_mps, keeping its values,
 * and the same names inside the JSON the application stores: the per-bike and per-track threshold
 * overrides, and the speed figures in each lap's stats.
 */
import { QueryTypes, type QueryInterface } from "sequelize";

/** Old key → new key, per JSON column. */
export const RENAMED_KEYS: { table: string; column: string; keys: [string, string][] }[] = [
  ...["bikes", "tracks"].map((table) => ({
    table,
    column: "thresholds",
    keys: [
      ["brakeOnStraightMinSpeedMs", "brakeOnStraightMinSpeedMps"],
      ["pitSpeedLimitMs", "pitSpeedLimitMps"],
      ["sensorFlatMinSpeedMs", "sensorFlatMinSpeedMps"],
      ["gpsMovingSpeedMs", "gpsMovingSpeedMps"],
      ["gpsJumpMaxSpeedMs", "gpsJumpMaxSpeedMps"],
      ["wheelieDecelMs2", "wheelieDecelMps2"],
    ] as [string, string][],
  })),
  {
    table: "laps",
    column: "stats",
    keys: [
      ["topSpeedMs", "topSpeedMps"],
      ["minSpeedMs", "minSpeedMps"],
    ],
  },
];

async function renameKeys(qi: QueryInterface, back: boolean): Promise<void> {
  for (const { table, column, keys } of RENAMED_KEYS) {
    for (const [oldKey, newKey] of keys) {
      const [from, to] = back ? [newKey, oldKey] : [oldKey, newKey];
      // JSON_INSERT leaves a key already there alone; the old key goes either way.
      await qi.sequelize.query(
        `UPDATE ${table} SET ${column} = JSON_REMOVE(JSON_INSERT(${column}, '$.${to}', JSON_EXTRACT(${column}, '$.${from}')), '$.${from}')
          WHERE ${column} IS NOT NULL AND JSON_VALID(${column}) AND JSON_CONTAINS_PATH(${column}, 'one', '$.${from}')`,
        { type: QueryTypes.UPDATE },
      );
    }
  }
}

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query("ALTER TABLE laps RENAME COLUMN top_speed_ms TO top_speed_mps", { type: QueryTypes.RAW });
  await renameKeys(qi, false);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await renameKeys(qi, true);
  await qi.sequelize.query("ALTER TABLE laps RENAME COLUMN top_speed_mps TO top_speed_ms", { type: QueryTypes.RAW });
}
