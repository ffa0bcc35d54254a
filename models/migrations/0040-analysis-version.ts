/**
 * A counter on each session, raised every time its laps are (re)computed, so caches of per-lap
 * results (Compare's distance arrays) can tell a stale entry from a current one.
 */
import { QueryTypes, type QueryInterface } from "sequelize";

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query("ALTER TABLE ride_sessions ADD COLUMN analysis_version INT UNSIGNED NOT NULL DEFAULT 0", { type: QueryTypes.RAW });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query("ALTER TABLE ride_sessions DROP COLUMN analysis_version", { type: QueryTypes.RAW });
}
