/**
 * Sequelize 6 with the mariadb 3.x driver: raw queries without a `type` fail with
 * "Cannot delete property 'meta'" (sequelize issue 15701). models/mariadb-raw-query-fix.ts patches
 * the result handling; this proves the problem is still there without the patch and gone with it,
 * so the patch can be dropped the day a driver/Sequelize upgrade makes the first test fail.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QueryTypes, DataTypes, type Sequelize } from "sequelize";
import { createSequelize } from "@/models/db";
import { removeMariadbRawQueryFixForTest } from "@/models/mariadb-raw-query-fix";

let db: Sequelize;
beforeAll(() => {
  db = createSequelize(process.env.LAPBENCH_DB_NAME!, { pool: 2 });
});
afterAll(async () => {
  await db.close();
});

describe("mariadb raw-query fix", () => {
  it("without the fix, a raw query with no type rejects with the driver's non-deletable meta", async () => {
    const restore = removeMariadbRawQueryFixForTest();
    try {
      await expect(db.query("SELECT 1 AS one")).rejects.toThrow(/Cannot delete property 'meta'/);
    } finally {
      restore();
    }
  });

  it("with the fix, the same query returns its rows (and the metadata)", async () => {
    const [rows] = await db.query("SELECT 1 AS one, 'two' AS two");
    expect(rows).toEqual([{ one: 1, two: "two" }]);
  });

  it("with the fix, queryInterface.removeColumn works (migrations use it)", async () => {
    const qi = db.getQueryInterface();
    const table = `raw_fix_scratch_${process.pid}`;
    await qi.dropTable(table);
    await qi.createTable(table, {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      keep: { type: DataTypes.STRING(20) },
      drop_me: { type: DataTypes.STRING(20) },
    });
    try {
      await qi.removeColumn(table, "drop_me");
      const cols = await db.query<{ c: string }>(
        "SELECT COLUMN_NAME c FROM information_schema.COLUMNS WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ? ORDER BY ORDINAL_POSITION",
        { type: QueryTypes.SELECT, replacements: [table] },
      );
      expect(cols.map((c) => c.c)).toEqual(["id", "keep"]);
    } finally {
      await qi.dropTable(table);
    }
  });
});
