import "server-only";
/**
 * Findings thresholds per bike and per track: read as plain objects with the defaults beside
 * them; saved (engineers and owners only) and followed by a reanalysis of the sessions concerned,
 * so stored findings always match the thresholds shown.
 */
import { Op } from "sequelize";
import { initModels, Bike, Track, RideSession } from "@/models";
import { roleCan, type TeamContext } from "@/lib/auth/guard";
import { HttpError, forbidden } from "@/lib/http/http-error";
import type { ThresholdKey } from "@/lib/findings/thresholds";
import { BIKE_THRESHOLD_FIELDS, TRACK_THRESHOLD_FIELDS, type ThresholdField } from "@/lib/findings/threshold-settings";
import { jsonColumn } from "./json-column";
import { reanalyseSession, reanalyseTrackSessions } from "./reanalyse";

export type ThresholdOverrides = Partial<Record<ThresholdKey, number>>;

export interface ThresholdOwner {
  id: number;
  name: string;
  /** Team overrides in SI; keys absent use the default. */
  overrides: ThresholdOverrides;
}

export interface ThresholdSettings {
  bikes: ThresholdOwner[];
  tracks: ThresholdOwner[];
}

function pick(raw: unknown, fields: readonly ThresholdField[]): ThresholdOverrides {
  const obj = jsonColumn<Record<string, unknown>>(raw) ?? {};
  const out: ThresholdOverrides = {};
  for (const f of fields) {
    const v = obj[f.key];
    if (typeof v === "number" && Number.isFinite(v)) out[f.key] = v;
  }
  return out;
}

export async function getThresholdSettings(ctx: TeamContext): Promise<ThresholdSettings> {
  initModels();
  const [bikes, tracks] = await Promise.all([
    Bike.findAll({ where: { teamId: ctx.teamId }, order: [["name", "ASC"]] }),
    Track.findAll({ where: { teamId: ctx.teamId }, order: [["name", "ASC"]] }),
  ]);
  return {
    bikes: bikes.map((b) => ({ id: b.id, name: b.name, overrides: pick(b.thresholds, BIKE_THRESHOLD_FIELDS) })),
    tracks: tracks.map((t) => ({ id: t.id, name: t.name, overrides: pick(t.thresholds, TRACK_THRESHOLD_FIELDS) })),
  };
}

/** Keep only known keys of the scope and values inside each field's range (SI in, SI out). */
function validOverrides(values: ThresholdOverrides, fields: readonly ThresholdField[]): ThresholdOverrides {
  const out: ThresholdOverrides = {};
  for (const f of fields) {
    const v = values[f.key];
    if (v === undefined) continue;
    // Round away the float noise of the unit round trip (120 / 3.6 · 3.6 ≠ 120).
    const shown = Number((v * f.factor).toPrecision(12));
    if (!Number.isFinite(v) || shown < f.min || shown > f.max) throw new HttpError(422, `${f.label} must be between ${f.min} and ${f.max} ${f.unit}.`);
    out[f.key] = v;
  }
  return out;
}

export interface SaveResult {
  reanalysed: number;
}

/**
 * Replace a bike's threshold overrides, then reanalyse every session ridden on that bike.
 * 403 without setup:edit; 404 for a bike outside the caller's team.
 */
export async function saveBikeThresholds(ctx: TeamContext, bikeId: number, values: ThresholdOverrides): Promise<SaveResult> {
  if (!roleCan(ctx.role, { setup: ["edit"] })) throw forbidden();
  const sequelize = initModels();
  const bike = await Bike.findOne({ where: { id: bikeId, teamId: ctx.teamId } });
  if (!bike) throw new HttpError(404, "Bike was not found in your team.");
  const kept = jsonColumn<Record<string, number>>(bike.thresholds) ?? {};
  // Keys of the other scope (none today) are kept; this scope's keys are replaced.
  for (const f of BIKE_THRESHOLD_FIELDS) delete kept[f.key];
  await bike.update({ thresholds: { ...kept, ...validOverrides(values, BIKE_THRESHOLD_FIELDS) } });
  const sessions = await RideSession.findAll({ where: { teamId: ctx.teamId, bikeId, status: { [Op.eq]: "ready" } }, attributes: ["id"] });
  for (const s of sessions) await reanalyseSession(sequelize, s.id);
  return { reanalysed: sessions.length };
}

/** Replace a track's threshold overrides, then reanalyse the track's sessions. */
export async function saveTrackThresholds(ctx: TeamContext, trackId: number, values: ThresholdOverrides): Promise<SaveResult> {
  if (!roleCan(ctx.role, { setup: ["edit"] })) throw forbidden();
  const sequelize = initModels();
  const track = await Track.findOne({ where: { id: trackId, teamId: ctx.teamId } });
  if (!track) throw new HttpError(404, "Track was not found in your team.");
  const kept = jsonColumn<Record<string, number>>(track.thresholds) ?? {};
  for (const f of TRACK_THRESHOLD_FIELDS) delete kept[f.key];
  await track.update({ thresholds: { ...kept, ...validOverrides(values, TRACK_THRESHOLD_FIELDS) } });
  const { sessionIds } = await reanalyseTrackSessions(sequelize, trackId);
  return { reanalysed: sessionIds.length };
}
