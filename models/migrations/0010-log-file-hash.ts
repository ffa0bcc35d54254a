/**
 * Uploads are found by their content: the same bytes uploaded again are recognised by the
 * SHA-256 kept on log_files. An index on (team_id, sha256) makes that look-up one probe.
 */
import { QueryTypes, type QueryInterface } from "sequelize";

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query("ALTER TABLE log_files ADD INDEX log_files_team_sha256 (team_id, sha256)", { type: QueryTypes.RAW });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query("ALTER TABLE log_files DROP INDEX log_files_team_sha256", { type: QueryTypes.RAW });
}
