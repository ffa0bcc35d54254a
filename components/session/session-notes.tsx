"use client";
/**
 * Notes on a session, newest first, each with its author, time and lap. The form shows only to
 * those who may write here (the server decides and checks again on save); delete buttons only on
 * the notes the caller may delete (their own; the owner's on all).
 */
import { useActionState } from "react";
import { createNoteAction, deleteNoteAction, type NoteActionState } from "@/lib/actions/session-notes";
import type { NoteView, SessionNotesView } from "@/lib/data/session-notes";
import { Feedback } from "@/components/setup/form-bits";

// Kept in step with NOTE_MAX_CHARS in lib/data/session-notes.ts, which is server-only.
const MAX_CHARS = 2000;

/** UTC, like the session list: the same text on the server and in every browser. */
function when(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}

export function SessionNotes({ view }: { view: SessionNotesView }) {
  return (
    <section className="card space-y-4" aria-labelledby="notes-heading" data-testid="session-notes">
      <h2 id="notes-heading" className="text-sm font-semibold uppercase tracking-wide text-ink-300">
        Notes
      </h2>
      {view.canCreate ? <NoteForm view={view} /> : <p className="text-xs text-ink-400">{view.readOnlyReason}</p>}
      {view.notes.length === 0 ? (
        <p className="text-sm text-ink-400">No notes on this session yet.</p>
      ) : (
        <ol className="space-y-2" data-testid="note-list">
          {view.notes.map((n) => (
            <NoteItem key={n.id} note={n} />
          ))}
        </ol>
      )}
    </section>
  );
}

function NoteForm({ view }: { view: SessionNotesView }) {
  const [state, action, pending] = useActionState<NoteActionState, FormData>(createNoteAction, {});
  // After a refused save the text comes back; after a saved one the box is empty again.
  const text = state.ok ? "" : (state.values?.text ?? "");
  const lap = state.ok ? "" : (state.values?.lapNumber ?? "");
  const id = `note-${view.sessionId}`;
  return (
    <form action={action} className="space-y-3" noValidate aria-label="Add a note">
      <input type="hidden" name="sessionId" value={view.sessionId} />
      <div>
        <label className="label" htmlFor={`${id}-text`}>New note</label>
        <textarea
          key={`${state.id ?? ""}-${text}`}
          id={`${id}-text`}
          name="text"
          rows={3}
          maxLength={MAX_CHARS}
          defaultValue={text}
          placeholder="What the rider felt, what was tried, what to check next"
          aria-invalid={state.errors?.text ? true : undefined}
          className={`field ${state.errors?.text ? "border-alert-500" : ""}`}
        />
        {state.errors?.text && <p className="mt-1 text-xs text-alert-400">{state.errors.text}</p>}
      </div>
      <div className="flex flex-wrap items-end gap-3">
        {view.laps.length > 0 && (
          <div>
            <label className="label" htmlFor={`${id}-lap`}>About</label>
            <select key={`${state.id ?? ""}-${lap}`} id={`${id}-lap`} name="lapNumber" defaultValue={lap} className="field">
              <option value="">The whole session</option>
              {view.laps.map((n) => (
                <option key={n} value={n}>
                  Lap {n}
                </option>
              ))}
            </select>
            {state.errors?.lapNumber && <p className="mt-1 text-xs text-alert-400">{state.errors.lapNumber}</p>}
          </div>
        )}
        <button className="btn-primary" disabled={pending}>{pending ? "Adding…" : "Add note"}</button>
        <Feedback state={state} />
      </div>
    </form>
  );
}

function NoteItem({ note }: { note: NoteView }) {
  const [state, action, pending] = useActionState<NoteActionState, FormData>(deleteNoteAction, {});
  return (
    <li className="rounded-md border border-ink-700 bg-ink-950/40 p-3" data-testid="note">
      <div className="flex flex-wrap items-center justify-between gap-2 text-xs text-ink-400">
        <span>
          <span className="font-semibold text-ink-100">{note.authorName ?? "A former member"}</span> · {when(note.createdAt)} ·{" "}
          {note.lapNumber != null ? <span className="num">Lap {note.lapNumber}</span> : "Whole session"}
        </span>
        {note.canDelete && (
          <form action={action}>
            <input type="hidden" name="noteId" value={note.id} />
            <button className="text-xs text-alert-400 hover:underline disabled:opacity-50" disabled={pending} aria-label={`Delete the note of ${when(note.createdAt)}`}>
              {pending ? "Deleting…" : "Delete"}
            </button>
          </form>
        )}
      </div>
      <p className="mt-1.5 whitespace-pre-wrap text-sm text-ink-100">{note.text}</p>
      {state.ok === false && <Feedback state={state} />}
    </li>
  );
}
