/**
 * The front tyre's crown radius (the existing tyre_crown_radius_mm is the rear's), so Drive slip
 * corrects both wheels at lean; and a track's IANA time zone, in which a start time written
 * without a zone is read.
 */
import { QueryTypes, type QueryInterface } from "sequelize";

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query("ALTER TABLE bikes ADD COLUMN tyre_crown_radius_front_mm DOUBLE NULL AFTER tyre_crown_radius_mm", { type: QueryTypes.RAW });
  await qi.sequelize.query("ALTER TABLE tracks ADD COLUMN time_zone VARCHAR(64) NULL", { type: QueryTypes.RAW });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query("ALTER TABLE tracks DROP COLUMN time_zone", { type: QueryTypes.RAW });
  await qi.sequelize.query("ALTER TABLE bikes DROP COLUMN tyre_crown_radius_front_mm", { type: QueryTypes.RAW });
}
