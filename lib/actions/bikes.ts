"use server";
/** Bike and engine server actions. */
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { createBike, updateBike } from "@/lib/data/bikes";
import { createEngine, updateEngine } from "@/lib/data/engines";
import { parseId } from "@/lib/http/parse-id";
import { formValues, withSetupRole, type SetupActionState } from "./setup-state";

const BIKE_FIELDS = ["name", "className", "wheelCircFrontMm", "wheelCircRearMm", "primaryRatio", "gearboxRatios", "sprocketFront", "sprocketRear", "revCeilingRpm", "forkStrokeMm", "shockStrokeMm", "tyreCrownRadiusMm", "tyreCrownRadiusFrontMm"] as const;
const ENGINE_FIELDS = ["serial", "bikeId", "rebuildIntervalH", "rebuildIntervalKm", "hoursAtInstall", "kmAtInstall", "notes"] as const;

function pick(values: Record<string, string>, keys: readonly string[]): Record<string, string> {
  return Object.fromEntries(keys.map((k) => [k, values[k] ?? ""]));
}

export async function createBikeAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  const state = await withSetupRole(values, async (ctx) => ({ ok: true, id: (await createBike(ctx, pick(values, ["name", "className"]))).id }));
  if (!state.ok || !state.id) return state;
  revalidatePath("/bikes");
  redirect(`/bikes/${state.id}`);
}

export async function updateBikeAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  return withSetupRole(values, async (ctx) => {
    const id = parseId(values.bikeId);
    if (!id) return { ok: false, status: 404, message: "Bike was not found in your team." };
    const b = await updateBike(ctx, id, pick(values, BIKE_FIELDS));
    revalidatePath("/bikes");
    revalidatePath(`/bikes/${id}`);
    return { ok: true, id, message: `${b.name} saved.` };
  });
}

export async function createEngineAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  return withSetupRole(values, async (ctx) => {
    const { id } = await createEngine(ctx, pick(values, ENGINE_FIELDS));
    revalidatePath("/bikes");
    if (values.bikeId) revalidatePath(`/bikes/${values.bikeId}`);
    return { ok: true, id, message: `Engine ${values.serial?.trim()} added.` };
  });
}

export async function updateEngineAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const values = formValues(form);
  return withSetupRole(values, async (ctx) => {
    const id = parseId(values.engineId);
    if (!id) return { ok: false, status: 404, message: "Engine was not found in your team." };
    await updateEngine(ctx, id, pick(values, ENGINE_FIELDS));
    revalidatePath("/bikes", "layout");
    return { ok: true, id, message: `Engine ${values.serial?.trim()} saved.` };
  });
}
