/**
 * Lapbench's own tables (the auth and team tables come from 0001). Plain DDL so every index has a
 * name and every numeric column the type it needs (DOUBLE, never FLOAT: FLOAT comes back rounded).
 * Team ids are better-auth organization ids (strings).
 */
import { QueryTypes, type QueryInterface } from "sequelize";

const TEAM = "team_id VARCHAR(64) NOT NULL";
const TS = "created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), updated_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3)";
const ENGINE = "ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci";

export const tables: Record<string, string> = {
  riders: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, name VARCHAR(120) NOT NULL, race_number VARCHAR(8) NULL,
    user_id VARCHAR(64) NULL, ${TS},
    KEY riders_team (team_id), KEY riders_user (user_id)`,
  bikes: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, name VARCHAR(120) NOT NULL, class_name VARCHAR(80) NULL,
    wheel_circ_front_mm DOUBLE NULL, wheel_circ_rear_mm DOUBLE NULL, primary_ratio DOUBLE NULL,
    gearbox_ratios JSON NULL, sprocket_front INT NULL, sprocket_rear INT NULL, rev_ceiling_rpm DOUBLE NULL,
    fork_stroke_mm DOUBLE NULL, shock_stroke_mm DOUBLE NULL, tyre_crown_radius_mm DOUBLE NULL,
    calibrations JSON NULL, thresholds JSON NULL, ${TS}, KEY bikes_team (team_id)`,
  engines: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, bike_id INT NULL, serial VARCHAR(80) NOT NULL,
    rebuild_interval_h DOUBLE NULL, rebuild_interval_km DOUBLE NULL, hours_at_install DOUBLE NOT NULL DEFAULT 0,
    km_at_install DOUBLE NOT NULL DEFAULT 0, notes TEXT NULL, ${TS},
    KEY engines_team (team_id), UNIQUE KEY engines_team_serial (team_id, serial),
    CONSTRAINT engines_bike_fk FOREIGN KEY (bike_id) REFERENCES bikes(id) ON DELETE SET NULL`,
  tracks: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, name VARCHAR(120) NOT NULL, center_lat DOUBLE NULL,
    center_lon DOUBLE NULL, length_m DOUBLE NULL, gates JSON NULL, corners JSON NULL, outline JSON NULL,
    pit_speed_limit_kmh DOUBLE NULL, thresholds JSON NULL, ${TS}, KEY tracks_team (team_id)`,
  events: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, track_id INT NULL, name VARCHAR(160) NOT NULL,
    starts_on DATE NULL, ends_on DATE NULL, ${TS}, KEY events_team (team_id),
    CONSTRAINT events_track_fk FOREIGN KEY (track_id) REFERENCES tracks(id) ON DELETE SET NULL`,
  log_files: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, upload_key VARCHAR(191) NOT NULL, name VARCHAR(255) NOT NULL,
    bytes BIGINT NOT NULL, sha256 CHAR(64) NULL, content_type VARCHAR(120) NULL, url VARCHAR(1024) NULL,
    uploaded_by VARCHAR(64) NULL, ${TS}, KEY log_files_team (team_id), UNIQUE KEY log_files_key (upload_key)`,
  import_profiles: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, name VARCHAR(160) NOT NULL,
    header_signature CHAR(64) NOT NULL, format VARCHAR(16) NOT NULL DEFAULT 'csv', mapping JSON NOT NULL, ${TS},
    KEY import_profiles_team (team_id), UNIQUE KEY import_profiles_team_sig (team_id, header_signature)`,
  ride_sessions: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, event_id INT NULL, bike_id INT NULL, engine_id INT NULL,
    rider_id INT NULL, track_id INT NULL, log_file_id INT NULL, import_profile_id INT NULL,
    kind ENUM('practice','qualifying','race','test') NOT NULL DEFAULT 'practice', title VARCHAR(160) NULL,
    started_at DATETIME(3) NULL, conditions VARCHAR(255) NULL,
    status ENUM('uploaded','mapping','queued','parsing','ready','failed') NOT NULL DEFAULT 'uploaded',
    status_reason TEXT NULL, progress INT NOT NULL DEFAULT 0, shared_with_riders TINYINT(1) NOT NULL DEFAULT 0,
    mapping JSON NULL, summary JSON NULL, duration_s DOUBLE NULL, created_by VARCHAR(64) NULL, ${TS},
    KEY ride_sessions_team (team_id, created_at), KEY ride_sessions_rider (rider_id),
    CONSTRAINT ride_sessions_event_fk FOREIGN KEY (event_id) REFERENCES events(id) ON DELETE SET NULL,
    CONSTRAINT ride_sessions_bike_fk FOREIGN KEY (bike_id) REFERENCES bikes(id) ON DELETE SET NULL,
    CONSTRAINT ride_sessions_engine_fk FOREIGN KEY (engine_id) REFERENCES engines(id) ON DELETE SET NULL,
    CONSTRAINT ride_sessions_rider_fk FOREIGN KEY (rider_id) REFERENCES riders(id) ON DELETE SET NULL,
    CONSTRAINT ride_sessions_track_fk FOREIGN KEY (track_id) REFERENCES tracks(id) ON DELETE SET NULL,
    CONSTRAINT ride_sessions_log_fk FOREIGN KEY (log_file_id) REFERENCES log_files(id) ON DELETE SET NULL,
    CONSTRAINT ride_sessions_profile_fk FOREIGN KEY (import_profile_id) REFERENCES import_profiles(id) ON DELETE SET NULL`,
  channels: `id INT AUTO_INCREMENT PRIMARY KEY, session_id INT NOT NULL, name VARCHAR(160) NOT NULL,
    role VARCHAR(32) NOT NULL, unit VARCHAR(24) NOT NULL, source_column VARCHAR(255) NULL,
    sample_count INT NOT NULL DEFAULT 0, rate_hz DOUBLE NULL, min_value DOUBLE NULL, max_value DOUBLE NULL,
    value_type ENUM('f32','f64') NOT NULL DEFAULT 'f32', chunk_size INT NOT NULL DEFAULT 10000, ${TS},
    KEY channels_session (session_id),
    CONSTRAINT channels_session_fk FOREIGN KEY (session_id) REFERENCES ride_sessions(id) ON DELETE CASCADE`,
  channel_chunks: `channel_id INT NOT NULL, chunk_index INT NOT NULL, sample_count INT NOT NULL, data LONGBLOB NOT NULL,
    PRIMARY KEY (channel_id, chunk_index),
    CONSTRAINT channel_chunks_channel_fk FOREIGN KEY (channel_id) REFERENCES channels(id) ON DELETE CASCADE`,
  laps: `id INT AUTO_INCREMENT PRIMARY KEY, session_id INT NOT NULL, number INT NOT NULL,
    start_time_s DOUBLE NOT NULL, end_time_s DOUBLE NOT NULL, lap_time_ms INT NOT NULL, distance_m DOUBLE NULL,
    is_out_lap TINYINT(1) NOT NULL DEFAULT 0, is_in_lap TINYINT(1) NOT NULL DEFAULT 0,
    is_invalid TINYINT(1) NOT NULL DEFAULT 0, pit_pass TINYINT(1) NOT NULL DEFAULT 0,
    sector_times_ms JSON NULL, top_speed_ms DOUBLE NULL, stats JSON NULL, ${TS},
    UNIQUE KEY laps_session_number (session_id, number),
    CONSTRAINT laps_session_fk FOREIGN KEY (session_id) REFERENCES ride_sessions(id) ON DELETE CASCADE`,
  findings: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, session_id INT NOT NULL, kind VARCHAR(40) NOT NULL,
    lap_number INT NULL, start_time_s DOUBLE NULL, end_time_s DOUBLE NULL, distance_m DOUBLE NULL,
    lat DOUBLE NULL, lon DOUBLE NULL, severity ENUM('info','warning','critical') NOT NULL DEFAULT 'warning',
    measured_value DOUBLE NULL, threshold_value DOUBLE NULL, unit VARCHAR(24) NULL, message TEXT NOT NULL,
    acknowledged_by VARCHAR(64) NULL, acknowledged_at DATETIME(3) NULL, note TEXT NULL, ${TS},
    KEY findings_session (session_id), KEY findings_team_open (team_id, acknowledged_at),
    CONSTRAINT findings_session_fk FOREIGN KEY (session_id) REFERENCES ride_sessions(id) ON DELETE CASCADE`,
  setup_sheets: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, session_id INT NULL, bike_id INT NULL,
    version INT NOT NULL DEFAULT 1, fields JSON NOT NULL, created_by VARCHAR(64) NULL, ${TS},
    KEY setup_sheets_team (team_id), KEY setup_sheets_session (session_id),
    CONSTRAINT setup_sheets_session_fk FOREIGN KEY (session_id) REFERENCES ride_sessions(id) ON DELETE CASCADE,
    CONSTRAINT setup_sheets_bike_fk FOREIGN KEY (bike_id) REFERENCES bikes(id) ON DELETE SET NULL`,
  notes: `id INT AUTO_INCREMENT PRIMARY KEY, ${TEAM}, session_id INT NOT NULL, lap_number INT NULL,
    author_id VARCHAR(64) NOT NULL, text TEXT NOT NULL, ${TS}, KEY notes_session (session_id),
    CONSTRAINT notes_session_fk FOREIGN KEY (session_id) REFERENCES ride_sessions(id) ON DELETE CASCADE`,
  jobs: `id INT AUTO_INCREMENT PRIMARY KEY, kind VARCHAR(32) NOT NULL DEFAULT 'ingest', session_id INT NULL,
    state ENUM('queued','running','done','failed') NOT NULL DEFAULT 'queued', attempts INT NOT NULL DEFAULT 0,
    max_attempts INT NOT NULL DEFAULT 3, locked_by VARCHAR(120) NULL, locked_at DATETIME(3) NULL,
    heartbeat_at DATETIME(3) NULL, run_after DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    error TEXT NULL, payload JSON NULL, ${TS},
    KEY jobs_claim (state, run_after), KEY jobs_session (session_id),
    CONSTRAINT jobs_session_fk FOREIGN KEY (session_id) REFERENCES ride_sessions(id) ON DELETE CASCADE`,
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
