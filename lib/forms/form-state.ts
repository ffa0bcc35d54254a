/**
 * What a server action answers a form, and the one way zod issues become field errors. Browser-safe
 * (no database): the same helpers serve the server actions and the forms that show their answer.
 */
import { z } from "zod";
import { parseId } from "@/lib/http/parse-id";

/** A form action's answer: a message, and errors by field path ("title", "columns.3.unit"). */
export interface FormState {
  ok?: boolean;
  message?: string;
  /** Dotted field path → message; "form" for an issue about the whole form. */
  errors?: Record<string, string>;
}

type IssueLike = { readonly path: readonly PropertyKey[]; readonly message: string };

/**
 * Zod issues (or a ZodError) → errors by dotted field path, the first message per field: a form
 * shows one message under each field, the one zod found first.
 */
export function fieldErrors(issues: z.ZodError | readonly IssueLike[]): Record<string, string> {
  const list = issues instanceof z.ZodError ? issues.issues : issues;
  const out: Record<string, string> = {};
  for (const i of list) out[i.path.map(String).join(".") || "form"] ??= i.message;
  return out;
}

/** A select of team rows as a form field: "" = none chosen, otherwise an id by parseId's rule. */
export const optionalId = z
  .string()
  .trim()
  .refine((s) => s === "" || parseId(s) !== null, "Choose one from the list")
  .transform((s) => (s === "" ? null : (parseId(s) as number)));

/** A required id field (a hidden input naming the row acted on), by parseId's rule. */
export function requiredId(message: string) {
  return z
    .string()
    .trim()
    .refine((s) => parseId(s) !== null, message)
    .transform((s) => parseId(s) as number);
}
