/**
 * Upload grants in MariaDB (see models/migrations/0020-upload-grants.ts): issued when the app
 * hands out a presigned upload URL, redeemed once by the completion callback.
 */
import { randomBytes } from "node:crypto";
import { QueryTypes, type Sequelize } from "sequelize";
import type { UploadGrantStore, Uploader } from "../uploads/file-router";
import { getSequelize } from "@/models/db";

/** As long as the presigned URL (uploadthing's default is one hour) plus a resumed upload's slack. */
export const UPLOAD_GRANT_TTL_S = 6 * 60 * 60;

export function dbUploadGrants(sequelize: () => Sequelize): UploadGrantStore {
  return {
    async issue(who) {
      const id = randomBytes(32).toString("base64url"); // 43 characters
      await sequelize().query(
        "INSERT INTO upload_grants (id, team_id, user_id, expires_at) VALUES (?, ?, ?, DATE_ADD(CURRENT_TIMESTAMP(3), INTERVAL ? SECOND))",
        { replacements: [id, who.teamId, who.userId, UPLOAD_GRANT_TTL_S], type: QueryTypes.INSERT },
      );
      return id;
    },
    async redeem(grant, fileKey) {
      if (!/^[A-Za-z0-9_-]{43}$/.test(grant)) return null;
      return sequelize().transaction(async (transaction) => {
        const rows = await sequelize().query<{ team_id: string; user_id: string }>(
          "SELECT team_id, user_id FROM upload_grants WHERE id = ? AND used_at IS NULL AND expires_at > CURRENT_TIMESTAMP(3) FOR UPDATE",
          { replacements: [grant], type: QueryTypes.SELECT, transaction },
        );
        if (!rows[0]) return null;
        await sequelize().query("UPDATE upload_grants SET used_at = CURRENT_TIMESTAMP(3), file_key = ? WHERE id = ?", {
          replacements: [fileKey.slice(0, 128), grant],
          type: QueryTypes.UPDATE,
          transaction,
        });
        const who: Uploader = { teamId: rows[0].team_id, userId: rows[0].user_id };
        return who;
      });
    },
  };
}

/** The app's grant store, on the app's database connection. */
export function appUploadGrants(): UploadGrantStore {
  return dbUploadGrants(getSequelize);
}
