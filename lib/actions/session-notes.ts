"use server";
/**
 * Adding and deleting session notes. The guard runs first (note:create for adding, any member for
 * deleting); who may write on which session and who may delete which note is decided in
 * lib/data/session-notes.ts, so the rules hold for any caller. Errors come back with an HTTP-like
 * status and field messages, in the same shape as the setup forms.
 */
import { revalidatePath } from "next/cache";
import { ZodError } from "zod";
import { actionTeam } from "@/lib/auth/page-guard";
import type { GuardOptions, TeamContext } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import { createSessionNote, deleteSessionNote } from "@/lib/data/session-notes";
import { fieldErrors } from "@/lib/forms/form-state";
import { parseId } from "@/lib/http/parse-id";
import { formValues, type SetupActionState } from "./setup-state";
import { recordActivity } from "@/lib/data/activity-log";

export type NoteActionState = SetupActionState;

async function guarded(opts: GuardOptions, values: Record<string, string>, fn: (ctx: TeamContext) => Promise<NoteActionState>): Promise<NoteActionState> {
  const g = await actionTeam(opts);
  if (!g.ctx) return { ok: false, status: g.status, message: g.error, values };
  try {
    return await fn(g.ctx);
  } catch (e) {
    if (e instanceof ZodError) return { ok: false, status: 422, errors: fieldErrors(e), message: "The note was not saved: check the fields marked in red.", values };
    if (e instanceof HttpError) {
      const details = e.details && typeof e.details === "object" ? (e.details as Record<string, string>) : undefined;
      return { ok: false, status: e.status, message: e.message, errors: details, values };
    }
    throw e;
  }
}

export async function createNoteAction(_prev: NoteActionState, form: FormData): Promise<NoteActionState> {
  const values = formValues(form);
  return guarded({ permission: { note: ["create"] } }, values, async (ctx) => {
    const sessionId = parseId(values.sessionId);
    if (!sessionId) return { ok: false, status: 404, message: "Session was not found in your team." };
    const note = await createSessionNote(ctx, sessionId, { text: values.text, lapNumber: values.lapNumber });
    revalidatePath(`/sessions/${sessionId}`);
    return { ok: true, id: note.id, message: "Note added." };
  });
}

export async function deleteNoteAction(_prev: NoteActionState, form: FormData): Promise<NoteActionState> {
  const values = formValues(form);
  return guarded({}, values, async (ctx) => {
    const noteId = parseId(values.noteId);
    if (!noteId) return { ok: false, status: 404, message: "Note was not found in your team." };
    const { sessionId } = await deleteSessionNote(ctx, noteId);
    await recordActivity(ctx, { action: "note.delete", subjectType: "note", subjectId: noteId, sessionId, summary: "Deleted a note" });
    revalidatePath(`/sessions/${sessionId}`);
    return { ok: true, id: noteId, message: "Note deleted." };
  });
}
