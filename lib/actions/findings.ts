"use server";
/**
 * Acknowledging a finding: guard (finding:acknowledge), zod on the form, the team check inside
 * acknowledgeFinding (another team's finding is 404), then the pages showing it are revalidated.
 */
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { actionTeam } from "@/lib/auth/page-guard";
import { acknowledgeFinding } from "@/lib/data/findings";
import { HttpError } from "@/lib/http/http-error";
import { recordActivity } from "@/lib/data/activity-log";
import { fieldErrors, requiredId } from "@/lib/forms/form-state";

export interface AcknowledgeState {
  ok?: boolean;
  message?: string;
  errors?: Record<string, string>;
}

const schema = z.object({
  findingId: requiredId("Choose a finding"),
  note: z.string().trim().min(1, "Write a short note: what was checked, or why it is fine").max(2000, "Keep the note under 2000 characters"),
});

export async function acknowledgeFindingAction(_prev: AcknowledgeState, form: FormData): Promise<AcknowledgeState> {
  const g = await actionTeam({ permission: { finding: ["acknowledge"] } });
  if (!g.ctx) return { ok: false, message: g.error };
  const parsed = schema.safeParse({ findingId: String(form.get("findingId") ?? ""), note: form.get("note") ?? "" });
  if (!parsed.success) return { ok: false, errors: fieldErrors(parsed.error) };
  try {
    const f = await acknowledgeFinding(g.ctx, parsed.data.findingId, parsed.data.note);
    await recordActivity(g.ctx, { action: "finding.acknowledge", subjectType: "finding", subjectId: f.id, sessionId: f.sessionId, summary: `Acknowledged finding: ${f.message.slice(0, 200)}${f.note ? ` — note: ${f.note.slice(0, 200)}` : ""}` });
    revalidatePath(`/sessions/${f.sessionId}`);
    revalidatePath("/home");
    return { ok: true, message: "Acknowledged." };
  } catch (e) {
    if (e instanceof HttpError) return { ok: false, message: e.message };
    throw e;
  }
}
