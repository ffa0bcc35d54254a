import "server-only";
/**
 * Engines across the season: per engine its life since the last rebuild (the hours and distance it
 * had when fitted plus every analysed session since the rebuild), over-revs and time above a
 * chosen rpm, the sessions and events it ran (sessions on days after the last rebuild count), its dated history (rebuilds, moves between bikes),
 * and the marks for engines nearing their rebuild interval. Moves and rebuilds are engineer and
 * owner work (setup:edit).
 */
import { Op, QueryTypes } from "sequelize";
import { z } from "zod";
import { initModels, Bike, Engine, RaceEvent, RideSession } from "@/models";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError, notFound } from "@/lib/http/http-error";
import { DEFAULT_LEDGER_WARN_PCT, type EngineLedger } from "@/lib/engine/engine-ledger";
import { assertCanEditSetup } from "./setup-access";
import { defaultLedgerRpm, ledgerOf, sessionUsage, type LedgerSessionRow } from "./engines";
import { optionalId } from "@/lib/forms/form-fields";
import { userNames } from "./setup-sheets";

export interface EngineHistoryEntry {
  id: number;
  kind: "move" | "rebuild";
  onDate: string;
  fromBike: string | null;
  toBike: string | null;
  hoursBefore: number | null;
  kmBefore: number | null;
  note: string | null;
  by: string | null;
}

export interface SeasonEngine {
  id: number;
  serial: string;
  bikeId: number | null;
  bikeName: string | null;
  rebuildIntervalH: number | null;
  rebuildIntervalKm: number | null;
  hoursAtInstall: number;
  kmAtInstall: number;
  lastRebuild: string | null;
  rpm: number;
  ledger: EngineLedger;
  sessions: (LedgerSessionRow & { eventName: string | null })[];
  events: string[];
  history: EngineHistoryEntry[];
}

const isoDate = z
  .string({ message: "Enter the date" })
  .trim()
  .refine((s) => /^\d{4}-\d{2}-\d{2}$/.test(s) && !Number.isNaN(Date.parse(`${s}T00:00:00Z`)), "Enter a date such as 2031-07-12");

export const moveSchema = z.object({ toBikeId: optionalId, onDate: isoDate, note: z.string().trim().max(500, "Keep the note under 500 characters").default("") });
export const rebuildSchema = z.object({ onDate: isoDate, note: z.string().trim().max(500, "Keep the note under 500 characters").default("") });

async function historyOf(engineIds: number[]): Promise<Map<number, EngineHistoryEntry[]>> {
  const out = new Map<number, EngineHistoryEntry[]>();
  if (engineIds.length === 0) return out;
  const rows = await getSequelize().query<{ id: number; engineId: number; kind: "move" | "rebuild"; onDate: string; fromBike: string | null; toBike: string | null; hoursBefore: number | null; kmBefore: number | null; note: string | null; createdBy: string | null }>(
    `SELECT h.id, h.engine_id AS engineId, h.kind, DATE_FORMAT(h.on_date, '%Y-%m-%d') AS onDate, fb.name AS fromBike, tb.name AS toBike,
            h.hours_before AS hoursBefore, h.km_before AS kmBefore, h.note, h.created_by AS createdBy
       FROM engine_history h LEFT JOIN bikes fb ON fb.id = h.from_bike_id LEFT JOIN bikes tb ON tb.id = h.to_bike_id
      WHERE h.engine_id IN (${engineIds.map(() => "?").join(",")}) ORDER BY h.on_date DESC, h.id DESC`,
    { replacements: engineIds, type: QueryTypes.SELECT },
  );
  const names = await userNames(rows.map((r) => r.createdBy));
  for (const r of rows) {
    const list = out.get(r.engineId) ?? [];
    list.push({ id: r.id, kind: r.kind, onDate: r.onDate, fromBike: r.fromBike, toBike: r.toBike, hoursBefore: r.hoursBefore, kmBefore: r.kmBefore, note: r.note, by: r.createdBy ? (names.get(r.createdBy) ?? null) : null });
    out.set(r.engineId, list);
  }
  return out;
}

/** Every engine of the team with its season; `rpm` overrides each engine's default "time above" rpm. */
export async function listSeasonEngines(ctx: TeamContext, rpm?: number): Promise<SeasonEngine[]> {
  initModels();
  const engines = await Engine.findAll({ where: { teamId: ctx.teamId }, order: [["serial", "ASC"]] });
  if (engines.length === 0) return [];
  const [bikes, sessions, history] = await Promise.all([
    Bike.findAll({ where: { teamId: ctx.teamId }, attributes: ["id", "name", "revCeilingRpm"] }),
    RideSession.findAll({ where: { teamId: ctx.teamId, status: "ready", engineId: { [Op.in]: engines.map((e) => e.id) } }, order: [["startedAt", "ASC"], ["id", "ASC"]] }),
    historyOf(engines.map((e) => e.id)),
  ]);
  const eventIds = [...new Set(sessions.map((s) => s.eventId).filter((x): x is number => x != null))];
  const events = eventIds.length ? await RaceEvent.findAll({ where: { id: { [Op.in]: eventIds } }, attributes: ["id", "name"] }) : [];
  const out: SeasonEngine[] = [];
  for (const e of engines) {
    const bike = bikes.find((b) => b.id === e.bikeId) ?? null;
    const chosen = rpm ?? defaultLedgerRpm(bike?.revCeilingRpm ?? null);
    const hist = history.get(e.id) ?? [];
    const lastRebuild = hist.find((h) => h.kind === "rebuild")?.onDate ?? null;
    const since = sessions.filter((s) => s.engineId === e.id && (!lastRebuild || !s.startedAt || s.startedAt.toISOString().slice(0, 10) > lastRebuild));
    const rows: SeasonEngine["sessions"] = [];
    for (const s of since) {
      const u = await sessionUsage(s, chosen, bike?.revCeilingRpm ?? Infinity);
      rows.push({ ...u, eventName: events.find((x) => x.id === s.eventId)?.name ?? null });
    }
    out.push({
      id: e.id, serial: e.serial, bikeId: e.bikeId, bikeName: bike?.name ?? null, rebuildIntervalH: e.rebuildIntervalH, rebuildIntervalKm: e.rebuildIntervalKm,
      hoursAtInstall: e.hoursAtInstall ?? 0, kmAtInstall: e.kmAtInstall ?? 0, lastRebuild, rpm: chosen,
      ledger: ledgerOf(e, rows), sessions: rows, events: [...new Set(rows.map((r) => r.eventName).filter((x): x is string => !!x))], history: hist,
    });
  }
  return out;
}

/** Engines at or past the warning share of their interval, for the Team home (engineers and owners). */
export async function enginesNearingRebuild(ctx: TeamContext): Promise<SeasonEngine[]> {
  return (await listSeasonEngines(ctx)).filter((e) => e.ledger.usedPct != null && e.ledger.usedPct >= DEFAULT_LEDGER_WARN_PCT);
}

async function ownEngine(ctx: TeamContext, id: number): Promise<Engine> {
  initModels();
  const e = await Engine.findOne({ where: { id, teamId: ctx.teamId } });
  if (!e) throw notFound("Engine");
  return e;
}

/** Move an engine to another bike (or the shelf) with a dated record. */
export async function moveEngine(ctx: TeamContext, engineId: number, raw: unknown): Promise<{ fromBikeId: number | null; toBikeId: number | null; serial: string }> {
  assertCanEditSetup(ctx);
  const e = await ownEngine(ctx, engineId);
  const input = moveSchema.parse(raw);
  if (input.toBikeId != null && !(await Bike.findOne({ where: { id: input.toBikeId, teamId: ctx.teamId }, attributes: ["id"] }))) throw notFound("Bike");
  if (input.toBikeId === e.bikeId) throw new HttpError(422, "The engine is already fitted there.", { toBikeId: "Pick another bike" });
  const from = e.bikeId;
  await getSequelize().transaction(async (transaction) => {
    await getSequelize().query(
      "INSERT INTO engine_history (team_id, engine_id, kind, on_date, from_bike_id, to_bike_id, note, created_by) VALUES (?, ?, 'move', ?, ?, ?, ?, ?)",
      { replacements: [ctx.teamId, e.id, input.onDate, from, input.toBikeId, input.note || null, ctx.userId], type: QueryTypes.INSERT, transaction },
    );
    await e.update({ bikeId: input.toBikeId }, { transaction });
  });
  return { fromBikeId: from, toBikeId: input.toBikeId, serial: e.serial };
}

/** Record a rebuild: the life so far is kept in the record, and the count starts again from zero. */
export async function recordRebuild(ctx: TeamContext, engineId: number, raw: unknown): Promise<{ serial: string; hoursBefore: number; kmBefore: number }> {
  assertCanEditSetup(ctx);
  const e = await ownEngine(ctx, engineId);
  const input = rebuildSchema.parse(raw);
  const current = (await listSeasonEngines(ctx)).find((x) => x.id === e.id)!;
  await getSequelize().transaction(async (transaction) => {
    await getSequelize().query(
      "INSERT INTO engine_history (team_id, engine_id, kind, on_date, hours_before, km_before, note, created_by) VALUES (?, ?, 'rebuild', ?, ?, ?, ?, ?)",
      { replacements: [ctx.teamId, e.id, input.onDate, current.ledger.hours, current.ledger.km, input.note || null, ctx.userId], type: QueryTypes.INSERT, transaction },
    );
    await e.update({ hoursAtInstall: 0, kmAtInstall: 0 }, { transaction });
  });
  return { serial: e.serial, hoursBefore: current.ledger.hours, kmBefore: current.ledger.km };
}
