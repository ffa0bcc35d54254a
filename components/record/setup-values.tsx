/** A setup version in full, and two versions side by side with the changed fields marked (server components). */
import type { SetupFieldDef, SetupValue, SetupValues, SetupGroup } from "@/lib/data/setup-sheets";

export function showSetupValue(f: SetupFieldDef | undefined, v: SetupValue): string {
  if (v === null || v === "" || v === undefined) return "—";
  return f?.kind === "number" && f.unit ? `${v} ${f.unit}` : String(v);
}

export function SetupValuesFull({ fields, groups, values }: { fields: SetupFieldDef[]; groups: { id: SetupGroup; label: string }[]; values: SetupValues }) {
  return (
    <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3 print:grid-cols-3" data-testid="setup-full">
      {groups.map((g) => (
        <div key={g.id} className={g.id === "notes" ? "sm:col-span-2 lg:col-span-3 print:col-span-3" : ""}>
          <h3 className="mb-1 text-xs font-semibold uppercase tracking-wide text-trace-400">{g.label}</h3>
          <dl className="divide-y divide-ink-800 text-sm">
            {fields
              .filter((f) => f.group === g.id)
              .map((f) => (
                <div key={f.name} className="flex items-baseline justify-between gap-3 py-1" data-testid="setup-full-value" data-field={f.name}>
                  <dt className="text-ink-300">{f.label}</dt>
                  <dd className={`text-right ${f.kind === "longtext" ? "whitespace-pre-wrap" : "num"}`}>{showSetupValue(f, values[f.name] ?? null)}</dd>
                </div>
              ))}
          </dl>
        </div>
      ))}
    </div>
  );
}

export function SetupSideBySide({ fields, left, right, leftLabel, rightLabel }: { fields: SetupFieldDef[]; left: SetupValues; right: SetupValues; leftLabel: string; rightLabel: string }) {
  return (
    <table className="table-plain" data-testid="setup-compare">
      <thead>
        <tr>
          <th>Field</th>
          <th>{leftLabel}</th>
          <th>{rightLabel}</th>
        </tr>
      </thead>
      <tbody>
        {fields.map((f) => {
          const changed = (left[f.name] ?? null) !== (right[f.name] ?? null);
          return (
            <tr key={f.name} data-testid="setup-compare-row" data-field={f.name} data-changed={changed ? "true" : undefined} className={changed ? "bg-signal-500/10" : ""}>
              <td className={changed ? "font-semibold text-signal-400" : "text-ink-300"}>
                {f.label}
                {changed && <span className="ml-2 rounded border border-signal-600/50 px-1 text-[0.65rem] uppercase">changed</span>}
              </td>
              <td className="num whitespace-pre-wrap">{showSetupValue(f, left[f.name] ?? null)}</td>
              <td className={`num whitespace-pre-wrap ${changed ? "font-semibold text-signal-400" : ""}`}>{showSetupValue(f, right[f.name] ?? null)}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}
