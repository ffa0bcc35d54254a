"use server";
/** A person's own e-mail choices; any member may change their own, nobody anyone else's. */
import { revalidatePath } from "next/cache";
import { actionTeam } from "@/lib/auth/page-guard";
import { saveMailPreferences } from "@/lib/data/mail-preferences";

export interface MailPrefsState {
  ok?: boolean;
  message?: string;
}

export async function saveMailPreferencesAction(_prev: MailPrefsState, form: FormData): Promise<MailPrefsState> {
  const g = await actionTeam();
  if (!g.ctx) return { ok: false, message: g.error };
  await saveMailPreferences(g.ctx, { sessionReady: form.get("sessionReady") === "on", eventReport: form.get("eventReport") === "on" });
  revalidatePath("/settings");
  return { ok: true, message: "E-mail choices saved." };
}
