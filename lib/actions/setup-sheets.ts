"use server";
/**
 * Saving a session's setup sheet as a new version. The role check (setup:edit) runs first in
 * withSetupRole; the session's team and visibility, the fields and the version race are checked
 * by saveSetupSheet, so the rules hold for any caller, not just this form.
 */
import { revalidatePath } from "next/cache";
import { saveSetupSheet, SETUP_FIELDS } from "@/lib/data/setup-sheets";
import { parseId } from "@/lib/http/parse-id";
import { formValues, withSetupRole, type SetupActionState } from "./setup-state";
import { recordActivity } from "@/lib/data/activity-log";

export async function saveSetupSheetAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  return withSetupRole(values, async (ctx) => {
    const sessionId = parseId(values.sessionId);
    if (!sessionId) return { ok: false, status: 404, message: "Session was not found in your team." };
    const baseVersion = Number(values.baseVersion ?? "0");
    const fields = Object.fromEntries(SETUP_FIELDS.map((f) => [f.name, values[f.name] ?? ""]));
    const saved = await saveSetupSheet(ctx, sessionId, { baseVersion: Number.isInteger(baseVersion) && baseVersion >= 0 ? baseVersion : -1, values: fields });
    await recordActivity(ctx, { action: "setup.save", subjectType: "setup_sheet", subjectId: saved.id, sessionId, summary: `Saved setup version ${saved.version} (${saved.changed.length} changed: ${saved.changed.join(", ")})` });
    revalidatePath(`/sessions/${sessionId}`);
    const n = saved.changed.length;
    return { ok: true, id: saved.id, message: `Version ${saved.version} saved (${n} ${n === 1 ? "field" : "fields"} changed).` };
  });
}
