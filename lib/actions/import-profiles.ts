"use server";
/** Import profile actions (engineers and owners): rename and edit the columns, or delete. */
import { revalidatePath } from "next/cache";
import { deleteImportProfile, updateImportProfile } from "@/lib/data/import-profiles";
import { parseId } from "@/lib/http/parse-id";
import { withSetupRole, type SetupActionState } from "./setup-state";

/** The card sends the whole profile as JSON in `payload`. */
export async function saveImportProfileAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const id = parseId(String(form.get("profileId") ?? ""));
  if (id === null) return { ok: false, status: 404, message: "Import profile was not found in your team." };
  let payload: unknown;
  try {
    payload = JSON.parse(String(form.get("payload") ?? ""));
  } catch {
    return { ok: false, status: 422, message: "The form sent something that is not a profile. Reload the page and try again." };
  }
  return withSetupRole({}, async (ctx) => {
    await updateImportProfile(ctx, id, payload);
    revalidatePath("/import-profiles");
    return { ok: true, id, message: "Profile saved. The next file with these columns is read this way; map a session again to apply it to a file already read." };
  });
}

export async function deleteImportProfileAction(_prev: SetupActionState, form: FormData): Promise<SetupActionState> {
  const id = parseId(String(form.get("profileId") ?? ""));
  if (id === null) return { ok: false, status: 404, message: "Import profile was not found in your team." };
  return withSetupRole({}, async (ctx) => {
    await deleteImportProfile(ctx, id);
    revalidatePath("/import-profiles");
    return { ok: true, message: "Profile deleted. The next file with these columns opens the mapping screen." };
  });
}
