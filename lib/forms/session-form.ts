/**
 * The session-details and column-mapping forms' schemas. Browser-safe (no database): the same
 * schema checks the form in the browser (react-hook-form) and the submission in the server action.
 */
import { z } from "zod";
import { CHANNEL_ROLES, type ChannelRole } from "@/lib/channels/roles";
import { lookupUnit, ROLE_QUANTITY } from "@/lib/ingest/units";
import { optionalId } from "./form-state";

export const SESSION_KINDS = ["practice", "qualifying", "race", "test"] as const;
export type SessionKindValue = (typeof SESSION_KINDS)[number];
export const TIME_FORMATS = ["seconds", "milliseconds", "iso8601"] as const;
export const TIME_FORMAT_LABEL: Record<(typeof TIME_FORMATS)[number], string> = {
  seconds: "Seconds from the start",
  milliseconds: "Milliseconds from the start",
  iso8601: "ISO 8601 date and time",
};


/** `<input type="datetime-local">` value, read as UTC (all times on screen are UTC). */
const startedAt = z
  .string()
  .trim()
  .refine((s) => s === "" || (/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?$/.test(s) && !Number.isNaN(Date.parse(`${s}Z`))), "Enter a date and time, e.g. 2026-04-11 10:05")
  .transform((s) => (s === "" ? null : new Date(`${s}Z`)));

export const sessionDetailsSchema = z.object({
  title: z.string().trim().min(1, "Give the session a title").max(160, "At most 160 characters"),
  kind: z.enum(SESSION_KINDS, { error: "Choose practice, qualifying, race or test" }),
  eventId: optionalId,
  bikeId: optionalId,
  engineId: optionalId,
  riderId: optionalId,
  startedAt,
  conditions: z.string().trim().max(255, "At most 255 characters"),
  sharedWithRiders: z.boolean(),
});

export type SessionDetailsInput = z.input<typeof sessionDetailsSchema>;
export type SessionDetailsValues = z.output<typeof sessionDetailsSchema>;

const ROLE_OPTIONS = [...CHANNEL_ROLES, "ignore"] as [string, ...string[]];
/** Quantities whose values have no unit: an empty unit is fine. */
const UNITLESS = new Set(["count", "lambda"]);

const mappedColumnSchema = z.object({
  index: z.number().int().min(0),
  role: z.enum(ROLE_OPTIONS, { error: "Choose a role or ignore the column" }),
  unit: z.string().trim().max(24, "At most 24 characters"),
  scale: z.number({ error: "Enter a number" }).finite("Enter a finite number"),
  offset: z.number({ error: "Enter a number" }).finite("Enter a finite number"),
});

export const importFormSchema = sessionDetailsSchema.extend({
  profileName: z.string().trim().min(1, "Name the Import profile so the next upload can reuse it").max(160, "At most 160 characters"),
  /** When the team has a profile for this header already: save this mapping into it (true) or use it for this session only. */
  updateProfile: z.boolean().default(true),
  timeFormat: z.enum(TIME_FORMATS, { error: "Choose how the time column is written" }),
  columns: z.array(mappedColumnSchema).min(2, "Map at least a time column and one channel"),
}).superRefine((v, ctx) => {
  // The same rules the parser enforces, but reported on the column so the person sees where.
  // Runs even when other fields failed (see `when`), so every problem shows at once; hence the type guards.
  if (!Array.isArray(v.columns)) return;
  const times = v.columns.flatMap((c, i) => (c.role === "time" ? [i] : []));
  if (times.length === 0) ctx.addIssue({ code: "custom", path: ["timeFormat"], message: "Choose which column is the time" });
  for (const i of times.slice(1)) ctx.addIssue({ code: "custom", path: ["columns", i, "role"], message: "Only one column can be the time" });
  const firstWithRole = new Map<string, number>();
  v.columns.forEach((c, i) => {
    if (!c || typeof c.role !== "string") return;
    if (c.role === "ignore" || c.role === "other" || c.role === "time") return;
    const before = firstWithRole.get(c.role);
    if (before !== undefined) ctx.addIssue({ code: "custom", path: ["columns", i, "role"], message: `Already used by column ${before + 1}; a role can be used once` });
    else firstWithRole.set(c.role, i);
    const quantity = ROLE_QUANTITY[c.role as ChannelRole];
    if (!quantity || typeof c.unit !== "string") return;
    if (c.unit === "") {
      if (!UNITLESS.has(quantity)) ctx.addIssue({ code: "custom", path: ["columns", i, "unit"], message: "Choose the unit the values are in" });
      return;
    }
    const known = lookupUnit(c.unit);
    if (!known || known.quantity !== quantity) ctx.addIssue({ code: "custom", path: ["columns", i, "unit"], message: `Not a unit of ${quantity}` });
  });
  if (!v.columns.some((c) => c.role !== "time" && c.role !== "ignore")) ctx.addIssue({ code: "custom", path: ["columns"], message: "Map at least one channel besides time" });
}, { when: (payload) => Array.isArray((payload.value as { columns?: unknown } | undefined)?.columns) });

export type ImportFormInput = z.input<typeof importFormSchema>;
export type ImportFormValues = z.output<typeof importFormSchema>;

export type { FormState } from "./form-state";
