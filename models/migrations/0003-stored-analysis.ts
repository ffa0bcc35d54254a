/**
 * The page analyses computed at ingest (Drive slip, Suspension use, Gears, Rider brief with the
 * default settings), one row per part so a page reads only what it shows: a 30-minute session's
 * slip traces alone are ~0.5 MB, too much to ride along in ride_sessions.summary, which every
 * session list reads. `basis` is a hash of the laps, bike and track settings the part was
 * computed from; a part whose basis no longer matches is recomputed on request instead.
 * LONGTEXT, not JSON: MariaDB's JSON is LONGTEXT plus a json_valid() check we do not need.
 */
import { QueryTypes, type QueryInterface } from "sequelize";

const ENGINE = "ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci";

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query(
    `CREATE TABLE session_analysis_parts (
      session_id INT NOT NULL, part VARCHAR(40) NOT NULL, basis CHAR(40) NOT NULL, data LONGTEXT NOT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      PRIMARY KEY (session_id, part),
      CONSTRAINT session_analysis_parts_session_fk FOREIGN KEY (session_id) REFERENCES ride_sessions(id) ON DELETE CASCADE
    ) ${ENGINE}`,
    { type: QueryTypes.RAW },
  );
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query("DROP TABLE IF EXISTS session_analysis_parts", { type: QueryTypes.RAW });
}
