import "server-only";
/**
 * What Compare opens on when its URL names no laps: the two fastest flying laps (not out, in,
 * invalid or pit-pass laps, complete, timed) of the latest ready session the caller may see that
 * has two. Null when no such session exists yet.
 */
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { sessionVisibilitySql } from "./sessions";

export async function defaultCompareLaps(ctx: TeamContext): Promise<{ sessionId: number; laps: number[] } | null> {
  const vis = sessionVisibilitySql(ctx, "s");
  const rows = await getSequelize().query<{ sessionId: number; number: number }>(
    `SELECT l.session_id AS sessionId, l.number AS number FROM laps l
     JOIN (
       SELECT s.id FROM ride_sessions s
       WHERE ${vis.sql} AND s.status = 'ready'
         AND (SELECT COUNT(*) FROM laps f WHERE f.session_id = s.id AND f.is_out_lap = 0 AND f.is_in_lap = 0 AND f.is_invalid = 0 AND f.pit_pass = 0 AND f.lap_time_ms IS NOT NULL) >= 2
       ORDER BY COALESCE(s.started_at, s.created_at) DESC, s.id DESC LIMIT 1
     ) latest ON latest.id = l.session_id
     WHERE l.is_out_lap = 0 AND l.is_in_lap = 0 AND l.is_invalid = 0 AND l.pit_pass = 0 AND l.lap_time_ms IS NOT NULL
     ORDER BY l.lap_time_ms ASC, l.number ASC LIMIT 2`,
    { replacements: vis.replacements, type: QueryTypes.SELECT },
  );
  if (rows.length < 2) return null;
  return { sessionId: Number(rows[0].sessionId), laps: rows.map((r) => Number(r.number)) };
}
