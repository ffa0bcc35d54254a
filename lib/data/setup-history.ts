import "server-only";
/**
 * Setup history across sessions: the setup each session ended on (its latest version) beside the
 * next session of the same bike at the same track, with the lap-time effect (lib/record/setup-effects).
 * Everyone in the team reads it; a rider only over sessions they rode.
 */
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { jsonColumn } from "./json-column";
import { SETUP_FIELDS, type SetupValues } from "./setup-sheets";
import { lapsOfSessions, seasonBaseRows, toSeasonRow } from "./season-record";
import { setupEffects, type EffectSession, type SetupEffect } from "@/lib/record/setup-effects";

/** The plain caution beside every effect: one change rarely explains a lap time alone. */
export const EFFECT_CAUTION =
  "One change rarely explains a lap time alone: track temperature, tyre wear and compound, fuel load, traffic and the rider's confidence move it too. Read a difference here as a hint to test again, not as proof.";

export interface EffectView {
  effects: (SetupEffect & { bikeName: string | null; trackName: string | null })[];
}

/** The latest setup version of each session. */
async function latestSetups(ids: number[]): Promise<Map<number, { version: number; values: SetupValues }>> {
  const out = new Map<number, { version: number; values: SetupValues }>();
  if (ids.length === 0) return out;
  const rows = await getSequelize().query<{ sessionId: number; version: number; fields: unknown }>(
    `SELECT s.session_id AS sessionId, s.version, s.fields FROM setup_sheets s
      WHERE s.session_id IN (${ids.map(() => "?").join(",")})
        AND s.version = (SELECT MAX(x.version) FROM setup_sheets x WHERE x.session_id = s.session_id)`,
    { replacements: ids, type: QueryTypes.SELECT },
  );
  for (const r of rows) {
    const raw = jsonColumn<Record<string, unknown>>(r.fields) ?? {};
    const values: SetupValues = {};
    for (const f of SETUP_FIELDS) {
      const v = raw[f.name];
      values[f.name] = typeof v === "number" || typeof v === "string" ? v : null;
    }
    out.set(r.sessionId, { version: r.version, values });
  }
  return out;
}

export async function getSetupEffects(ctx: TeamContext, filter: { bikeId?: number | null; trackId?: number | null; sessionId?: number | null } = {}): Promise<EffectView> {
  const base = await seasonBaseRows(ctx);
  const rows = base.filter((r) => (filter.bikeId == null || r.bikeId === filter.bikeId) && (filter.trackId == null || r.trackId === filter.trackId));
  const ids = rows.map((r) => r.sessionId);
  const [laps, setups] = await Promise.all([lapsOfSessions(ids), latestSetups(ids)]);
  const sessions: EffectSession[] = rows.map((r) => {
    const s = toSeasonRow(r, laps.get(r.sessionId) ?? []);
    const setup = setups.get(r.sessionId);
    return {
      sessionId: s.sessionId, title: s.eventName ? `${s.eventName} · ${s.title}` : s.title, startedAt: s.startedAt, bikeId: s.bikeId, trackId: s.trackId,
      conditions: s.conditions, setupVersion: setup?.version ?? null, setup: setup?.values ?? null,
      bestLapMs: s.bestLapMs, bestThreeMeanMs: s.bestThreeMeanMs, bestSectorsMs: s.bestSectorsMs,
    };
  });
  let effects = setupEffects(sessions, SETUP_FIELDS.map((f) => f.name));
  if (filter.sessionId != null) effects = effects.filter((e) => e.after.sessionId === filter.sessionId || e.before.sessionId === filter.sessionId);
  const names = new Map(rows.map((r) => [`${r.bikeId}|${r.trackId}`, { bikeName: r.bikeName, trackName: r.trackName }]));
  return { effects: effects.map((e) => ({ ...e, ...(names.get(`${e.bikeId}|${e.trackId}`) ?? { bikeName: null, trackName: null }) })) };
}
