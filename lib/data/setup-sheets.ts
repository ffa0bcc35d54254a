import "server-only";
/**
 * A session's setup sheet as a chain of versions: every save adds a row with the next version
 * number, its author and time, and nothing is ever overwritten, so the team can see what the bike
 * was running in each outing and what changed between them. Engineers and
 * owners save (setup:edit); everyone who may see the session reads it.
 */
import { QueryTypes } from "sequelize";
import { z } from "zod";
import { initModels, RideSession, SetupSheet, Bike } from "@/models";
import { roleCan, type TeamContext } from "@/lib/auth/guard";
import { HttpError, forbidden } from "@/lib/http/http-error";
import { optionalNumber } from "@/lib/forms/form-fields";
import { jsonColumn } from "./json-column";
import { getSessionForViewer } from "./session-for-viewer";

export type SetupGroup = "fork" | "shock" | "tyres" | "gearing" | "electronics" | "notes";

export const SETUP_GROUPS: { id: SetupGroup; label: string }[] = [
  { id: "fork", label: "Fork" },
  { id: "shock", label: "Shock" },
  { id: "tyres", label: "Tyres" },
  { id: "gearing", label: "Gearing" },
  { id: "electronics", label: "Electronics" },
  { id: "notes", label: "Notes" },
];

/** One field of the sheet; plain data, so the page can hand it to the client form. */
export interface SetupFieldDef {
  name: string;
  label: string;
  group: SetupGroup;
  kind: "number" | "text" | "longtext";
  unit?: string;
  min?: number;
  max?: number;
  integer?: boolean;
  maxLength?: number;
}

// Ranges are wide on purpose: they catch typing slips (a rear spring of 9.5, a pressure in psi),
// not a team's unusual but real setting. Clicks are counted out from fully closed, as most
// adjusters are read; units sit in the names so a stored sheet explains itself.
export const SETUP_FIELDS: SetupFieldDef[] = [
  { name: "forkSpringNmm", label: "Fork spring rate", group: "fork", kind: "number", unit: "N/mm", min: 2, max: 30 },
  { name: "forkPreloadMm", label: "Fork preload", group: "fork", kind: "number", unit: "mm", min: 0, max: 30 },
  { name: "forkCompressionClicks", label: "Fork compression", group: "fork", kind: "number", unit: "clicks out", min: 0, max: 50, integer: true },
  { name: "forkReboundClicks", label: "Fork rebound", group: "fork", kind: "number", unit: "clicks out", min: 0, max: 50, integer: true },
  { name: "forkOilLevelMm", label: "Fork oil level", group: "fork", kind: "number", unit: "mm", min: 30, max: 250 },
  { name: "forkHeightMm", label: "Fork height in the clamps", group: "fork", kind: "number", unit: "mm", min: -10, max: 50 },
  { name: "shockSpringNmm", label: "Shock spring rate", group: "shock", kind: "number", unit: "N/mm", min: 30, max: 300 },
  { name: "shockPreloadMm", label: "Shock preload", group: "shock", kind: "number", unit: "mm", min: 0, max: 40 },
  { name: "shockCompressionLowClicks", label: "Shock low-speed compression", group: "shock", kind: "number", unit: "clicks out", min: 0, max: 50, integer: true },
  { name: "shockCompressionHighClicks", label: "Shock high-speed compression", group: "shock", kind: "number", unit: "clicks out", min: 0, max: 50, integer: true },
  { name: "shockReboundClicks", label: "Shock rebound", group: "shock", kind: "number", unit: "clicks out", min: 0, max: 50, integer: true },
  { name: "rideHeightMm", label: "Rear ride height adjuster", group: "shock", kind: "number", unit: "mm", min: -20, max: 60 },
  { name: "tyreFrontCompound", label: "Front compound", group: "tyres", kind: "text", maxLength: 40 },
  { name: "tyreRearCompound", label: "Rear compound", group: "tyres", kind: "text", maxLength: 40 },
  { name: "tyreFrontColdBar", label: "Front cold pressure", group: "tyres", kind: "number", unit: "bar", min: 1, max: 3.5 },
  { name: "tyreRearColdBar", label: "Rear cold pressure", group: "tyres", kind: "number", unit: "bar", min: 1, max: 3.5 },
  { name: "sprocketFrontTeeth", label: "Front sprocket", group: "gearing", kind: "number", unit: "teeth", min: 10, max: 25, integer: true },
  { name: "sprocketRearTeeth", label: "Rear sprocket", group: "gearing", kind: "number", unit: "teeth", min: 25, max: 60, integer: true },
  { name: "tractionControlLevel", label: "Traction control level", group: "electronics", kind: "number", min: 0, max: 20, integer: true },
  { name: "engineBrakeLevel", label: "Engine brake level", group: "electronics", kind: "number", min: 0, max: 20, integer: true },
  { name: "engineMap", label: "Engine map", group: "electronics", kind: "text", maxLength: 20 },
  { name: "notes", label: "Setup notes", group: "notes", kind: "longtext", maxLength: 2000 },
];

export type SetupValue = number | string | null;
export type SetupValues = Record<string, SetupValue>;

function fieldSchema(f: SetupFieldDef) {
  if (f.kind === "number") return optionalNumber(f.label, f.min!, f.max!, f.unit && !f.unit.startsWith("clicks") ? f.unit : "", { integer: f.integer });
  return z
    .string()
    .trim()
    .max(f.maxLength!, `${f.label} must be at most ${f.maxLength} characters`)
    .transform((s) => (s === "" ? null : s));
}

/** The sheet's fields as they arrive from a form (strings; empty = not recorded). */
export const setupSheetSchema = z.object(Object.fromEntries(SETUP_FIELDS.map((f) => [f.name, z.string().default("").pipe(fieldSchema(f))]))) as unknown as z.ZodType<SetupValues, Record<string, string | undefined>>;

/** Only the known fields, in their order; anything else in a stored row is ignored. */
function normalise(raw: unknown): SetupValues {
  const obj = jsonColumn<Record<string, unknown>>(raw) ?? {};
  const out: SetupValues = {};
  for (const f of SETUP_FIELDS) {
    const v = obj[f.name];
    out[f.name] = typeof v === "number" || typeof v === "string" ? v : null;
  }
  return out;
}

/** Names of the fields whose value differs between two versions (a field set or cleared counts). */
export function changedFields(prev: SetupValues | null, next: SetupValues): string[] {
  if (!prev) return [];
  return SETUP_FIELDS.filter((f) => (prev[f.name] ?? null) !== (next[f.name] ?? null)).map((f) => f.name);
}

export interface SetupVersion {
  id: number;
  version: number;
  values: SetupValues;
  /** Fields that differ from the version before this one (none for version 1). */
  changed: string[];
  /** The previous version's values of the changed fields, for "was …" marks. */
  previous: SetupValues;
  authorId: string | null;
  authorName: string | null;
  createdAt: string;
}

export interface SetupSheetView {
  sessionId: number;
  fields: SetupFieldDef[];
  groups: typeof SETUP_GROUPS;
  /** Newest first; empty when nothing was saved yet. */
  versions: SetupVersion[];
  /** What an editor starts from when no version exists yet (the bike's sprockets, if known). */
  starting: SetupValues;
  canEdit: boolean;
}

export async function userNames(ids: (string | null)[]): Promise<Map<string, string>> {
  const unique = [...new Set(ids.filter((x): x is string => !!x))];
  const out = new Map<string, string>();
  if (unique.length === 0) return out;
  const rows = await initModels().query<{ id: string; name: string }>(`SELECT id, name FROM user WHERE id IN (${unique.map(() => "?").join(",")})`, {
    replacements: unique,
    type: QueryTypes.SELECT,
  });
  for (const r of rows) out.set(r.id, r.name);
  return out;
}

/** The session's setup versions, newest first. 404 when the caller may not see the session. */
export async function getSetupSheetView(ctx: TeamContext, sessionId: number): Promise<SetupSheetView> {
  const session = await getSessionForViewer(ctx, sessionId);
  const rows = await SetupSheet.findAll({ where: { teamId: ctx.teamId, sessionId: session.id }, order: [["version", "ASC"], ["id", "ASC"]] });
  const names = await userNames(rows.map((r) => r.createdBy));
  const ascending: SetupVersion[] = [];
  let prev: SetupValues | null = null;
  for (const r of rows) {
    const values = normalise(r.fields);
    const changed = changedFields(prev, values);
    const previous: SetupValues = {};
    for (const k of changed) previous[k] = prev?.[k] ?? null;
    ascending.push({ id: r.id, version: r.version, values, changed, previous, authorId: r.createdBy, authorName: r.createdBy ? (names.get(r.createdBy) ?? null) : null, createdAt: r.createdAt.toISOString() });
    prev = values;
  }
  const starting = normalise({});
  if (rows.length === 0 && session.bikeId) {
    const bike = await Bike.findOne({ where: { id: session.bikeId, teamId: ctx.teamId }, attributes: ["sprocketFront", "sprocketRear"] });
    starting.sprocketFrontTeeth = bike?.sprocketFront ?? null;
    starting.sprocketRearTeeth = bike?.sprocketRear ?? null;
  }
  return { sessionId: session.id, fields: SETUP_FIELDS, groups: SETUP_GROUPS, versions: ascending.reverse(), starting, canEdit: roleCan(ctx.role, { setup: ["edit"] }) };
}

export interface SaveSetupInput {
  /** The version the editor started from (0 when there was none): a save on top of a newer one is refused. */
  baseVersion: number;
  values: Record<string, string | undefined>;
}

/**
 * Save the sheet as a new version. 403 for roles without setup:edit (checked before anything is
 * looked up), 404 for a session the caller may not see, 422 (ZodError) for bad fields, 409 when
 * someone saved in between, and a refusal when nothing changed (an empty version helps nobody).
 */
export async function saveSetupSheet(ctx: TeamContext, sessionId: number, input: SaveSetupInput): Promise<{ id: number; version: number; changed: string[] }> {
  if (!roleCan(ctx.role, { setup: ["edit"] })) throw forbidden("Only engineers and the owner edit setup sheets.");
  const session = await getSessionForViewer(ctx, sessionId);
  const values = setupSheetSchema.parse(input.values);
  const sequelize = initModels();
  return sequelize.transaction(async (transaction) => {
    // Locking the session row serialises saves of one session, so two editors can never both
    // write "version 3"; the table has no unique key on (session, version) to do it for us.
    await RideSession.findOne({ where: { id: session.id, teamId: ctx.teamId }, lock: transaction.LOCK.UPDATE, transaction, attributes: ["id"] });
    const latest = await SetupSheet.findOne({ where: { teamId: ctx.teamId, sessionId: session.id }, order: [["version", "DESC"]], lock: transaction.LOCK.UPDATE, transaction });
    const latestVersion = latest?.version ?? 0;
    if (latestVersion !== input.baseVersion) {
      throw new HttpError(409, `Version ${latestVersion} was saved while you were editing. Reload the page to see it, then make your change again.`);
    }
    const prev = latest ? normalise(latest.fields) : null;
    const changed = prev ? changedFields(prev, values) : SETUP_FIELDS.filter((f) => values[f.name] != null).map((f) => f.name);
    if (changed.length === 0) {
      throw new HttpError(422, prev ? `Nothing changed since version ${latestVersion}, so no new version was saved.` : "Fill in at least one field before saving.");
    }
    const row = await SetupSheet.create({ teamId: ctx.teamId, sessionId: session.id, bikeId: session.bikeId, version: latestVersion + 1, fields: values, createdBy: ctx.userId }, { transaction });
    return { id: row.id, version: row.version, changed };
  });
}
