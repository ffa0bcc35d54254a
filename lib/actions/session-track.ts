"use server";
/** Session page: choose the session's track, or make one from its GPS with the suggested start/finish gate. */
import { revalidatePath } from "next/cache";
import { changeSessionTrack, createTrackWithSuggestedGate } from "@/lib/data/session-track";
import { parseId } from "@/lib/http/parse-id";
import { formValues, withSetupRole, type SetupActionState } from "./setup-state";

function revalidate(sessionId: number) {
  revalidatePath(`/sessions/${sessionId}`);
  revalidatePath("/sessions");
  revalidatePath("/tracks");
}

const lapsSaid = (n: number) => (n === 1 ? "1 lap" : `${n} laps`);

export async function changeSessionTrackAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  const sessionId = parseId(values.sessionId ?? "");
  const trackId = values.trackId ? parseId(values.trackId) : null;
  return withSetupRole(values, async (ctx) => {
    if (!sessionId) return { ok: false, status: 404, message: "Session was not found in your team." };
    if (values.trackId && !trackId) return { ok: false, status: 422, errors: { trackId: "Choose a track from the list" }, values };
    const r = await changeSessionTrack(ctx, sessionId, trackId);
    revalidate(sessionId);
    return { ok: true, message: trackId ? `Track changed; analysed again: ${lapsSaid(r.laps)}.` : "The session is on no track now." };
  });
}

export async function confirmSuggestedGateAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  const sessionId = parseId(values.sessionId ?? "");
  return withSetupRole(values, async (ctx) => {
    if (!sessionId) return { ok: false, status: 404, message: "Session was not found in your team." };
    const r = await createTrackWithSuggestedGate(ctx, sessionId, values.name ?? "");
    revalidate(sessionId);
    return { ok: true, id: r.trackId, message: `Track made; the session has ${lapsSaid(r.laps)}.` };
  });
}
