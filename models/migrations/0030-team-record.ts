/**
 * The team's record beyond one session: an activity log (who changed what, when), each user's
 * e-mail choices, what was mailed (so a re-import does not mail twice), and an engine's dated
 * history (moves between bikes, rebuilds). Plain DDL, named indexes, like 0002.
 * The activity log keeps no foreign key to the things it names: a deletion is itself logged and
 * the entry must outlive the row.
 */
import { QueryTypes, type QueryInterface } from "sequelize";

const ENGINE = "ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci";

export const tables: Record<string, string> = {
  activity_log: `id INT AUTO_INCREMENT PRIMARY KEY, team_id VARCHAR(64) NOT NULL, actor_id VARCHAR(64) NULL,
    action VARCHAR(60) NOT NULL, subject_type VARCHAR(40) NOT NULL, subject_id VARCHAR(64) NULL,
    session_id INT NULL, summary VARCHAR(1000) NOT NULL, created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    KEY activity_log_team (team_id, created_at), KEY activity_log_session (session_id, created_at)`,
  mail_preferences: `user_id VARCHAR(64) NOT NULL PRIMARY KEY, session_ready TINYINT(1) NOT NULL DEFAULT 1,
    event_report TINYINT(1) NOT NULL DEFAULT 1,
    updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3)`,
  mail_sent: `id INT AUTO_INCREMENT PRIMARY KEY, kind VARCHAR(32) NOT NULL, ref_id INT NOT NULL, user_id VARCHAR(64) NOT NULL,
    created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), UNIQUE KEY mail_sent_once (kind, ref_id, user_id)`,
  engine_history: `id INT AUTO_INCREMENT PRIMARY KEY, team_id VARCHAR(64) NOT NULL, engine_id INT NOT NULL,
    kind ENUM('move','rebuild') NOT NULL, on_date DATE NOT NULL, from_bike_id INT NULL, to_bike_id INT NULL,
    hours_before DOUBLE NULL, km_before DOUBLE NULL, note VARCHAR(500) NULL, created_by VARCHAR(64) NULL,
    created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    KEY engine_history_engine (engine_id, on_date),
    CONSTRAINT engine_history_engine_fk FOREIGN KEY (engine_id) REFERENCES engines(id) ON DELETE CASCADE`,
};

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const [name, body] of Object.entries(tables)) {
    await qi.sequelize.query(`CREATE TABLE ${name} (${body}) ${ENGINE}`, { type: QueryTypes.RAW });
  }
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const name of Object.keys(tables).reverse()) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${name}`, { type: QueryTypes.RAW });
  }
}
