import "server-only";
/**
 * Import profiles a team can manage: each profile is the column mapping saved for one CSV header
 * (by its signature), reused for every later file with that header. Listed with their columns,
 * when they were last used and the sessions they read; renamed, edited or deleted by engineers
 * and owners. Editing a profile changes how the next file is read; a session already read keeps
 * its data until someone maps it again from its page.
 */
import { QueryTypes } from "sequelize";
import { z } from "zod";
import { initModels, ImportProfile } from "@/models";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError, notFound } from "@/lib/http/http-error";
import type { Mapping, MappedColumn } from "@/lib/ingest/mapping";
import { mappingSchema, validateMapping } from "./imports";
import { assertCanEditSetup } from "./setup-access";
import { jsonColumn } from "./json-column";
import { importFormSchema } from "@/lib/forms/session-form";
import { fieldErrors } from "@/lib/forms/form-state";

export interface ImportProfileSessionRef {
  id: number;
  title: string;
  status: string;
  createdAt: string;
}

export interface ImportProfileView {
  id: number;
  name: string;
  format: string;
  timeFormat: Mapping["timeFormat"];
  columns: MappedColumn[];
  createdAt: string;
  updatedAt: string;
  /** When a session last read a file with this profile (null if none yet). */
  lastUsedAt: string | null;
  sessionCount: number;
  /** The latest sessions it read, newest first (at most 20). */
  sessions: ImportProfileSessionRef[];
}

const profileNameSchema = importFormSchema.shape.profileName;

export const profileEditSchema = z.object({
  name: profileNameSchema,
  timeFormat: mappingSchema.shape.timeFormat,
  columns: z.array(
    z.object({
      index: z.number().int().min(0),
      role: mappingSchema.shape.columns.element.shape.role,
      unit: z.string().trim().max(24, "At most 24 characters"),
      scale: z.number({ message: "Enter a number" }).finite("Enter a finite number"),
      offset: z.number({ message: "Enter a number" }).finite("Enter a finite number"),
    }),
  ),
});
export type ProfileEditInput = z.input<typeof profileEditSchema>;

async function ownProfile(ctx: Pick<TeamContext, "teamId">, id: number): Promise<ImportProfile> {
  initModels();
  const row = Number.isInteger(id) && id > 0 ? await ImportProfile.findOne({ where: { id, teamId: ctx.teamId } }) : null;
  if (!row) throw notFound("Import profile");
  return row;
}

function mappingOf(p: ImportProfile): Mapping {
  const m = jsonColumn<Mapping>(p.mapping);
  return { timeFormat: m?.timeFormat ?? "seconds", columns: m?.columns ?? [] };
}

/** The team's Import profiles with columns, last use and the sessions they read (engineers and owners). */
export async function listImportProfiles(ctx: TeamContext): Promise<ImportProfileView[]> {
  assertCanEditSetup(ctx);
  initModels();
  const rows = await ImportProfile.findAll({ where: { teamId: ctx.teamId }, order: [["updatedAt", "DESC"], ["id", "DESC"]] });
  if (rows.length === 0) return [];
  const sessions = await getSequelize().query<{ id: number; title: string | null; status: string; createdAt: Date | string; profileId: number }>(
    `SELECT id, title, status, created_at AS createdAt, import_profile_id AS profileId FROM ride_sessions
     WHERE team_id = ? AND import_profile_id IN (?) ORDER BY created_at DESC, id DESC`,
    { replacements: [ctx.teamId, rows.map((r) => r.id)], type: QueryTypes.SELECT },
  );
  const iso = (d: Date | string) => new Date(d).toISOString();
  return rows.map((p) => {
    const mine = sessions.filter((s) => Number(s.profileId) === p.id);
    const m = mappingOf(p);
    return {
      id: p.id,
      name: p.name,
      format: p.format,
      timeFormat: m.timeFormat,
      columns: m.columns,
      createdAt: p.createdAt.toISOString(),
      updatedAt: p.updatedAt.toISOString(),
      lastUsedAt: mine[0] ? iso(mine[0].createdAt) : null,
      sessionCount: mine.length,
      sessions: mine.slice(0, 20).map((s) => ({ id: Number(s.id), title: s.title ?? `Session ${s.id}`, status: s.status, createdAt: iso(s.createdAt) })),
    };
  });
}

/**
 * Rename a profile and change its columns' roles, units and calibration. The columns themselves
 * (which field, which name) belong to the header and stay; the same rules as the mapping screen apply.
 */
export async function updateImportProfile(ctx: TeamContext, id: number, raw: unknown): Promise<void> {
  assertCanEditSetup(ctx);
  const p = await ownProfile(ctx, id);
  const input = profileEditSchema.parse(raw);
  const before = mappingOf(p);
  const byIndex = new Map(before.columns.map((c) => [c.index, c]));
  const errors: Record<string, string> = {};
  input.columns.forEach((c, i) => {
    if (!byIndex.has(c.index)) errors[`columns.${i}.role`] = `Column ${c.index + 1} is not in this profile's header.`;
  });
  if (input.columns.length !== before.columns.length) errors.columns = "Every column of the header must stay in the profile.";
  if (Object.keys(errors).length) throw new HttpError(422, "The columns do not fit this profile's header.", errors);
  const mapping = mappingSchema.parse({
    timeFormat: input.timeFormat,
    columns: input.columns.map((c) => ({ index: c.index, name: byIndex.get(c.index)!.name, role: c.role, unit: c.unit, scale: c.scale, offset: c.offset })),
  }) as Mapping;
  // Units are checked like on the mapping screen (same schema, with the profile's name as the form's).
  const check = importFormSchema.safeParse({ title: p.name, kind: "practice", eventId: "", bikeId: "", engineId: "", riderId: "", startedAt: "", conditions: "", sharedWithRiders: false, profileName: input.name, timeFormat: input.timeFormat, columns: input.columns });
  if (!check.success) {
    // Only the fields this card shows; the form's profile name is the card's "name".
    const errors = Object.fromEntries(
      Object.entries(fieldErrors(check.error))
        .filter(([key]) => key.startsWith("columns") || key === "timeFormat" || key === "profileName")
        .map(([key, message]) => [key === "profileName" ? "name" : key, message]),
    );
    if (Object.keys(errors).length) throw new HttpError(422, "Some columns need another look.", errors);
  }
  const problems = validateMapping(mapping);
  if (problems.length) throw new HttpError(422, problems.join(" "));
  await p.update({ name: input.name, mapping });
}

/** Delete a profile: the next file with its header opens the mapping screen again. Sessions it read keep their data. */
export async function deleteImportProfile(ctx: TeamContext, id: number): Promise<void> {
  assertCanEditSetup(ctx);
  const p = await ownProfile(ctx, id);
  await p.destroy();
}
