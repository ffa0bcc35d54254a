/**
 * The Sequelize/MariaDB better-auth adapter against better-auth's own adapter test suites
 * (@better-auth/test-utils: the suites better-auth runs on its shipped adapters), plus a check that
 * the versioned migration builds exactly the tables the adapter expects.
 *
 * The suites change the auth options between tests (custom model names, extra fields and plugins,
 * numeric and uuid ids), so they run in a scratch database whose tables are rebuilt from
 * better-auth's schema for each option set. Production tables come only from the migration.
 */
import { afterAll, describe, expect, it } from "vitest";
import { QueryTypes, type Sequelize } from "sequelize";
import {
  authFlowTestSuite,
  caseInsensitiveTestSuite,
  joinsTestSuite,
  normalTestSuite,
  numberIdTestSuite,
  testAdapter,
  transactionsTestSuite,
  uuidTestSuite,
} from "@better-auth/test-utils/adapter";
import type { BetterAuthOptions } from "better-auth";
import { createSequelize } from "@/models/db";
import { ensureDatabase, dropDatabase } from "@/workers/services/mariadb";
import { AUTH_COLLATION, defineAuthModels, describeAuthTables, sequelizeAdapter } from "@/lib/auth/sequelize-adapter";
import { authOptions } from "@/lib/auth/options";

const scratchName = `${process.env.LAPBENCH_DB_NAME}_adapter`;
dropDatabase(scratchName);
ensureDatabase(scratchName);
const scratch = createSequelize(scratchName, { pool: 5 });

/** Test-only: drop every table of the scratch database and create the ones these options need. */
async function rebuildScratchTables(sequelize: Sequelize, options: BetterAuthOptions) {
  await sequelize.transaction(async (t) => {
    // One connection (the transaction's), so the foreign-key switch applies to the drops.
    const rows = await sequelize.query<{ name: string }>(
      "SELECT TABLE_NAME AS name FROM information_schema.TABLES WHERE TABLE_SCHEMA = DATABASE()",
      { type: QueryTypes.SELECT, transaction: t },
    );
    await sequelize.query("SET FOREIGN_KEY_CHECKS = 0", { type: QueryTypes.RAW, transaction: t });
    for (const { name } of rows) await sequelize.query(`DROP TABLE \`${name}\``, { type: QueryTypes.RAW, transaction: t });
    await sequelize.query("SET FOREIGN_KEY_CHECKS = 1", { type: QueryTypes.RAW, transaction: t });
  });
  const models = defineAuthModels(sequelize, options);
  for (const { table } of describeAuthTables(options)) await models.get(table)!.sync();
}

const { execute } = await testAdapter({
  adapter: () => sequelizeAdapter(scratch, { debugLogs: { isRunningAdapterTests: true } }),
  runMigrations: (options) => rebuildScratchTables(scratch, options),
  prefixTests: "mariadb",
  tests: [
    normalTestSuite(),
    transactionsTestSuite(),
    authFlowTestSuite(),
    numberIdTestSuite(),
    joinsTestSuite(),
    uuidTestSuite(),
    caseInsensitiveTestSuite(),
  ],
});
execute();

// File level, so the scratch database goes even when a filter skips the suites (and their hooks).
afterAll(async () => {
  await scratch.close();
  dropDatabase(scratchName);
});

describe("migration 0001-auth", () => {
  it("creates exactly the tables, columns, keys and references the adapter expects for Lapbench's options", async () => {
    const db = createSequelize(process.env.LAPBENCH_DB_NAME!, { pool: 1 });
    try {
      const expected = describeAuthTables(authOptions);
      const tables = expected.map((t) => t.table);
      const q = <T extends object>(sql: string) => db.query<T>(sql, { type: QueryTypes.SELECT, replacements: { tables } });
      const columns = await q<{ t: string; c: string; type: string; nullable: string; key: string; precision: number | null; collation: string | null; extra: string }>(
        `SELECT TABLE_NAME t, COLUMN_NAME c, DATA_TYPE type, IS_NULLABLE nullable, COLUMN_KEY \`key\`, DATETIME_PRECISION \`precision\`,
           COLLATION_NAME collation, EXTRA extra
         FROM information_schema.COLUMNS WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME IN (:tables)`,
      );
      const indexes = await q<{ t: string; name: string; c: string; seq: number; nonUnique: number }>(
        `SELECT TABLE_NAME t, INDEX_NAME name, COLUMN_NAME c, SEQ_IN_INDEX seq, NON_UNIQUE nonUnique
         FROM information_schema.STATISTICS WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME IN (:tables)`,
      );
      const refs = await q<{ t: string; c: string; refTable: string; refColumn: string; onDelete: string }>(
        `SELECT k.TABLE_NAME t, k.COLUMN_NAME c, k.REFERENCED_TABLE_NAME refTable, k.REFERENCED_COLUMN_NAME refColumn, r.DELETE_RULE onDelete
         FROM information_schema.KEY_COLUMN_USAGE k JOIN information_schema.REFERENTIAL_CONSTRAINTS r
           ON r.CONSTRAINT_SCHEMA = k.CONSTRAINT_SCHEMA AND r.CONSTRAINT_NAME = k.CONSTRAINT_NAME AND r.TABLE_NAME = k.TABLE_NAME
         WHERE k.TABLE_SCHEMA = DATABASE() AND k.TABLE_NAME IN (:tables) AND k.REFERENCED_TABLE_NAME IS NOT NULL`,
      );

      // Every expected table exists, with exactly the expected columns.
      expect(new Set(columns.map((c) => c.t))).toEqual(new Set(tables));
      for (const t of expected) {
        const actual = columns.filter((c) => c.t === t.table);
        expect(actual.map((c) => c.c).sort(), `columns of ${t.table}`).toEqual(t.columns.map((c) => c.name).sort());
        for (const col of t.columns) {
          const a = actual.find((c) => c.c === col.name)!;
          const where = `${t.table}.${col.name}`;
          expect(a.type, where).toBe(col.type);
          expect(a.nullable, where).toBe(col.nullable ? "YES" : "NO");
          if (col.primaryKey) expect(a.key, where).toBe("PRI");
          if (col.type === "datetime") expect(a.precision, where).toBe(3);
          if (col.type === "varchar" || col.type === "text") expect(a.collation, where).toBe(AUTH_COLLATION);
          const single = indexes.filter((i) => i.t === t.table && i.c === col.name && i.seq === 1);
          if (col.unique) expect(single.some((i) => i.nonUnique === 0), `${where} unique`).toBe(true);
          if (col.index) expect(single.length > 0, `${where} indexed`).toBe(true);
          const ref = refs.filter((r) => r.t === t.table && r.c === col.name);
          if (col.references) expect(ref, `${where} reference`).toEqual([{ ...ref[0], refTable: col.references.table, refColumn: col.references.column, onDelete: col.references.onDelete }]);
          else expect(ref, `${where} has no reference`).toEqual([]);
        }
      }
      // The organization plugin's tables came along with the options.
      expect(tables).toEqual(expect.arrayContaining(["user", "session", "account", "verification", "organization", "member", "invitation", "rateLimit"]));
    } finally {
      await db.close();
    }
  });
});
