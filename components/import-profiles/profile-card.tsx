"use client";
/** One Import profile: its columns (role, unit, calibration) editable, rename, delete, and the sessions it read. */
import { startTransition, useActionState, useState } from "react";
import Link from "next/link";
import type { ImportProfileView } from "@/lib/data/import-profiles";
import { saveImportProfileAction, deleteImportProfileAction } from "@/lib/actions/import-profiles";
import type { SetupActionState } from "@/lib/actions/setup-state";
import { CHANNEL_ROLES, ROLE_LABEL, type ChannelRole } from "@/lib/channels/roles";
import { unitsForRole } from "@/lib/ingest/units";
import { TIME_FORMATS, TIME_FORMAT_LABEL } from "@/lib/forms/session-form";

const ROLE_CHOICES = [...CHANNEL_ROLES, "ignore"] as const;

function when(iso: string | null): string {
  if (!iso) return "never";
  return new Date(iso).toISOString().slice(0, 16).replace("T", " ") + " UTC";
}

export function ProfileCard({ profile }: { profile: ImportProfileView }) {
  const [name, setName] = useState(profile.name);
  const [timeFormat, setTimeFormat] = useState(profile.timeFormat);
  const [columns, setColumns] = useState(profile.columns.map((c) => ({ ...c })));
  const [confirmDelete, setConfirmDelete] = useState(false);
  const [saved, save, saving] = useActionState<SetupActionState, FormData>(saveImportProfileAction, {});
  const [deleted, remove, deleting] = useActionState<SetupActionState, FormData>(deleteImportProfileAction, {});
  const errors = saved.errors ?? {};
  const payload = JSON.stringify({ name, timeFormat, columns: columns.map(({ index, role, unit, scale, offset }) => ({ index, role, unit, scale, offset })) });
  const patch = (i: number, p: Partial<(typeof columns)[number]>) => setColumns((list) => list.map((c, k) => (k === i ? { ...c, ...p } : c)));
  const headingId = `profile-${profile.id}`;

  return (
    <section className="card space-y-4" aria-labelledby={headingId} data-testid="import-profile" data-profile-id={profile.id}>
      <div className="flex flex-wrap items-start justify-between gap-4">
        <div>
          <h2 id={headingId} className="text-lg font-semibold">{profile.name}</h2>
          <p className="text-xs text-ink-400">
            {profile.format.toUpperCase()} · {profile.columns.length} columns · last used {when(profile.lastUsedAt)} · changed {when(profile.updatedAt)} · read{" "}
            {profile.sessionCount === 1 ? "1 session" : `${profile.sessionCount} sessions`}
          </p>
        </div>
        <form action={remove} className="flex items-center gap-2">
          <input type="hidden" name="profileId" value={profile.id} />
          {confirmDelete ? (
            <>
              <span className="text-sm text-ink-300">The next file with these columns opens the mapping screen again.</span>
              <button className="btn-quiet border-alert-500/60 text-alert-400" disabled={deleting}>Delete “{profile.name}”</button>
              <button type="button" className="btn-quiet" onClick={() => setConfirmDelete(false)}>Keep it</button>
            </>
          ) : (
            <button type="button" className="btn-quiet" onClick={() => setConfirmDelete(true)}>Delete…</button>
          )}
        </form>
      </div>
      {deleted.message && <p role={deleted.ok ? "status" : "alert"} className={`text-sm ${deleted.ok ? "text-ok-400" : "text-alert-400"}`}>{deleted.message}</p>}

      {/* Submitted by hand, not as a form action: React resets a form after its action, and the controlled selects would show their first option. */}
      <form
        className="space-y-3"
        onSubmit={(e) => {
          e.preventDefault();
          const data = new FormData(e.currentTarget);
          startTransition(() => save(data));
        }}
      >
        <input type="hidden" name="profileId" value={profile.id} />
        <input type="hidden" name="payload" value={payload} />
        <div className="flex flex-wrap gap-4">
          <div className="min-w-64">
            <label className="label" htmlFor={`${headingId}-name`}>Name</label>
            <input id={`${headingId}-name`} className="field" value={name} onChange={(e) => setName(e.target.value)} aria-invalid={!!errors.name} />
            {errors.name && <p className="mt-1 text-xs text-alert-400">{errors.name}</p>}
          </div>
          <div>
            <label className="label" htmlFor={`${headingId}-time`}>Time column is written in</label>
            <select id={`${headingId}-time`} className="field w-auto" value={timeFormat} onChange={(e) => setTimeFormat(e.target.value as typeof timeFormat)}>
              {TIME_FORMATS.map((f) => (
                <option key={f} value={f}>{TIME_FORMAT_LABEL[f]}</option>
              ))}
            </select>
          </div>
        </div>
        <div className="overflow-x-auto">
          <table className="w-full text-sm">
            <thead className="text-left text-xs uppercase tracking-wide text-ink-400">
              <tr>
                <th className="py-1 pr-3">#</th>
                <th className="py-1 pr-3">Column</th>
                <th className="py-1 pr-3">Role</th>
                <th className="py-1 pr-3">Unit</th>
                <th className="py-1 pr-3">Scale</th>
                <th className="py-1 pr-3">Offset</th>
              </tr>
            </thead>
            <tbody>
              {columns.map((c, i) => {
                const units = c.role === "ignore" || c.role === "time" ? [] : unitsForRole(c.role as ChannelRole);
                const roleErr = errors[`columns.${i}.role`];
                const unitErr = errors[`columns.${i}.unit`];
                return (
                  <tr key={c.index} className="border-t border-ink-800">
                    <td className="num py-1 pr-3 text-ink-400">{c.index + 1}</td>
                    <td className="py-1 pr-3 font-mono">{c.name}</td>
                    <td className="py-1 pr-3">
                      <select aria-label={`Role of ${c.name}`} className="field py-1" value={c.role} onChange={(e) => patch(i, { role: e.target.value as typeof c.role })} aria-invalid={!!roleErr}>
                        {ROLE_CHOICES.map((r) => (
                          <option key={r} value={r}>{r === "ignore" ? "Leave out" : ROLE_LABEL[r]}</option>
                        ))}
                      </select>
                      {roleErr && <p className="mt-1 text-xs text-alert-400">{roleErr}</p>}
                    </td>
                    <td className="py-1 pr-3">
                      <input aria-label={`Unit of ${c.name}`} className="field w-24 py-1" list={`${headingId}-units-${i}`} value={c.unit} onChange={(e) => patch(i, { unit: e.target.value })} aria-invalid={!!unitErr} />
                      <datalist id={`${headingId}-units-${i}`}>
                        {units.map((u) => (
                          <option key={u} value={u} />
                        ))}
                      </datalist>
                      {unitErr && <p className="mt-1 text-xs text-alert-400">{unitErr}</p>}
                    </td>
                    <td className="py-1 pr-3">
                      <input aria-label={`Scale of ${c.name}`} type="number" step="any" className="field num w-24 py-1" value={c.scale} onChange={(e) => patch(i, { scale: e.target.valueAsNumber })} />
                    </td>
                    <td className="py-1 pr-3">
                      <input aria-label={`Offset of ${c.name}`} type="number" step="any" className="field num w-24 py-1" value={c.offset} onChange={(e) => patch(i, { offset: e.target.valueAsNumber })} />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <button className="btn-primary" disabled={saving}>{saving ? "Saving…" : "Save profile"}</button>
          {saved.message && <p role={saved.ok ? "status" : "alert"} className={`text-sm ${saved.ok ? "text-ok-400" : "text-alert-400"}`}>{saved.message}</p>}
        </div>
      </form>

      {profile.sessions.length > 0 && (
        <details>
          <summary className="cursor-pointer text-sm text-ink-300">Sessions read with this profile</summary>
          <ul className="mt-2 space-y-1 text-sm">
            {profile.sessions.map((s) => (
              <li key={s.id}>
                <Link href={`/sessions/${s.id}`} className="text-trace-400 underline underline-offset-2">{s.title}</Link>{" "}
                <span className="text-xs text-ink-400">· {s.status} · {when(s.createdAt)}</span>
              </li>
            ))}
          </ul>
        </details>
      )}
    </section>
  );
}
