"use client";
import { useActionState } from "react";
import { saveThresholdsAction, type ThresholdState } from "@/lib/actions/thresholds";

export interface FormField {
  key: string;
  label: string;
  unit: string;
  min: number;
  max: number;
  defaultShown: number;
  source: string;
  rationale: string;
  /** The team's value in the shown unit, or null for "use the default". */
  current: number | null;
}

/** Thresholds of one bike or track: empty = default; engineers and owners save. */
export function ThresholdForm({ scope, id, name, fields, canEdit, note }: { scope: "bike" | "track"; id: number; name: string; fields: FormField[]; canEdit: boolean; note?: string }) {
  const [state, action, pending] = useActionState<ThresholdState, FormData>(saveThresholdsAction, {});
  return (
    <form action={action} className="card space-y-3" aria-label={`Thresholds for ${name}`} data-testid={`thresholds-${scope}-${id}`}>
      <input type="hidden" name="scope" value={scope} />
      <input type="hidden" name="id" value={id} />
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="font-semibold">{name}</h3>
        {note ? <p className="text-xs text-ink-400">{note}</p> : null}
      </div>
      <table className="table-plain">
        <thead>
          <tr>
            <th>Threshold</th>
            <th className="w-40">Team value</th>
            <th>Default</th>
            <th>Why</th>
          </tr>
        </thead>
        <tbody>
          {fields.map((f) => (
            <tr key={f.key}>
              <td>
                <label htmlFor={`${scope}-${id}-${f.key}`}>{f.label}</label>
              </td>
              <td>
                <div className="flex items-center gap-1.5">
                  <input
                    id={`${scope}-${id}-${f.key}`}
                    name={f.key}
                    defaultValue={f.current ?? ""}
                    placeholder={String(f.defaultShown)}
                    inputMode="decimal"
                    disabled={!canEdit}
                    className="field num w-24 py-1"
                    aria-invalid={!!state.errors?.[f.key]}
                  />
                  <span className="text-xs text-ink-400">{f.unit}</span>
                </div>
                {state.errors?.[f.key] ? <p className="mt-1 text-xs text-alert-400">{state.errors[f.key]}</p> : null}
              </td>
              <td className="whitespace-nowrap">
                <span className="num">{f.defaultShown} {f.unit}</span>
                <span className={`ml-2 rounded px-1.5 py-0.5 text-[10px] font-semibold uppercase ${f.source === "common practice" ? "bg-trace-500/15 text-trace-400" : "bg-ink-800 text-ink-300"}`}>{f.source}</span>
              </td>
              <td className="text-xs text-ink-400">{f.rationale}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {canEdit ? (
        <div className="flex flex-wrap items-center gap-3">
          <button type="submit" className="btn-primary" disabled={pending}>
            {pending ? "Saving and reanalysing…" : "Save and reanalyse"}
          </button>
          <p className="text-xs text-ink-400">Leave a value empty to use the default. Saving reanalyses this {scope}&apos;s sessions, so findings match.</p>
        </div>
      ) : null}
      {state.message ? (
        <p role={state.ok ? "status" : "alert"} className={`text-sm ${state.ok ? "text-ok-400" : "text-alert-400"}`}>
          {state.message}
        </p>
      ) : null}
    </form>
  );
}
