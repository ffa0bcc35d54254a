"use server";
/** Track server actions: create (optionally from a session's GPS) and save the gate editor. */
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { createTrack, saveTrack } from "@/lib/data/track-editor";
import { parseId } from "@/lib/http/parse-id";
import { formValues, withSetupRole, type SetupActionState } from "./setup-state";
import { recordActivity } from "@/lib/data/activity-log";

export async function createTrackAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  const sessionId = values.sessionId ? parseId(values.sessionId) : null;
  if (values.sessionId && !sessionId) return { ok: false, status: 422, errors: { sessionId: "Choose a session from the list" }, values };
  const state = await withSetupRole(values, async (ctx) => {
    const { id } = await createTrack(ctx, { name: values.name ?? "", sessionId });
    return { ok: true, id };
  });
  if (!state.ok || !state.id) return state;
  revalidatePath("/tracks");
  redirect(`/tracks/${state.id}`);
}

/** The editor sends the whole track as JSON in `payload`. */
export async function saveTrackAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const trackId = parseId(String(form.get("trackId") ?? ""));
  let payload: unknown;
  try {
    payload = JSON.parse(String(form.get("payload") ?? ""));
  } catch {
    return { ok: false, status: 422, message: "The editor sent something that is not a track. Reload the page and try again." };
  }
  return withSetupRole({}, async (ctx) => {
    if (!trackId) return { ok: false, status: 404, message: "Track was not found in your team." };
    const r = await saveTrack(ctx, trackId, payload);
    await recordActivity(ctx, { action: "track.save", subjectType: "track", subjectId: trackId, summary: `Saved track gates and corners; ${r.reanalysed} sessions analysed again` });
    revalidatePath("/tracks");
    revalidatePath(`/tracks/${trackId}`);
    const again = r.reanalysed === 0 ? "No analysed sessions on it yet." : r.reanalysed === 1 ? "1 session analysed again." : `${r.reanalysed} sessions analysed again.`;
    return { ok: true, id: trackId, message: `Track saved. ${again}` };
  });
}
