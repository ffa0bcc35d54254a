"use server";
/**
 * Saving findings thresholds from Settings: guard (setup:edit), zod on the form (values arrive in
 * the shown unit and are converted back to SI), then the save, which reanalyses the sessions.
 */
import { revalidatePath } from "next/cache";
import { requiredId } from "@/lib/forms/form-state";
import { z } from "zod";
import { actionTeam } from "@/lib/auth/page-guard";
import { saveBikeThresholds, saveTrackThresholds, type ThresholdOverrides } from "@/lib/data/thresholds";
import { BIKE_THRESHOLD_FIELDS, TRACK_THRESHOLD_FIELDS } from "@/lib/findings/threshold-settings";
import { HttpError } from "@/lib/http/http-error";
import { recordActivity } from "@/lib/data/activity-log";

export interface ThresholdState {
  ok?: boolean;
  message?: string;
  errors?: Record<string, string>;
}

const head = z.object({ scope: z.enum(["bike", "track"]), id: requiredId("Choose a bike or track.") });

export async function saveThresholdsAction(_prev: ThresholdState, form: FormData): Promise<ThresholdState> {
  const g = await actionTeam({ permission: { setup: ["edit"] } });
  if (!g.ctx) return { ok: false, message: g.error };
  const h = head.safeParse({ scope: form.get("scope"), id: String(form.get("id") ?? "") });
  if (!h.success) return { ok: false, message: "Choose a bike or track." };
  const fields = h.data.scope === "bike" ? BIKE_THRESHOLD_FIELDS : TRACK_THRESHOLD_FIELDS;
  const values: ThresholdOverrides = {};
  const errors: Record<string, string> = {};
  for (const f of fields) {
    const raw = String(form.get(f.key) ?? "").trim().replace(",", ".");
    // Empty means "use the default".
    if (raw === "") continue;
    const r = z.coerce.number().min(f.min).max(f.max).safeParse(raw);
    if (!r.success) errors[f.key] = `Enter a number from ${f.min} to ${f.max} ${f.unit}`;
    else values[f.key] = r.data / f.factor;
  }
  if (Object.keys(errors).length) return { ok: false, errors, message: "Some values are out of range; nothing was saved." };
  try {
    const res = h.data.scope === "bike" ? await saveBikeThresholds(g.ctx, h.data.id, values) : await saveTrackThresholds(g.ctx, h.data.id, values);
    await recordActivity(g.ctx, { action: "thresholds.save", subjectType: h.data.scope, subjectId: h.data.id, summary: `Saved ${h.data.scope} thresholds (${Object.keys(values).join(", ") || "all defaults"})` });
    revalidatePath("/settings");
    revalidatePath("/home");
    return { ok: true, message: `Saved. ${res.reanalysed} session${res.reanalysed === 1 ? "" : "s"} reanalysed with the new thresholds.` };
  } catch (e) {
    if (e instanceof HttpError) return { ok: false, message: e.message };
    throw e;
  }
}
