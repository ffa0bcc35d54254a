import "server-only";
/**
 * Engines and the Engine ledger: life since the last rebuild from the hours and
 * km at install plus every analysed session the engine ran. Team and role checks inside.
 */
import { Op } from "sequelize";
import { z } from "zod";
import { initModels, Bike, Engine, RideSession } from "@/models";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { notFound } from "@/lib/http/http-error";
import { engineLedger, type EngineLedger, type LedgerSession } from "@/lib/engine/engine-ledger";
import { engineUsage } from "@/lib/engine/engine-usage";
import { ENGINE_LEDGER_RPM_SHARE } from "@/lib/analysis/analyse-series";
import { assertCanEditSetup } from "./setup-access";
import { jsonColumn } from "./json-column";
import { loadSessionSeries } from "./session-series";
import { optionalId, optionalNumber } from "@/lib/forms/form-fields";
import { ownBike } from "./bikes";
import { recomputeCached, roundRpm } from "./recompute-cache";
import { sessionVisibility } from "./sessions";

export const engineSchema = z.object({
  serial: z.string({ message: "Enter the engine's serial" }).trim().min(1, "Enter the engine's serial").max(80, "Keep the serial under 80 characters"),
  bikeId: optionalId,
  rebuildIntervalH: optionalNumber("Rebuild interval (hours)", 0.5, 2000, "h"),
  rebuildIntervalKm: optionalNumber("Rebuild interval (distance)", 10, 200_000, "km"),
  hoursAtInstall: optionalNumber("Hours at install", 0, 2000, "h").transform((n) => n ?? 0),
  kmAtInstall: optionalNumber("Distance at install", 0, 200_000, "km").transform((n) => n ?? 0),
  notes: z.string().trim().max(1000, "Keep notes under 1000 characters").transform((s) => s || null),
});
export type EngineInput = z.input<typeof engineSchema>;

/**
 * Per-session engine use as the ingest analysis stores it in RideSession.summary.engine
 * (SessionEngineSummary, distance in m); `engineUsage` with km is read too.
 */
export interface StoredEngineUsage {
  hours?: number;
  distanceKm?: number;
  distanceM?: number;
  timeAboveRpmS?: number;
  ceilingExceedances?: number;
  /** The rpm `timeAboveRpmS` was counted above, when recorded. */
  rpmThreshold?: number;
}

export interface LedgerSessionRow {
  sessionId: number;
  title: string;
  startedAt: string | null;
  hours: number;
  km: number;
  timeAboveRpmS: number;
  ceilingExceedances: number;
  /** Where the numbers came from: the stored summary, or the samples read now. */
  source: "summary" | "samples";
}

export interface EngineWithLedger {
  id: number;
  serial: string;
  bikeId: number | null;
  rebuildIntervalH: number | null;
  rebuildIntervalKm: number | null;
  hoursAtInstall: number;
  kmAtInstall: number;
  notes: string | null;
  ledger: EngineLedger;
  sessions: LedgerSessionRow[];
}

/** Default rpm for "time above": the share of the rev ceiling the ingest analysis counts at, so its stored figure applies. */
export function defaultLedgerRpm(revCeilingRpm: number | null): number {
  return revCeilingRpm ? ENGINE_LEDGER_RPM_SHARE * revCeilingRpm : 12_000;
}

function storedUsage(summary: unknown): StoredEngineUsage | null {
  const s = jsonColumn<{ engine?: StoredEngineUsage | null; engineUsage?: StoredEngineUsage | null }>(summary);
  const u = s?.engine ?? s?.engineUsage;
  if (!u || typeof u.hours !== "number") return null;
  const distanceKm = typeof u.distanceKm === "number" ? u.distanceKm : typeof u.distanceM === "number" ? u.distanceM / 1000 : undefined;
  return { ...u, distanceKm };
}

async function ownEngine(ctx: TeamContext, id: number): Promise<Engine> {
  initModels();
  const e = await Engine.findOne({ where: { id, teamId: ctx.teamId } });
  if (!e) throw notFound("Engine");
  return e;
}

export async function createEngine(ctx: TeamContext, raw: unknown): Promise<{ id: number }> {
  assertCanEditSetup(ctx);
  const input = engineSchema.parse(raw);
  if (input.bikeId !== null) await ownBike(ctx, input.bikeId);
  const e = await Engine.create({ teamId: ctx.teamId, ...input });
  return { id: e.id };
}

export async function updateEngine(ctx: TeamContext, id: number, raw: unknown): Promise<{ id: number }> {
  assertCanEditSetup(ctx);
  const e = await ownEngine(ctx, id);
  const input = engineSchema.parse(raw);
  if (input.bikeId !== null) await ownBike(ctx, input.bikeId);
  await e.update(input);
  return { id: e.id };
}

/** One session's contribution: the stored summary where it answers, the samples otherwise. */
export async function sessionUsage(s: RideSession, rpm: number, ceilingRpm: number): Promise<LedgerSessionRow> {
  const stored = storedUsage(s.summary);
  const base = { sessionId: s.id, title: s.title ?? `Session ${s.id}`, startedAt: s.startedAt?.toISOString() ?? null };
  const complete = stored && typeof stored.hours === "number" && typeof stored.distanceKm === "number";
  // "Time above" depends on the rpm chosen on screen: the stored figure counts only when it was taken at that rpm.
  if (complete && typeof stored.rpmThreshold === "number" && Math.abs(stored.rpmThreshold - rpm) < 0.5 && typeof stored.timeAboveRpmS === "number") {
    return { ...base, hours: stored.hours!, km: stored.distanceKm!, timeAboveRpmS: stored.timeAboveRpmS, ceilingExceedances: stored.ceilingExceedances ?? 0, source: "summary" };
  }
  // Read from the samples: kept a while per session version and rpm (see recompute-cache.ts).
  const u = await recomputeCached(`engine:${s.id}:${s.updatedAt?.getTime() ?? 0}:${complete ? 1 : 0}:${rpm}:${ceilingRpm}`, async () => {
    const { series } = await loadSessionSeries(getSequelize(), s.id, complete ? ["engine_rpm"] : ["engine_rpm", "speed_front", "speed_rear", "gps_speed"]);
    return engineUsage(series, rpm, ceilingRpm);
  });
  if (complete) {
    return { ...base, hours: stored.hours!, km: stored.distanceKm!, timeAboveRpmS: u.timeAboveRpmS, ceilingExceedances: stored.ceilingExceedances ?? u.ceilingExceedances, source: "samples" };
  }
  return { ...base, hours: u.runningS / 3600, km: u.distanceM / 1000, timeAboveRpmS: u.timeAboveRpmS, ceilingExceedances: u.ceilingExceedances, source: "samples" };
}

/** The engines of a bike, each with its ledger; `rpm` is the "time above" rpm chosen on screen. */
export async function enginesOfBike(ctx: TeamContext, bikeId: number, rpm?: number): Promise<{ rpm: number; engines: EngineWithLedger[] }> {
  const bike: Bike = await ownBike(ctx, bikeId);
  // A person's rpm is restricted to steps of 50 rpm, so results can be kept and reused.
  const chosenRpm = rpm !== undefined ? roundRpm(rpm) : defaultLedgerRpm(bike.revCeilingRpm);
  // Without a ceiling nothing can exceed it.
  const ceiling = bike.revCeilingRpm ?? Infinity;
  const engines = await Engine.findAll({ where: { teamId: ctx.teamId, bikeId }, order: [["serial", "ASC"]] });
  const sessions = engines.length
    ? await RideSession.findAll({ where: { teamId: ctx.teamId, status: "ready", engineId: { [Op.in]: engines.map((e) => e.id) } }, order: [["startedAt", "ASC"], ["id", "ASC"]] })
    : [];
  // The engine's life counts every session it ran; the list names only sessions the caller may
  // see (a rider: their own and those shared with riders).
  const visible = ctx.role === "rider" && sessions.length
    ? new Set((await RideSession.findAll({ where: { ...(await sessionVisibility(ctx)), id: { [Op.in]: sessions.map((s) => s.id) } }, attributes: ["id"] })).map((s) => s.id))
    : null;
  const out: EngineWithLedger[] = [];
  for (const e of engines) {
    const rows: LedgerSessionRow[] = [];
    // One at a time: each may read samples, and the machine is small.
    for (const s of sessions.filter((x) => x.engineId === e.id)) rows.push(await sessionUsage(s, chosenRpm, ceiling));
    out.push({ ...plainEngine(e), ledger: ledgerOf(e, rows), sessions: visible ? rows.filter((r) => visible.has(r.sessionId)) : rows });
  }
  return { rpm: chosenRpm, engines: out };
}

/** Ledger with the life the engine had when fitted counted in, but not as a session. */
export function ledgerOf(e: Pick<Engine, "hoursAtInstall" | "kmAtInstall" | "rebuildIntervalH" | "rebuildIntervalKm">, rows: LedgerSessionRow[]): EngineLedger {
  const entries: LedgerSession[] = [
    { durationS: (e.hoursAtInstall ?? 0) * 3600, distanceM: (e.kmAtInstall ?? 0) * 1000 },
    ...rows.map((r) => ({ durationS: r.hours * 3600, distanceM: r.km * 1000, timeAboveRpmS: r.timeAboveRpmS, ceilingExceedances: r.ceilingExceedances })),
  ];
  const l = engineLedger(entries, { rebuildIntervalH: e.rebuildIntervalH ?? undefined, rebuildIntervalKm: e.rebuildIntervalKm ?? undefined });
  return { ...l, sessionCount: rows.length };
}

function plainEngine(e: Engine) {
  return {
    id: e.id,
    serial: e.serial,
    bikeId: e.bikeId,
    rebuildIntervalH: e.rebuildIntervalH,
    rebuildIntervalKm: e.rebuildIntervalKm,
    hoursAtInstall: e.hoursAtInstall ?? 0,
    kmAtInstall: e.kmAtInstall ?? 0,
    notes: e.notes,
  };
}
