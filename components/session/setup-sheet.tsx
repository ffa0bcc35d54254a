"use client";
/**
 * The session's setup sheet: the latest version for everyone who sees the session, with what
 * changed since the version before marked, the list of versions, and for engineers and the owner a
 * form that saves the next version (nothing is overwritten). The safety caution (inspect,
 * follow service data and qualified mechanics) sits on top because a sheet is a record of what was fitted, not advice on what to fit.
 */
import { useActionState } from "react";
import Link from "next/link";
import { saveSetupSheetAction } from "@/lib/actions/setup-sheets";
import type { SetupActionState } from "@/lib/actions/setup-state";
import type { SetupFieldDef, SetupSheetView, SetupValue, SetupValues, SetupVersion } from "@/lib/data/setup-sheets";
import { Feedback, Field } from "@/components/setup/form-bits";
import { SetupCaution } from "@/components/setup/setup-caution";

/** UTC, like the session list: the same text on the server and in every browser (no hydration drift). */
function when(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}

function show(f: SetupFieldDef, v: SetupValue): string {
  if (v === null || v === "") return "—";
  return f.kind === "number" && f.unit ? `${v} ${f.unit}` : String(v);
}

function byName(fields: SetupFieldDef[]): Map<string, SetupFieldDef> {
  return new Map(fields.map((f) => [f.name, f]));
}

export function SetupSheet({ view }: { view: SetupSheetView }) {
  const latest = view.versions[0] ?? null;
  return (
    <section className="card space-y-4" aria-labelledby="setup-heading" data-testid="setup-sheet">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="setup-heading" className="text-sm font-semibold uppercase tracking-wide text-ink-300">
          Setup sheet
        </h2>
        {latest ? (
          <p className="text-xs text-ink-400" data-testid="setup-latest">
            Version <span className="num font-semibold text-ink-100">{latest.version}</span> · {latest.authorName ?? "a former member"} · {when(latest.createdAt)}
          </p>
        ) : (
          <p className="text-xs text-ink-400">No setup recorded for this session yet.</p>
        )}
      </div>
      <SetupCaution />
      {latest && (
        <p className="text-xs">
          <Link className="text-signal-400 hover:underline" href={`/sessions/${view.sessionId}/setup`}>Setup history: open any version, compare two</Link>
          {" · "}
          <Link className="text-signal-400 hover:underline" href={`/season/setup-effects?session=${view.sessionId}`}>Effect on lap times</Link>
        </p>
      )}
      {latest && <LatestVersion view={view} latest={latest} />}
      {view.versions.length > 0 && <VersionList view={view} />}
      {view.canEdit ? (
        <SetupEditor view={view} />
      ) : (
        <p className="text-xs text-ink-400">Read-only: engineers and the team owner edit setup sheets.</p>
      )}
    </section>
  );
}

function LatestVersion({ view, latest }: { view: SetupSheetView; latest: SetupVersion }) {
  const changed = new Set(latest.changed);
  return (
    <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
      {view.groups.map((g) => {
        const fields = view.fields.filter((f) => f.group === g.id);
        return (
          <div key={g.id} className={g.id === "notes" ? "sm:col-span-2 lg:col-span-3" : ""}>
            <h3 className="mb-1 text-xs font-semibold uppercase tracking-wide text-trace-400">{g.label}</h3>
            <dl className="divide-y divide-ink-800 text-sm">
              {fields.map((f) => {
                const isChanged = changed.has(f.name);
                return (
                  <div key={f.name} className="flex items-baseline justify-between gap-3 py-1" data-testid="setup-value" data-field={f.name} data-changed={isChanged ? "true" : undefined}>
                    <dt className="text-ink-300">{f.label}</dt>
                    <dd className={`text-right ${f.kind === "longtext" ? "whitespace-pre-wrap" : "num"} ${isChanged ? "font-semibold text-signal-400" : "text-ink-100"}`}>
                      {show(f, latest.values[f.name] ?? null)}
                      {isChanged && (
                        <span className="ml-2 rounded border border-signal-600/50 px-1 py-0.5 text-[0.65rem] font-semibold uppercase tracking-wide" title={`Changed since version ${latest.version - 1}`}>
                          changed
                        </span>
                      )}
                      {isChanged && <span className="block text-xs font-normal text-ink-400">was {show(f, latest.previous[f.name] ?? null)}</span>}
                    </dd>
                  </div>
                );
              })}
            </dl>
          </div>
        );
      })}
    </div>
  );
}

function VersionList({ view }: { view: SetupSheetView }) {
  const fields = byName(view.fields);
  return (
    <div>
      <h3 className="mb-1 text-xs font-semibold uppercase tracking-wide text-ink-400">Versions</h3>
      <ol className="space-y-1 text-sm" data-testid="setup-versions">
        {view.versions.map((v) => (
          <li key={v.id} data-testid="setup-version" className="rounded border border-ink-800 px-3 py-1.5">
            <Link href={`/sessions/${view.sessionId}/setup?v=${v.version}`} className="font-semibold text-signal-400 hover:underline">Version {v.version}</Link>
            <span className="text-ink-400">
              {" "}
              · {v.authorName ?? "a former member"} · {when(v.createdAt)}
            </span>
            <span className="block text-xs text-ink-300">
              {v.version === 1 || v.changed.length === 0
                ? "First record of this session's setup."
                : v.changed
                    .map((name) => {
                      const f = fields.get(name)!;
                      // Long notes would swamp the list; the latest version shows them in full.
                      return f.kind === "longtext" ? `${f.label} edited` : `${f.label}: ${show(f, v.previous[name] ?? null)} → ${show(f, v.values[name] ?? null)}`;
                    })
                    .join("; ")}
            </span>
          </li>
        ))}
      </ol>
    </div>
  );
}

function SetupEditor({ view }: { view: SetupSheetView }) {
  const [state, action, pending] = useActionState<SetupActionState, FormData>(saveSetupSheetAction, {});
  const latest = view.versions[0] ?? null;
  const base: SetupValues = latest?.values ?? view.starting;
  const next = (latest?.version ?? 0) + 1;
  const p = `setup-${view.sessionId}`;
  return (
    <details className="rounded-md border border-ink-700 p-4" open={!latest || !!state.message}>
      <summary className="cursor-pointer text-sm font-semibold text-ink-100">Edit setup (saves as version {next})</summary>
      <form action={action} className="mt-4 space-y-5" noValidate aria-label="Setup sheet">
        <input type="hidden" name="sessionId" value={view.sessionId} />
        <input type="hidden" name="baseVersion" value={latest?.version ?? 0} />
        {view.groups.map((g) => (
          <fieldset key={g.id}>
            <legend className="mb-2 text-xs font-semibold uppercase tracking-wide text-trace-400">{g.label}</legend>
            <div className="grid gap-4 sm:grid-cols-3">
              {view.fields
                .filter((f) => f.group === g.id)
                .map((f) =>
                  f.kind === "longtext" ? (
                    <NotesArea key={f.name} state={state} field={f} id={`${p}-${f.name}`} value={base[f.name] ?? null} />
                  ) : (
                    <Field
                      key={f.name}
                      state={state}
                      idPrefix={p}
                      align
                      name={f.name}
                      label={f.label}
                      unit={f.unit}
                      inputMode={f.kind === "number" ? (f.integer ? "numeric" : "decimal") : undefined}
                      defaultValue={base[f.name] ?? null}
                    />
                  ),
                )}
            </div>
          </fieldset>
        ))}
        <div className="flex flex-wrap items-center gap-4">
          <button className="btn-primary" disabled={pending}>{pending ? "Saving…" : `Save as version ${next}`}</button>
          <Feedback state={state} />
        </div>
      </form>
    </details>
  );
}

function NotesArea({ state, field, id, value }: { state: SetupActionState; field: SetupFieldDef; id: string; value: SetupValue }) {
  const shown = state.values?.[field.name] ?? (value == null ? "" : String(value));
  const err = state.errors?.[field.name];
  return (
    <div className="sm:col-span-3">
      <label className="label" htmlFor={id}>{field.label}</label>
      <textarea
        // Remount with the submitted text: React resets a form after its action runs.
        key={shown}
        id={id}
        name={field.name}
        rows={3}
        defaultValue={shown}
        maxLength={field.maxLength}
        aria-invalid={err ? true : undefined}
        className={`field ${err ? "border-alert-500" : ""}`}
      />
      {err && <p className="mt-1 text-xs text-alert-400">{err}</p>}
    </div>
  );
}
