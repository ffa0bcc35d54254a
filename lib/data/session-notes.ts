import "server-only";
/**
 * Notes on a session, optionally tied to one lap. Who may write them:
 * owners and engineers on any session they see, a rider only on a session they rode (a session
 * merely shared with riders is for reading), a viewer never. The author deletes their own note,
 * the owner any note.
 */
import { z } from "zod";
import { initModels, Lap, Note, Rider } from "@/models";
import { roleCan, type TeamContext } from "@/lib/auth/guard";
import { HttpError, forbidden } from "@/lib/http/http-error";
import { getSessionForViewer, type SessionDetail } from "./session-for-viewer";
import { userNames } from "./setup-sheets";

export const NOTE_MAX_CHARS = 2000;

export interface NoteView {
  id: number;
  lapNumber: number | null;
  text: string;
  authorId: string;
  authorName: string | null;
  createdAt: string;
  canDelete: boolean;
}

export interface SessionNotesView {
  sessionId: number;
  /** Newest first. */
  notes: NoteView[];
  /** Lap numbers a note can be tied to (empty until the log is read). */
  laps: number[];
  canCreate: boolean;
  /** Why the caller cannot write, in their words; null when they can. */
  readOnlyReason: string | null;
}

/** Whether the caller rode this session: its rider row is linked to their user. */
async function ridesSession(ctx: TeamContext, session: SessionDetail): Promise<boolean> {
  if (session.riderId == null) return false;
  const rider = await Rider.findOne({ where: { id: session.riderId, teamId: ctx.teamId }, attributes: ["userId"] });
  return !!rider && rider.userId === ctx.userId;
}

async function writeRefusal(ctx: TeamContext, session: SessionDetail): Promise<string | null> {
  if (!roleCan(ctx.role, { note: ["create"] })) return "Viewers read notes; the owner, engineers and the session's rider write them.";
  if (ctx.role === "rider" && !(await ridesSession(ctx, session))) return "You can add notes to sessions you rode; this one is shared with you to read.";
  return null;
}

function canDelete(ctx: TeamContext, note: { authorId: string }): boolean {
  return note.authorId === ctx.userId || ctx.role === "owner";
}

/** The session's notes, newest first. 404 when the caller may not see the session. */
export async function getSessionNotes(ctx: TeamContext, sessionId: number): Promise<SessionNotesView> {
  const session = await getSessionForViewer(ctx, sessionId);
  const [rows, laps, refusal] = await Promise.all([
    Note.findAll({ where: { teamId: ctx.teamId, sessionId: session.id }, order: [["createdAt", "DESC"], ["id", "DESC"]] }),
    Lap.findAll({ where: { sessionId: session.id }, attributes: ["number"], order: [["number", "ASC"]] }),
    writeRefusal(ctx, session),
  ]);
  const names = await userNames(rows.map((r) => r.authorId));
  return {
    sessionId: session.id,
    notes: rows.map((r) => ({
      id: r.id,
      lapNumber: r.lapNumber,
      text: r.text,
      authorId: r.authorId,
      authorName: names.get(r.authorId) ?? null,
      createdAt: r.createdAt.toISOString(),
      canDelete: canDelete(ctx, r),
    })),
    laps: laps.map((l) => l.number),
    canCreate: refusal === null,
    readOnlyReason: refusal,
  };
}

/** A note as it arrives from a form: text 1–2000 characters, lap empty (whole session) or a number. */
export const noteSchema = z.object({
  text: z
    .string()
    .trim()
    .min(1, "Write the note first")
    .max(NOTE_MAX_CHARS, `Keep the note to ${NOTE_MAX_CHARS} characters`),
  lapNumber: z
    .string()
    .trim()
    .regex(/^\d{0,4}$/, "Choose a lap from the list")
    .transform((s) => (s === "" ? null : Number(s))),
});

/**
 * Add a note. 403 for viewers (before anything is looked up) and for a rider on a session they
 * did not ride, 404 for a session the caller may not see, 422 (ZodError) for bad text or a lap
 * the session does not have.
 */
export async function createSessionNote(ctx: TeamContext, sessionId: number, input: { text?: string; lapNumber?: string }): Promise<NoteView> {
  if (!roleCan(ctx.role, { note: ["create"] })) throw forbidden("Viewers cannot add notes.");
  initModels();
  const session = await getSessionForViewer(ctx, sessionId);
  const refusal = await writeRefusal(ctx, session);
  if (refusal) throw forbidden(refusal);
  const { text, lapNumber } = noteSchema.parse({ text: input.text ?? "", lapNumber: input.lapNumber ?? "" });
  if (lapNumber !== null && !(await Lap.findOne({ where: { sessionId: session.id, number: lapNumber }, attributes: ["id"] }))) {
    throw new HttpError(422, "Nothing was saved: check the fields marked in red.", { lapNumber: `Lap ${lapNumber} is not a lap of this session` });
  }
  const row = await Note.create({ teamId: ctx.teamId, sessionId: session.id, lapNumber, authorId: ctx.userId, text });
  return { id: row.id, lapNumber, text, authorId: ctx.userId, authorName: ctx.userName, createdAt: row.createdAt.toISOString(), canDelete: true };
}

/** Delete a note: its author or the owner; 404 when it is not in the caller's team or its session is hidden from them. */
export async function deleteSessionNote(ctx: TeamContext, noteId: number): Promise<{ sessionId: number }> {
  initModels();
  const row = await Note.findOne({ where: { id: noteId, teamId: ctx.teamId } });
  if (!row) throw new HttpError(404, "Note was not found in your team.");
  // A rider must not learn about (or remove) notes on sessions they cannot see.
  await getSessionForViewer(ctx, row.sessionId).catch((e: unknown) => {
    if (e instanceof HttpError && e.status === 404) throw new HttpError(404, "Note was not found in your team.");
    throw e;
  });
  if (!canDelete(ctx, row)) throw forbidden("Only the note's author or the team owner can delete it.");
  await row.destroy();
  return { sessionId: row.sessionId };
}
