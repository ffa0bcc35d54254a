"use server";
/** Event (race meeting) server actions. */
import { revalidatePath } from "next/cache";
import { createEvent, updateEvent } from "@/lib/data/events";
import { parseId } from "@/lib/http/parse-id";
import { formValues, withSetupRole, type SetupActionState } from "./setup-state";

const FIELDS = ["name", "trackId", "startsOn", "endsOn"] as const;
const pick = (v: Record<string, string>) => Object.fromEntries(FIELDS.map((k) => [k, v[k] ?? ""]));

export async function createEventAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  return withSetupRole(values, async (ctx) => {
    const { id } = await createEvent(ctx, pick(values));
    revalidatePath("/events");
    return { ok: true, id, message: `${values.name?.trim()} added.` };
  });
}

export async function updateEventAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  return withSetupRole(values, async (ctx) => {
    const id = parseId(values.eventId);
    if (!id) return { ok: false, status: 404, message: "Event was not found in your team." };
    await updateEvent(ctx, id, pick(values));
    revalidatePath("/events");
    return { ok: true, id, message: `${values.name?.trim()} saved.` };
  });
}
