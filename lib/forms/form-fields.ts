/**
 * zod pieces for form fields that arrive as strings (FormData): empty means "not set", numbers
 * get a range with the unit in the message. Browser-safe, no database.
 */
import { z } from "zod";

/** An optional number field: "" → null; otherwise a number within [min, max] (unit in messages). */
export function optionalNumber(label: string, min: number, max: number, unit = "", opts: { integer?: boolean } = {}) {
  const u = unit ? ` ${unit}` : "";
  return z
    .string()
    .trim()
    .transform((s) => s.replace(",", "."))
    .refine((s) => s === "" || Number.isFinite(Number(s)), `${label} must be a number${unit ? ` in ${unit}` : ""}`)
    .transform((s) => (s === "" ? null : Number(s)))
    .refine((n) => n === null || !opts.integer || Number.isInteger(n), `${label} must be a whole number`)
    .refine((n) => n === null || (n >= min && n <= max), `${label} must be between ${min}${u} and ${max}${u}`);
}

/** A required number field. */
export function requiredNumber(label: string, min: number, max: number, unit = "") {
  return optionalNumber(label, min, max, unit).refine((n): n is number => n !== null, `Enter the ${label.toLowerCase()}`);
}

// The id field and zod issues → field errors have one home, lib/forms/form-state.ts.
export { fieldErrors, optionalId } from "@/lib/forms/form-state";
