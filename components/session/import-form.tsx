"use client";
/**
 * The import screen's form: session details, then the column mapping (role, unit, calibration per
 * column, with the suggestion's confidence). Checked in the browser with the same zod schema the
 * server action uses; the server's per-field errors land on the same fields.
 */
import type { ImportScreenColumn, SessionDetailsView } from "@/lib/data/session-edit";
import { useState, useTransition } from "react";
import { FormProvider, useFieldArray, useForm, useWatch, type FieldPath } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { CHANNEL_ROLES, ROLE_LABEL, type ChannelRole } from "@/lib/channels/roles";
import { unitsForRole } from "@/lib/ingest/units";
import { importFormSchema, TIME_FORMATS, TIME_FORMAT_LABEL, type ImportFormInput, type ImportFormValues } from "@/lib/forms/session-form";
import { confirmImportAction } from "@/lib/actions/imports";
import { SessionDetailsFields, FieldError, toLocalInput, type DetailOptions } from "./session-details-fields";

// The server's shape of a column on the import screen (a type-only import: nothing server-side is bundled).
export type MappingColumnView = ImportScreenColumn;

export interface ImportFormProps {
  sessionId: number;
  columns: MappingColumnView[];
  timeFormat: ImportFormInput["timeFormat"];
  profileName: string;
  existingProfile: { id: number; name: string } | null;
  mappedBefore: boolean;
  details: SessionDetailsView;
  options: DetailOptions;
}

const ROLE_CHOICES = [...CHANNEL_ROLES, "ignore"] as const;
const TIME_UNIT: Record<ImportFormInput["timeFormat"], string> = { seconds: "s", milliseconds: "ms", iso8601: "" };

/** The units offered for a column: the role's known units, plus what the file itself says. */
function unitChoices(role: string, fileUnit: string, current: string): string[] {
  const list = role === "ignore" || role === "time" ? [] : unitsForRole(role as ChannelRole);
  for (const u of [fileUnit, current]) if (u && !list.includes(u)) list.push(u);
  return list;
}

function confidenceClass(c: number): string {
  return c >= 0.8 ? "text-ok-400" : c >= 0.5 ? "text-signal-400" : "text-alert-400";
}

export function ImportForm(props: ImportFormProps) {
  const [pending, startTransition] = useTransition();
  const [message, setMessage] = useState<string | null>(null);
  const form = useForm<ImportFormInput, unknown, ImportFormValues>({
    resolver: zodResolver(importFormSchema),
    mode: "onSubmit",
    reValidateMode: "onChange",
    defaultValues: {
      title: props.details.title,
      kind: props.details.kind as ImportFormInput["kind"],
      eventId: props.details.eventId ? String(props.details.eventId) : "",
      bikeId: props.details.bikeId ? String(props.details.bikeId) : "",
      engineId: props.details.engineId ? String(props.details.engineId) : "",
      riderId: props.details.riderId ? String(props.details.riderId) : "",
      startedAt: toLocalInput(props.details.startedAt),
      conditions: props.details.conditions,
      sharedWithRiders: props.details.sharedWithRiders,
      profileName: props.profileName,
      updateProfile: true,
      timeFormat: props.timeFormat,
      columns: props.columns.map((c) => ({ index: c.index, role: c.role, unit: c.unit, scale: c.scale, offset: c.offset })),
    },
  });
  const { register, control, setValue, getValues, setError, formState } = form;
  const { fields } = useFieldArray({ control, name: "columns" });
  const roles = useWatch({ control, name: "columns" });
  const timeFormat = useWatch({ control, name: "timeFormat" });
  const updateProfile = useWatch({ control, name: "updateProfile" });
  const errors = formState.errors;

  function onRoleChange(i: number, role: string) {
    const col = props.columns[i]!;
    if (role === "time") {
      setValue(`columns.${i}.unit`, TIME_UNIT[getValues("timeFormat")]);
      return;
    }
    // Keep a unit that still fits; else the file's own; else ask (an empty choice fails validation).
    const ok = unitChoices(role, "", "");
    const cur = getValues(`columns.${i}.unit`);
    const next = ok.length === 0 ? (role === "ignore" ? cur : col.fileUnit) : ok.includes(cur) ? cur : ok.includes(col.fileUnit) ? col.fileUnit : "";
    setValue(`columns.${i}.unit`, next);
  }

  const onSubmit = form.handleSubmit(() => {
    setMessage(null);
    // Send what the person entered; the server parses it with the same schema.
    const raw = getValues();
    startTransition(async () => {
      const res = await confirmImportAction(props.sessionId, raw);
      if (!res || res.ok) return;
      setMessage(res.message ?? "The import could not be confirmed.");
      for (const [path, msg] of Object.entries(res.errors ?? {})) setError(path as FieldPath<ImportFormInput>, { type: "server", message: msg });
    });
  }, () => setMessage("Some fields need another look; see the messages beside them."));

  const columnErrors = errors.columns;
  const rootColumnsError = (columnErrors as { message?: string } | undefined)?.message ?? columnErrors?.root?.message;

  return (
    <FormProvider {...form}>
      <form onSubmit={onSubmit} noValidate className="space-y-6" aria-label="Session details and column mapping">
        <section className="card" aria-labelledby="details-heading">
          <h2 id="details-heading" className="mb-4 text-sm font-semibold uppercase tracking-wide text-ink-300">Session details</h2>
          <SessionDetailsFields options={props.options} />
        </section>

        <section className="card" aria-labelledby="mapping-heading">
          <div className="mb-4 flex flex-wrap items-end justify-between gap-4">
            <div>
              <h2 id="mapping-heading" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Column mapping</h2>
              <p className="mt-1 text-sm text-ink-400">Say what each column holds and which unit it is in. Values are converted to SI units on import. Calibration: value = raw × scale + offset, in the chosen unit.</p>
            </div>
            <div className="flex flex-wrap gap-4">
              <div>
                <label className="label" htmlFor="timeFormat">Time column is written in</label>
                <select
                  id="timeFormat"
                  className="field w-auto"
                  aria-invalid={!!errors.timeFormat}
                  {...register("timeFormat", {
                    onChange: (e) => {
                      const i = getValues("columns").findIndex((c) => c.role === "time");
                      if (i >= 0) setValue(`columns.${i}.unit`, TIME_UNIT[e.target.value as ImportFormInput["timeFormat"]]);
                    },
                  })}
                >
                  {TIME_FORMATS.map((f) => (
                    <option key={f} value={f}>{TIME_FORMAT_LABEL[f]}</option>
                  ))}
                </select>
                <FieldError id="timeFormat-error" message={errors.timeFormat?.message} />
              </div>
              <div className="min-w-56">
                <label className="label" htmlFor="profileName">Import profile name</label>
                <input id="profileName" className="field" aria-invalid={!!errors.profileName} {...register("profileName")} />
                <FieldError id="profileName-error" message={errors.profileName?.message} />
              </div>
            </div>
          </div>

          <div className="overflow-x-auto">
            <table className="table-plain" data-testid="mapping-table">
              <thead>
                <tr>
                  <th>Column</th>
                  <th>First values</th>
                  <th>Role</th>
                  <th>Unit</th>
                  <th className="w-24">Scale</th>
                  <th className="w-24">Offset</th>
                  <th>Suggestion</th>
                </tr>
              </thead>
              <tbody>
                {fields.map((f, i) => {
                  const col = props.columns[i]!;
                  const role = roles?.[i]?.role ?? col.role;
                  const unit = roles?.[i]?.unit ?? col.unit;
                  const choices = unitChoices(role, col.fileUnit, unit);
                  const e = columnErrors?.[i];
                  const ignored = role === "ignore";
                  return (
                    <tr key={f.id} data-testid="mapping-row" data-column={col.header} className={ignored ? "opacity-60" : ""}>
                      <td>
                        <span className="font-medium">{col.name}</span>
                        <span className="block text-xs text-ink-400">
                          column {col.index + 1}
                          {col.fileUnit ? ` · file says [${col.fileUnit}]` : " · no unit in file"}
                        </span>
                      </td>
                      <td className="num text-xs text-ink-300">{col.samples.filter((s) => s !== "").slice(0, 3).join(" · ") || "—"}</td>
                      <td>
                        <select
                          aria-label={`Role of ${col.name}`}
                          className="field py-1"
                          aria-invalid={!!e?.role}
                          {...register(`columns.${i}.role`, { onChange: (ev) => onRoleChange(i, ev.target.value) })}
                        >
                          {ROLE_CHOICES.map((r) => (
                            <option key={r} value={r}>{r === "ignore" ? "Ignore this column" : ROLE_LABEL[r]}</option>
                          ))}
                        </select>
                        <FieldError id={`columns-${i}-role-error`} message={e?.role?.message} />
                      </td>
                      <td>
                        {role === "time" ? (
                          <span className="text-sm text-ink-300">{timeFormat === "iso8601" ? "date-time" : TIME_UNIT[timeFormat]}</span>
                        ) : ignored ? (
                          <span className="text-sm text-ink-400">—</span>
                        ) : (
                          <select aria-label={`Unit of ${col.name}`} className="field py-1" aria-invalid={!!e?.unit} {...register(`columns.${i}.unit`)}>
                            <option value="">{choices.length ? "Choose…" : "(none)"}</option>
                            {choices.map((u) => (
                              <option key={u} value={u}>{u}{u === col.fileUnit ? " (file)" : ""}</option>
                            ))}
                          </select>
                        )}
                        <FieldError id={`columns-${i}-unit-error`} message={e?.unit?.message} />
                      </td>
                      <td>
                        <input aria-label={`Scale of ${col.name}`} type="number" step="any" className="field num py-1" readOnly={ignored || role === "time"} aria-invalid={!!e?.scale} {...register(`columns.${i}.scale`, { valueAsNumber: true })} />
                        <FieldError id={`columns-${i}-scale-error`} message={e?.scale?.message} />
                      </td>
                      <td>
                        <input aria-label={`Offset of ${col.name}`} type="number" step="any" className="field num py-1" readOnly={ignored || role === "time"} aria-invalid={!!e?.offset} {...register(`columns.${i}.offset`, { valueAsNumber: true })} />
                        <FieldError id={`columns-${i}-offset-error`} message={e?.offset?.message} />
                      </td>
                      <td className="text-xs">
                        {col.confidence != null ? (
                          <>
                            <span className={`num font-semibold ${confidenceClass(col.confidence)}`}>{Math.round(col.confidence * 100)}%</span>
                            <span className="block text-ink-400">{col.reason}</span>
                          </>
                        ) : (
                          <span className="text-ink-400">—</span>
                        )}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          {rootColumnsError && <p className="mt-2 text-sm text-alert-400">{rootColumnsError}</p>}
        </section>

        {props.existingProfile && (
          <fieldset className="card space-y-2" data-testid="update-profile">
            <legend className="px-1 text-sm font-semibold text-ink-100">Update the Import profile “{props.existingProfile.name}” with this mapping?</legend>
            <p className="text-sm text-ink-400">Every later file with these columns is read with the profile. Sessions already read keep their data until they are mapped again.</p>
            <label className="flex items-center gap-2 text-sm">
              <input type="radio" name="updateProfile" checked={updateProfile !== false} onChange={() => setValue("updateProfile", true)} />
              Yes, update the profile (and its name above)
            </label>
            <label className="flex items-center gap-2 text-sm">
              <input type="radio" name="updateProfile" checked={updateProfile === false} onChange={() => setValue("updateProfile", false)} />
              No, use this mapping for this session only
            </label>
          </fieldset>
        )}

        <div className="flex flex-wrap items-center gap-4">
          <button type="submit" className="btn-primary" disabled={pending}>{pending ? "Saving…" : props.mappedBefore ? "Save and read the file again" : "Save and import"}</button>
          <p className="text-sm text-ink-400">
            {props.mappedBefore
              ? "Laps, findings and analyses are computed again from the file; setup sheets, notes and acknowledgements stay."
              : "The mapping is saved as an Import profile; the next file with these columns is read without asking."}
          </p>
        </div>
        {message && (
          <p role="alert" className="rounded-md border border-alert-500/50 bg-alert-500/10 px-3 py-2 text-sm text-alert-400">{message}</p>
        )}
      </form>
    </FormProvider>
  );
}
