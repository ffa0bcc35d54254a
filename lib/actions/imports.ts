"use server";
/**
 * Session import and details actions. Each checks the caller's role with the shared guard, validates
 * with the same zod schema the form uses, then calls lib/data/session-edit.ts (which checks the
 * role and the team again), revalidates the screens that show the session, and answers the form
 * with errors by field.
 */
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { actionTeam } from "@/lib/auth/page-guard";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { confirmImport, importKeepingFirstOfRepeatedTimes, reimport, saveSessionDetails } from "@/lib/data/session-edit";
import { resolveTeamDuplicate } from "@/lib/data/imports";
import { fieldErrors, type FormState } from "@/lib/forms/form-state";
import { importFormSchema, sessionDetailsSchema, type ImportFormInput, type SessionDetailsInput } from "@/lib/forms/session-form";

const UPLOAD = { permission: { "session-data": ["upload"] } } as const;

/** A session id the client sent that is not an id: the same answer as another team's session. */
const NO_SESSION: FormState = { ok: false, message: "Session was not found in your team." };

function failure(e: unknown): FormState {
  if (e instanceof HttpError) {
    const details = e.details && typeof e.details === "object" ? (e.details as Record<string, string>) : undefined;
    return { ok: false, message: e.message, errors: details };
  }
  throw e;
}

function revalidateSession(sessionId: number) {
  revalidatePath(`/sessions/${sessionId}`);
  revalidatePath("/sessions");
  revalidatePath("/home");
}

/** Import screen: details + column mapping → Import profile saved, parse queued, on to the session. */
export async function confirmImportAction(sessionId: number, input: ImportFormInput): Promise<FormState> {
  const g = await actionTeam(UPLOAD);
  if (!g.ctx) return { ok: false, message: g.error };
  const parsed = importFormSchema.safeParse(input);
  if (!parsed.success) return { ok: false, message: "Some fields need another look.", errors: fieldErrors(parsed.error) };
  try {
    const id = parseId(sessionId);
    if (id === null) return NO_SESSION;
    await confirmImport(g.ctx, id, parsed.data);
  } catch (e) {
    return failure(e);
  }
  revalidateSession(sessionId);
  redirect(`/sessions/${sessionId}`);
}

/** Session page: edit the details of a session at any status. */
export async function saveSessionDetailsAction(sessionId: number, input: SessionDetailsInput): Promise<FormState> {
  const g = await actionTeam(UPLOAD);
  if (!g.ctx) return { ok: false, message: g.error };
  const parsed = sessionDetailsSchema.safeParse(input);
  if (!parsed.success) return { ok: false, message: "Some fields need another look.", errors: fieldErrors(parsed.error) };
  try {
    const id = parseId(sessionId);
    if (id === null) return NO_SESSION;
    await saveSessionDetails(g.ctx, id, parsed.data);
  } catch (e) {
    return failure(e);
  }
  revalidateSession(sessionId);
  return { ok: true, message: "Details saved." };
}

/** "Re-import with another mapping": the kept file is read again and the mapping screen opens. */
export async function reimportAction(_prev: FormState, form: FormData): Promise<FormState> {
  const g = await actionTeam(UPLOAD);
  if (!g.ctx) return { ok: false, message: g.error };
  const sessionId = parseId(String(form.get("sessionId") ?? ""));
  if (sessionId === null) return NO_SESSION;
  let status: string;
  try {
    ({ status } = await reimport(g.ctx, sessionId));
  } catch (e) {
    return failure(e);
  }
  revalidateSession(sessionId);
  // GPX/NMEA need no mapping: they are queued again at once and the session page shows progress.
  redirect(status === "mapping" ? `/sessions/${sessionId}/import` : `/sessions/${sessionId}`);
}

/** "This file was uploaded before": go to the earlier session (this copy is dropped), or import it again on purpose. */
export async function resolveDuplicateAction(_prev: FormState, form: FormData): Promise<FormState> {
  const g = await actionTeam(UPLOAD);
  if (!g.ctx) return { ok: false, message: g.error };
  const sessionId = parseId(String(form.get("sessionId") ?? ""));
  if (sessionId === null) return NO_SESSION;
  const choice = form.get("choice") === "import" ? "import" : "existing";
  let target: { sessionId: number; status: string };
  try {
    target = await resolveTeamDuplicate(g.ctx, sessionId, choice);
  } catch (e) {
    return failure(e);
  }
  revalidateSession(target.sessionId);
  // Navigate from the action: with "existing" this page's session no longer exists, so re-rendering
  // it in the action's answer would end in a 404 instead of the earlier session.
  redirect(target.status === "mapping" ? `/sessions/${target.sessionId}/import` : `/sessions/${target.sessionId}`);
}

/** A CSV refused for repeated time stamps: import it again keeping the first row of each stamp. */
export async function keepFirstOfRepeatedTimesAction(_prev: FormState, form: FormData): Promise<FormState> {
  const g = await actionTeam(UPLOAD);
  if (!g.ctx) return { ok: false, message: g.error };
  const sessionId = parseId(String(form.get("sessionId") ?? ""));
  if (sessionId === null) return NO_SESSION;
  try {
    await importKeepingFirstOfRepeatedTimes(g.ctx, sessionId);
  } catch (e) {
    return failure(e);
  }
  revalidateSession(sessionId);
  // The session page's status card refetches and follows the new read (no navigation: it is the same page).
  return { ok: true, message: "Queued to be read again." };
}
