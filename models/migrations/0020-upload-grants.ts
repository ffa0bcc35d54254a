/**
 * Upload grants: who may complete an upload, recorded when the app hands out the presigned URL.
 * The completion callback carries only the grant's random id; team and user come from this row,
 * and a grant completes one file once.
 */
import { QueryTypes, type QueryInterface } from "sequelize";

const ENGINE = "ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci";

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query(
    `CREATE TABLE upload_grants (
      id CHAR(43) CHARACTER SET ascii COLLATE ascii_bin NOT NULL,
      team_id VARCHAR(255) NOT NULL, user_id VARCHAR(255) NOT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      expires_at DATETIME(3) NOT NULL,
      used_at DATETIME(3) NULL, file_key VARCHAR(128) NULL,
      PRIMARY KEY (id), KEY upload_grants_expires (expires_at)
    ) ${ENGINE}`,
    { type: QueryTypes.RAW },
  );
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query("DROP TABLE IF EXISTS upload_grants", { type: QueryTypes.RAW });
}
