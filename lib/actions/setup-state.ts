import "server-only";
/**
 * The common frame of the setup screens' server actions (tracks, bikes, engines, events):
 * role check first, then the lib/data call; errors come back to the form field by field with the
 * HTTP-like status, so a form (and a test) can tell 403 from 404 from 422.
 */
import { ZodError } from "zod";
import { actionTeam } from "@/lib/auth/page-guard";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import { fieldErrors } from "@/lib/forms/form-fields";

export interface SetupActionState {
  ok?: boolean;
  message?: string;
  /** Field name (dotted path) → message. */
  errors?: Record<string, string>;
  status?: number;
  /** What was submitted, so the form shows it again after a refused save. */
  values?: Record<string, string>;
  id?: number;
}

export function formValues(form: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === "string" && !k.startsWith("$")) out[k] = v;
  return out;
}

export async function withSetupRole(values: Record<string, string>, fn: (ctx: TeamContext) => Promise<SetupActionState>): Promise<SetupActionState> {
  const g = await actionTeam({ permission: { setup: ["edit"] } });
  if (!g.ctx) return { ok: false, message: g.error, status: g.status, values };
  try {
    return await fn(g.ctx);
  } catch (e) {
    if (e instanceof ZodError) return { ok: false, status: 422, errors: fieldErrors(e), message: "Nothing was saved: check the fields marked in red.", values };
    if (e instanceof HttpError) {
      const details = e.details && typeof e.details === "object" ? (e.details as Record<string, string>) : undefined;
      return { ok: false, status: e.status, message: e.message, errors: details, values };
    }
    throw e;
  }
}
