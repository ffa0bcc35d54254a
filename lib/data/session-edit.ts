import "server-only";
/**
 * Writing a session's details and confirming its import, with the role and team checks inside
 * (so they hold whoever calls: the server actions in lib/actions/imports.ts, or a test).
 * Another team's session is "not found" (404); a role without upload permission is refused (403).
 */
import type { Sequelize } from "sequelize";
import { getSequelize } from "@/models/db";
import { initModels, RideSession, Rider, Bike, Engine, RaceEvent, LogFile, ImportProfile } from "@/models";
import { roleCan, type TeamContext } from "@/lib/auth/guard";
import { HttpError, forbidden } from "@/lib/http/http-error";
import { confirmMapping, prepareImport, validateMapping, mappingSchema, type ImportPreview } from "./imports";
import { enqueueJob } from "./jobs";
import type { Mapping, MappedColumn } from "@/lib/ingest/mapping";
import type { SuggestedColumn } from "@/lib/ingest/suggest-mapping";
import type { SessionDetailsValues, ImportFormValues } from "@/lib/forms/session-form";

type Caller = Pick<TeamContext, "teamId" | "role">;

export interface Option {
  id: number;
  label: string;
}

export interface SessionFormOptions {
  events: Option[];
  bikes: Option[];
  engines: (Option & { bikeId: number | null })[];
  riders: Option[];
}

function assertCanEdit(ctx: Caller): void {
  if (!roleCan(ctx.role, { "session-data": ["upload"] })) throw forbidden("Only engineers and owners change sessions and their imports.");
}

async function findTeamSession(ctx: Caller, sessionId: number): Promise<RideSession> {
  const row = Number.isInteger(sessionId) && sessionId > 0 ? await RideSession.findOne({ where: { id: sessionId, teamId: ctx.teamId } }) : null;
  if (!row) throw new HttpError(404, "Session was not found in your team.");
  return row;
}

/** The team's events, bikes, engines and riders for the details form's selects. */
export async function sessionFormOptions(teamId: string): Promise<SessionFormOptions> {
  initModels();
  const [events, bikes, engines, riders] = await Promise.all([
    RaceEvent.findAll({ where: { teamId }, order: [["startsOn", "DESC"], ["name", "ASC"]] }),
    Bike.findAll({ where: { teamId }, order: [["name", "ASC"]] }),
    Engine.findAll({ where: { teamId }, order: [["serial", "ASC"]] }),
    Rider.findAll({ where: { teamId }, order: [["name", "ASC"]] }),
  ]);
  return {
    events: events.map((e) => ({ id: e.id, label: e.startsOn ? `${e.name} (${e.startsOn})` : e.name })),
    bikes: bikes.map((b) => ({ id: b.id, label: b.name })),
    engines: engines.map((e) => ({ id: e.id, label: e.serial, bikeId: e.bikeId })),
    riders: riders.map((r) => ({ id: r.id, label: r.raceNumber ? `${r.name} #${r.raceNumber}` : r.name })),
  };
}

/** Check the chosen event/bike/engine/rider are rows of this team; 422 with per-field messages if not. */
async function checkReferences(teamId: string, d: SessionDetailsValues): Promise<{ trackId: number | null | undefined }> {
  const errors: Record<string, string> = {};
  const one = async <T extends { teamId: string }>(field: string, id: number | null, find: (id: number) => Promise<T | null>, what: string) => {
    if (id == null) return null;
    const row = await find(id);
    if (!row || row.teamId !== teamId) errors[field] = `That ${what} is not one of your team's.`;
    return row;
  };
  const [event, , engine] = await Promise.all([
    one("eventId", d.eventId, (id) => RaceEvent.findByPk(id), "event"),
    one("bikeId", d.bikeId, (id) => Bike.findByPk(id), "bike"),
    one("engineId", d.engineId, (id) => Engine.findByPk(id), "engine"),
    one("riderId", d.riderId, (id) => Rider.findByPk(id), "rider"),
  ]);
  if (engine && d.bikeId != null && engine.bikeId != null && engine.bikeId !== d.bikeId && !errors.engineId) {
    errors.engineId = `Engine ${engine.serial} is fitted to another bike; choose that bike or another engine.`;
  }
  if (Object.keys(errors).length) throw new HttpError(422, "Some details need another look.", errors);
  // The event's track is where the session ran: lap detection needs it.
  return { trackId: event?.trackId ?? undefined };
}

/** Save a session's details (title, kind, event, bike, engine, rider, start, conditions, sharing). */
export async function updateSessionDetails(sequelize: Sequelize, ctx: Caller, sessionId: number, d: SessionDetailsValues): Promise<void> {
  initModels(sequelize);
  assertCanEdit(ctx);
  const session = await findTeamSession(ctx, sessionId);
  const { trackId } = await checkReferences(ctx.teamId, d);
  await session.update({
    title: d.title,
    kind: d.kind,
    eventId: d.eventId,
    bikeId: d.bikeId,
    engineId: d.engineId,
    riderId: d.riderId,
    startedAt: d.startedAt,
    conditions: d.conditions === "" ? null : d.conditions,
    sharedWithRiders: d.sharedWithRiders,
    ...(trackId != null ? { trackId } : {}),
  });
}

/**
 * The person confirmed the import screen: check the mapping against the file's header, save the
 * details, save the mapping as the team's Import profile and queue the parse. Column names come
 * from the stored header (never from the browser), so the parser's name check always fits.
 */
export async function confirmSessionImport(sequelize: Sequelize, ctx: Caller, sessionId: number, v: ImportFormValues): Promise<void> {
  initModels(sequelize);
  assertCanEdit(ctx);
  const session = await findTeamSession(ctx, sessionId);
  if (session.status !== "mapping") throw new HttpError(409, session.status === "queued" || session.status === "parsing" ? "This session is being read already; its mapping can no longer change." : "This session is not waiting for a column mapping.");
  const preview = (session.summary as { preview?: ImportPreview } | null)?.preview;
  if (!preview?.header) throw new HttpError(409, "This session has no CSV header to map. Re-import it first.");
  const byIndex = new Map(preview.header.columns.map((c) => [c.index, c]));
  const errors: Record<string, string> = {};
  v.columns.forEach((c, i) => {
    if (!byIndex.has(c.index)) errors[`columns.${i}.role`] = `Column ${c.index + 1} is not in this file's header.`;
  });
  if (Object.keys(errors).length) throw new HttpError(422, "The mapping does not fit this file.", errors);
  const mapping: Mapping = mappingSchema.parse({
    timeFormat: v.timeFormat,
    columns: v.columns.map((c): MappedColumn => ({ index: c.index, name: byIndex.get(c.index)!.name, role: c.role as MappedColumn["role"], unit: c.unit, scale: c.scale, offset: c.offset })),
  }) as Mapping;
  const problems = validateMapping(mapping);
  if (problems.length) throw new HttpError(422, problems.join(" "));
  await updateSessionDetails(sequelize, ctx, sessionId, v);
  await confirmMapping(sequelize, ctx.teamId, sessionId, mapping, v.profileName, { updateProfile: v.updateProfile });
}

/** "Re-import with another mapping": read the kept file again and go back to the mapping screen. */
export async function reimportSession(sequelize: Sequelize, ctx: Caller, sessionId: number): Promise<{ status: string }> {
  initModels(sequelize);
  assertCanEdit(ctx);
  const session = await findTeamSession(ctx, sessionId);
  if (session.status === "queued" || session.status === "parsing") throw new HttpError(409, "This session is being read now; wait until it is ready or failed.");
  const after = await prepareImport(sequelize, sessionId, { forceMapping: true });
  return { status: after.status };
}

/**
 * A CSV refused because rows repeat their time stamps (a rounded 1 kHz export): read it again
 * keeping the first row of each time stamp. Only this session's mapping changes, not the team's
 * Import profile, so the next upload is refused again until someone chooses this for it too.
 */
export async function keepFirstOfRepeatedTimes(sequelize: Sequelize, ctx: Caller, sessionId: number): Promise<void> {
  initModels(sequelize);
  assertCanEdit(ctx);
  const session = await findTeamSession(ctx, sessionId);
  const failure = (session.summary as { failure?: { code?: string } } | null)?.failure;
  if (session.status !== "failed" || failure?.code !== "DUPLICATE_TIME" || !session.mapping) {
    throw new HttpError(409, "This session was not refused for repeated time stamps; nothing to import again this way.");
  }
  const mapping: Mapping = { ...(session.mapping as Mapping), duplicateTimes: "keepFirst" };
  await session.update({ mapping, status: "queued", statusReason: null, progress: 0 });
  await enqueueJob(sequelize, sessionId);
}

/** A session's editable details as the forms show them (dates as ISO strings). */
export interface SessionDetailsView {
  title: string;
  kind: string;
  eventId: number | null;
  bikeId: number | null;
  engineId: number | null;
  riderId: number | null;
  startedAt: string | null;
  conditions: string;
  sharedWithRiders: boolean;
}

export interface ImportScreenColumn {
  index: number;
  header: string;
  name: string;
  /** The unit written in the file's header ("" if none). */
  fileUnit: string;
  samples: string[];
  role: string;
  unit: string;
  scale: number;
  offset: number;
  confidence: number | null;
  reason: string | null;
}

export interface ImportScreen {
  sessionId: number;
  status: string;
  fileName: string;
  fileBytes: number | null;
  format: ImportPreview["format"] | null;
  delimiter: string | null;
  decimalComma: boolean;
  headerLine: number | null;
  metadata: Record<string, string>;
  timeFormat: Mapping["timeFormat"];
  timeConfidence: number | null;
  columns: ImportScreenColumn[];
  profileName: string;
  /** The team's profile for this header, when there is one: the form asks whether to update it. */
  existingProfile: { id: number; name: string } | null;
  /** The session was read before (it is being mapped again). */
  mappedBefore: boolean;
  details: SessionDetailsView;
}

/** Everything the import screen shows, as plain data; 404 outside the team, 403 without upload permission. */
export async function getImportScreen(ctx: Caller, sessionId: number): Promise<ImportScreen> {
  initModels();
  assertCanEdit(ctx);
  const s = await findTeamSession(ctx, sessionId);
  const log = s.logFileId ? await LogFile.findByPk(s.logFileId) : null;
  const preview = (s.summary as { preview?: ImportPreview } | null)?.preview;
  const mapping = (s.mapping as Mapping | null) ?? preview?.suggestion ?? null;
  const suggested = new Map<number, SuggestedColumn>((preview?.suggestion?.columns ?? []).map((c) => [c.index, c]));
  const mapped = new Map((mapping?.columns ?? []).map((c) => [c.index, c]));
  const header = preview?.header;
  const metadata = header?.metadata ?? {};
  const existing = preview?.signature ? await ImportProfile.findOne({ where: { teamId: ctx.teamId, headerSignature: preview.signature } }) : null;
  const columns: ImportScreenColumn[] = (header?.columns ?? []).map((col) => {
    const m = mapped.get(col.index);
    const sug = suggested.get(col.index);
    return {
      index: col.index,
      header: col.header,
      name: col.name,
      fileUnit: col.unit,
      samples: (header?.sampleRows ?? []).slice(0, 3).map((r) => r[col.index] ?? ""),
      role: m?.role ?? "ignore",
      unit: m?.unit ?? col.unit,
      scale: m?.scale ?? 1,
      offset: m?.offset ?? 0,
      confidence: sug?.confidence ?? null,
      reason: sug?.reason ?? null,
    };
  });
  // Metadata keys are kept as written; look them up without regard to case.
  const meta = (...keys: string[]) => Object.entries(metadata).find(([k]) => keys.includes(k.toLowerCase()))?.[1];
  const metaStart = meta("started at", "start time", "start", "date");
  const startedAt = s.startedAt?.toISOString() ?? (metaStart && !Number.isNaN(Date.parse(metaStart)) ? new Date(metaStart).toISOString() : null);
  return {
    sessionId: s.id,
    status: s.status,
    fileName: preview?.fileName ?? log?.name ?? `Session ${s.id}`,
    fileBytes: log ? Number(log.bytes) : null,
    format: preview?.format ?? null,
    delimiter: header ? ({ ",": "comma", ";": "semicolon", "\t": "tab" } as Record<string, string>)[header.delimiter] ?? header.delimiter : null,
    decimalComma: header?.decimalComma ?? false,
    headerLine: header?.headerLine ?? null,
    metadata,
    timeFormat: mapping?.timeFormat ?? "seconds",
    timeConfidence: preview?.suggestion?.timeConfidence ?? null,
    columns,
    profileName: existing?.name ?? meta("logger", "device", "generator") ?? (log?.name ?? "Import profile").replace(/\.[a-z0-9]+$/i, ""),
    existingProfile: existing ? { id: existing.id, name: existing.name } : null,
    mappedBefore: !!(s.summary as { analysedAt?: string } | null)?.analysedAt,
    details: {
      title: s.title ?? `Session ${s.id}`,
      kind: s.kind,
      eventId: s.eventId,
      bikeId: s.bikeId,
      engineId: s.engineId,
      riderId: s.riderId,
      startedAt,
      conditions: s.conditions ?? "",
      sharedWithRiders: s.sharedWithRiders,
    },
  };
}

// The calling convention of the app (server actions): the caller's context, no database handle.
// The functions above take the handle too, so a test can run them in its own transaction.

/** Saves a session's details as the caller (team and role checked inside). */
export function saveSessionDetails(ctx: Caller, sessionId: number, d: SessionDetailsValues): Promise<void> {
  return updateSessionDetails(getSequelize(), ctx, sessionId, d);
}

/** Confirms a session's import as the caller (team and role checked inside). */
export function confirmImport(ctx: Caller, sessionId: number, v: ImportFormValues): Promise<void> {
  return confirmSessionImport(getSequelize(), ctx, sessionId, v);
}

/** Reads a session's kept file again as the caller (team and role checked inside). */
export function reimport(ctx: Caller, sessionId: number): Promise<{ status: string }> {
  return reimportSession(getSequelize(), ctx, sessionId);
}

/** Imports a refused CSV again keeping the first row of each repeated time stamp, as the caller. */
export function importKeepingFirstOfRepeatedTimes(ctx: Caller, sessionId: number): Promise<void> {
  return keepFirstOfRepeatedTimes(getSequelize(), ctx, sessionId);
}
