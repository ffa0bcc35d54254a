"use server";
/** Moving an engine between bikes and recording a rebuild, each with a dated record (engineers and the owner). */
import { revalidatePath } from "next/cache";
import { moveEngine, recordRebuild } from "@/lib/data/engine-season";
import { parseId } from "@/lib/http/parse-id";
import { recordActivity } from "@/lib/data/activity-log";
import { formValues, withSetupRole, type SetupActionState } from "./setup-state";

export async function moveEngineAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  return withSetupRole(values, async (ctx) => {
    const id = parseId(values.engineId);
    if (!id) return { ok: false, status: 404, message: "Engine was not found in your team." };
    const r = await moveEngine(ctx, id, { toBikeId: values.toBikeId ?? "", onDate: values.onDate ?? "", note: values.note ?? "" });
    await recordActivity(ctx, { action: "engine.move", subjectType: "engine", subjectId: id, summary: `Moved engine ${r.serial} on ${values.onDate}` });
    revalidatePath("/engines");
    return { ok: true, message: `Engine ${r.serial} moved; the move is on record.` };
  });
}

export async function recordRebuildAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  return withSetupRole(values, async (ctx) => {
    const id = parseId(values.engineId);
    if (!id) return { ok: false, status: 404, message: "Engine was not found in your team." };
    const r = await recordRebuild(ctx, id, { onDate: values.onDate ?? "", note: values.note ?? "" });
    await recordActivity(ctx, { action: "engine.rebuild", subjectType: "engine", subjectId: id, summary: `Recorded a rebuild of engine ${r.serial} on ${values.onDate} after ${r.hoursBefore.toFixed(1)} h` });
    revalidatePath("/engines");
    return { ok: true, message: `Rebuild of ${r.serial} recorded; its count starts again from zero.` };
  });
}
