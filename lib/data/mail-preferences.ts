import "server-only";
/** Each user's e-mail choices (their own settings page): "session ready" and the owner's event report. On by default. */
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";

export interface MailPreferences {
  sessionReady: boolean;
  eventReport: boolean;
}

export async function getMailPreferences(ctx: Pick<TeamContext, "userId">): Promise<MailPreferences> {
  const rows = await getSequelize().query<{ sessionReady: number; eventReport: number }>("SELECT session_ready AS sessionReady, event_report AS eventReport FROM mail_preferences WHERE user_id = ?", {
    replacements: [ctx.userId],
    type: QueryTypes.SELECT,
  });
  return rows[0] ? { sessionReady: !!rows[0].sessionReady, eventReport: !!rows[0].eventReport } : { sessionReady: true, eventReport: true };
}

export async function saveMailPreferences(ctx: Pick<TeamContext, "userId">, p: MailPreferences): Promise<void> {
  await getSequelize().query(
    "INSERT INTO mail_preferences (user_id, session_ready, event_report) VALUES (?, ?, ?) ON DUPLICATE KEY UPDATE session_ready = VALUES(session_ready), event_report = VALUES(event_report)",
    { replacements: [ctx.userId, p.sessionReady ? 1 : 0, p.eventReport ? 1 : 0], type: QueryTypes.INSERT },
  );
}
