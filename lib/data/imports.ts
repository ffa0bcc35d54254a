/**
 * The import path between a stored upload and a queued parse job:
 * upload complete → LogFile + Session → sniff the first bytes → reuse the team's Import profile
 * for this header (queue at once) or keep a suggested mapping for the person to confirm.
 * Bad files fail here with a specific reason; the stored file is always kept for a re-import.
 */
import { createHash } from "node:crypto";
import { QueryTypes, type Sequelize } from "sequelize";
import { z } from "zod";
import { initModels, ImportProfile, LogFile, RideSession } from "@/models";
import { getSequelize } from "@/models/db";
import { sniffFormat, SNIFF_BYTES } from "@/lib/ingest/sniff-format";
import { readCsvHeader, type CsvHeader } from "@/lib/ingest/csv-header";
import { suggestMapping, type MappingSuggestion } from "@/lib/ingest/suggest-mapping";
import { headerSignature } from "@/lib/ingest/header-signature";
import { IngestError } from "@/lib/ingest/ingest-error";
import { CHANNEL_ROLES } from "@/lib/channels/roles";
import type { Mapping } from "@/lib/ingest/mapping";
import { enqueueJob } from "./jobs";
import { HttpError } from "@/lib/http/http-error";

export type LogFormat = "csv" | "gpx" | "nmea";

/** What the mapping screen needs, kept on the session while it waits. */
export interface ImportPreview {
  format: LogFormat;
  fileName: string;
  header?: Pick<CsvHeader, "delimiter" | "decimalComma" | "metadata" | "columns" | "sampleRows" | "headerLine">;
  suggestion?: MappingSuggestion;
  signature?: string;
}

export async function readFirstBytes(url: string, max = SNIFF_BYTES): Promise<{ bytes: Buffer; complete: boolean }> {
  // no-store: inside Next.js a cacheable fetch is tee'd for its data cache, and cancelling one branch
  // of a tee only settles once the other is cancelled too — so reading the first bytes of a file
  // larger than SNIFF_BYTES hung the upload callback.
  const res = await fetch(url, { cache: "no-store" });
  if (!res.ok || !res.body) throw new Error(`the stored file could not be read (${res.status})`);
  const reader = res.body.getReader();
  const parts: Buffer[] = [];
  let size = 0;
  let complete = false;
  for (;;) {
    const { value, done } = await reader.read();
    if (done) {
      complete = true;
      break;
    }
    parts.push(Buffer.from(value));
    size += value.byteLength;
    if (size >= max) break;
  }
  // Not awaited: the bytes needed are in hand, and a cancel must never hold up the import.
  if (!complete) void reader.cancel().catch(() => {});
  const all = Buffer.concat(parts);
  return { bytes: complete ? all : all.subarray(0, max), complete };
}

export interface RegisterUploadInput {
  teamId: string;
  userId: string;
  file: { key: string; name: string; size: number; ufsUrl: string; fileHash?: string };
}

/** SHA-256 (hex) of the stored file, read back from storage as a stream. Null when it cannot be read (the import then says why). */
export async function sha256OfUrl(url: string): Promise<string | null> {
  try {
    const res = await fetch(url, { cache: "no-store" });
    if (!res.ok || !res.body) return null;
    const h = createHash("sha256");
    const reader = res.body.getReader();
    for (;;) {
      const { value, done } = await reader.read();
      if (done) break;
      h.update(value);
    }
    return h.digest("hex");
  } catch {
    return null;
  }
}

/** What a session held back as a duplicate shows: the earlier session with the same bytes. */
export interface DuplicateOf {
  sessionId: number;
  title: string;
  uploadedAt: string;
}

/** The team's latest session read from a file with these bytes (other than `exceptSessionId`). */
export async function findSessionWithHash(sequelize: Sequelize, teamId: string, sha256: string, exceptSessionId?: number): Promise<DuplicateOf | null> {
  const rows = await sequelize.query<{ id: number; title: string | null; createdAt: Date | string }>(
    `SELECT s.id, s.title, s.created_at AS createdAt FROM log_files f JOIN ride_sessions s ON s.log_file_id = f.id
     WHERE f.team_id = ? AND f.sha256 = ? AND s.team_id = ? AND s.id <> ? ORDER BY s.created_at DESC, s.id DESC LIMIT 1`,
    { replacements: [teamId, sha256, teamId, exceptSessionId ?? 0], type: QueryTypes.SELECT },
  );
  const r = rows[0];
  return r ? { sessionId: Number(r.id), title: r.title ?? `Session ${r.id}`, uploadedAt: new Date(r.createdAt).toISOString() } : null;
}

/**
 * Called when the upload service confirms a stored file: creates the LogFile (with the SHA-256 of
 * its bytes) and its Session. The same bytes uploaded before in this team are not read again on
 * their own: the session waits ("uploaded", with `duplicateOf` in its summary) until the person
 * chooses to go to the earlier session or to import the file again on purpose.
 */
export async function registerUpload(sequelize: Sequelize, input: RegisterUploadInput): Promise<{ sessionId: number; duplicateOf?: number }> {
  initModels(sequelize);
  const { file } = input;
  const sha256 = await sha256OfUrl(file.ufsUrl);
  const earlier = sha256 ? await findSessionWithHash(sequelize, input.teamId, sha256) : null;
  const session = await sequelize.transaction(async (t) => {
    const log = await LogFile.create(
      { teamId: input.teamId, uploadKey: file.key, name: file.name.slice(0, 255), bytes: file.size, sha256, contentType: null, url: file.ufsUrl, uploadedBy: input.userId },
      { transaction: t },
    );
    return RideSession.create(
      {
        teamId: input.teamId, logFileId: log.id, status: "uploaded", title: file.name.replace(/\.[a-z0-9]+$/i, "").slice(0, 160),
        createdBy: input.userId, eventId: null, bikeId: null, engineId: null, riderId: null, trackId: null, importProfileId: null,
        startedAt: null, conditions: null, statusReason: null, mapping: null, summary: earlier ? { duplicateOf: earlier } : null, durationS: null,
      },
      { transaction: t },
    );
  });
  if (earlier) return { sessionId: session.id, duplicateOf: earlier.sessionId };
  await prepareImport(sequelize, session.id);
  return { sessionId: session.id };
}

/** The earlier session a held-back upload duplicates, or null when the session is not held back. */
export function heldDuplicate(session: Pick<RideSession, "status" | "summary">): DuplicateOf | null {
  if (session.status !== "uploaded") return null;
  return (session.summary as { duplicateOf?: DuplicateOf } | null)?.duplicateOf ?? null;
}

/**
 * The person's answer to "this file was uploaded before": `existing` drops the held-back session
 * (the earlier one stays as it is) and returns the earlier session's id; `import` reads the file
 * again on purpose, as a session of its own.
 */
export async function resolveDuplicate(sequelize: Sequelize, teamId: string, sessionId: number, choice: "existing" | "import"): Promise<{ sessionId: number; status: string }> {
  initModels(sequelize);
  const session = await RideSession.findOne({ where: { id: sessionId, teamId } });
  if (!session) throw new HttpError(404, "Session was not found in your team.");
  const dup = heldDuplicate(session);
  if (!dup) throw new HttpError(409, "This session is not waiting for a duplicate choice.");
  if (choice === "existing") {
    const still = await RideSession.findOne({ where: { id: dup.sessionId, teamId }, attributes: ["id"] });
    if (!still) throw new HttpError(404, "The earlier session with this file was deleted meanwhile; choose “Import again” to read this copy.");
    const logId = session.logFileId;
    await sequelize.transaction(async (t) => {
      await session.destroy({ transaction: t });
      // The earlier session has its own LogFile row; this one was only for the held-back copy.
      if (logId) await LogFile.destroy({ where: { id: logId, teamId }, transaction: t });
    });
    return { sessionId: dup.sessionId, status: "existing" };
  }
  await session.update({ summary: null });
  const after = await prepareImport(sequelize, sessionId);
  return { sessionId, status: after.status };
}

async function failSession(sequelize: Sequelize, sessionId: number, reason: string) {
  await RideSession.update({ status: "failed", statusReason: reason, progress: 0 }, { where: { id: sessionId } });
}

/**
 * Look at the stored file and decide the next step. GPX and NMEA need no mapping; a CSV whose
 * header the team has mapped before is queued with that Import profile; any other CSV waits on
 * the mapping screen with a suggestion.
 */
export async function prepareImport(sequelize: Sequelize, sessionId: number, opts: { forceMapping?: boolean } = {}): Promise<RideSession> {
  initModels(sequelize);
  const session = await RideSession.findByPk(sessionId);
  if (!session) throw new Error(`session ${sessionId} not found`);
  const log = session.logFileId ? await LogFile.findByPk(session.logFileId) : null;
  if (!log?.url) {
    await failSession(sequelize, sessionId, "The uploaded file is missing from storage; upload it again.");
    return (await session.reload());
  }
  let first: { bytes: Buffer; complete: boolean };
  try {
    first = await readFirstBytes(log.url);
  } catch (e) {
    await failSession(sequelize, sessionId, `The uploaded file could not be read back from storage: ${(e as Error).message}. Try the re-import button in a minute.`);
    return (await session.reload());
  }
  const sniff = sniffFormat(first.bytes, log.name, first.complete);
  if (sniff.format === "rejected") {
    await failSession(sequelize, sessionId, sniff.reason);
    return (await session.reload());
  }
  if (sniff.format !== "csv") {
    const preview: ImportPreview = { format: sniff.format, fileName: log.name };
    await session.update({ status: "queued", statusReason: null, progress: 0, mapping: null, summary: { preview } });
    await enqueueJob(sequelize, sessionId);
    return session;
  }
  let header: CsvHeader;
  try {
    header = readCsvHeader(first.bytes.toString("utf8").replace(/^\uFEFF/, ""), first.complete);
  } catch (e) {
    if (e instanceof IngestError) {
      await failSession(sequelize, sessionId, e.message);
      return (await session.reload());
    }
    throw e;
  }
  const signature = headerSignature(header.columns);
  const suggestion = suggestMapping(header.columns, header.sampleRows);
  const preview: ImportPreview = {
    format: "csv",
    fileName: log.name,
    header: { delimiter: header.delimiter, decimalComma: header.decimalComma, metadata: header.metadata, columns: header.columns, sampleRows: header.sampleRows.slice(0, 5), headerLine: header.headerLine },
    suggestion,
    signature,
  };
  const stored = await ImportProfile.findOne({ where: { teamId: session.teamId, headerSignature: signature } });
  const profile = opts.forceMapping ? null : stored;
  if (profile) {
    await session.update({ status: "queued", statusReason: null, progress: 0, mapping: profile.mapping, importProfileId: profile.id, summary: { preview } });
    await enqueueJob(sequelize, sessionId);
  } else {
    // Mapped again: start from the team's profile for this header as it is now (edited since, perhaps),
    // else from the session's own mapping. What the last analysis left (its summary) stays beside the new preview until the file is read again.
    const kept = opts.forceMapping ? ((session.summary ?? {}) as Record<string, unknown>) : {};
    await session.update({ status: "mapping", statusReason: null, progress: 0, mapping: opts.forceMapping ? (stored?.mapping ?? session.mapping ?? suggestion) : suggestion, summary: { ...kept, preview } });
  }
  return session;
}

export const mappingSchema = z.object({
  timeFormat: z.enum(["seconds", "milliseconds", "iso8601"]),
  duplicateTimes: z.enum(["refuse", "keepFirst"]).optional(),
  columns: z
    .array(
      z.object({
        index: z.number().int().min(0),
        name: z.string().min(1).max(160),
        role: z.enum([...CHANNEL_ROLES, "ignore"] as [string, ...string[]]),
        unit: z.string().max(24),
        scale: z.number().finite(),
        offset: z.number().finite(),
      }),
    )
    .min(2, "Map at least a time column and one channel"),
});

/** Check a mapping a person submitted: exactly one time column, no role given twice (except "other"/"ignore"). */
export function validateMapping(m: Mapping): string[] {
  const problems: string[] = [];
  const times = m.columns.filter((c) => c.role === "time");
  if (times.length !== 1) problems.push(times.length === 0 ? "Choose which column is the time." : "Only one column can be the time.");
  const seen = new Map<string, string>();
  for (const c of m.columns) {
    if (c.role === "ignore" || c.role === "other" || c.role === "time") continue;
    const before = seen.get(c.role);
    if (before) problems.push(`"${before}" and "${c.name}" are both mapped to ${c.role}; a role can be used once.`);
    seen.set(c.role, c.name);
  }
  if (!m.columns.some((c) => c.role !== "time" && c.role !== "ignore")) problems.push("Map at least one channel besides time.");
  return problems;
}

/**
 * The person confirmed a mapping: save it as the team's Import profile for this header and queue
 * the parse. With `updateProfile: false` and a profile for this header already there, the profile
 * stays as it is and the mapping applies to this session only.
 */
export async function confirmMapping(sequelize: Sequelize, teamId: string, sessionId: number, mapping: Mapping, profileName: string, opts: { updateProfile?: boolean } = {}): Promise<void> {
  initModels(sequelize);
  const session = await RideSession.findOne({ where: { id: sessionId, teamId } });
  if (!session) throw new HttpError(404, "Session was not found in your team.");
  if (session.status === "queued" || session.status === "parsing") throw new HttpError(409, "This session is being read already; wait for it to finish before changing the mapping.");
  const preview = (session.summary as { preview?: ImportPreview } | null)?.preview;
  if (!preview?.signature || !preview.header) throw new HttpError(409, "This session has no CSV header to map. Re-import it first.");
  const known = new Set(preview.header.columns.map((c) => c.index));
  const unknown = mapping.columns.find((c) => !known.has(c.index));
  if (unknown) throw new HttpError(422, `Column ${unknown.index + 1} is not in this file's header.`);
  const problems = validateMapping(mapping);
  if (problems.length) throw new HttpError(422, problems.join(" "));
  const profileId = await sequelize.transaction(async (t) => {
    const existing = await ImportProfile.findOne({ where: { teamId, headerSignature: preview.signature }, transaction: t });
    if (existing && opts.updateProfile === false) {
      await session.update({ mapping, importProfileId: null, status: "queued", statusReason: null, progress: 0 }, { transaction: t });
      return null;
    }
    await sequelize.query(
      `INSERT INTO import_profiles (team_id, name, header_signature, format, mapping) VALUES (?, ?, ?, 'csv', ?)
       ON DUPLICATE KEY UPDATE name = VALUES(name), mapping = VALUES(mapping), updated_at = CURRENT_TIMESTAMP(3)`,
      { replacements: [teamId, profileName.slice(0, 160), preview.signature, JSON.stringify(mapping)], transaction: t, type: QueryTypes.INSERT },
    );
    const p = await ImportProfile.findOne({ where: { teamId, headerSignature: preview.signature }, transaction: t });
    await session.update({ mapping, importProfileId: p?.id ?? null, status: "queued", statusReason: null, progress: 0 }, { transaction: t });
    return p?.id ?? null;
  });
  void profileId;
  await enqueueJob(sequelize, sessionId);
}

// The calling convention of the app (upload route, server actions): no database handle.

/** Registers a completed upload for the team and user the upload grant was issued to. */
export function registerTeamUpload(input: RegisterUploadInput): Promise<{ sessionId: number; duplicateOf?: number }> {
  return registerUpload(getSequelize(), input);
}

/** Resolves a held duplicate within the caller's team. */
export function resolveTeamDuplicate(ctx: { teamId: string }, sessionId: number, choice: "existing" | "import"): Promise<{ sessionId: number; status: string }> {
  return resolveDuplicate(getSequelize(), ctx.teamId, sessionId, choice);
}
