"use client";
/** Small pieces the setup forms share: a field with its error, and the form's status line. */
import type { ReactNode } from "react";
import type { SetupActionState } from "@/lib/actions/setup-state";

export function Feedback({ state }: { state: SetupActionState }) {
  if (!state.message) return null;
  return (
    <p role={state.ok ? "status" : "alert"} className={`text-sm ${state.ok ? "text-ok-400" : "text-alert-400"}`}>
      {state.message}
    </p>
  );
}

export function FieldError({ state, name }: { state: SetupActionState; name: string }) {
  const msg = state.errors?.[name];
  if (!msg) return null;
  return <p className="mt-1 text-xs text-alert-400">{msg}</p>;
}

interface FieldProps {
  state: SetupActionState;
  name: string;
  label: string;
  defaultValue?: string | number | null;
  /** Id prefix, so the same form can appear more than once on a page. */
  idPrefix?: string;
  type?: string;
  unit?: string;
  hint?: ReactNode;
  readOnly?: boolean;
  className?: string;
  placeholder?: string;
  inputMode?: "decimal" | "numeric" | "text";
  /** In a row whose labels wrap: bottom-align the labels so the inputs line up. */
  align?: boolean;
}

/** A labelled input that shows what was submitted after a refused save, and its error. */
export function Field({ state, name, label, defaultValue, idPrefix = "f", type = "text", unit, hint, readOnly, className = "", placeholder, inputMode, align }: FieldProps) {
  const id = `${idPrefix}-${name}`;
  const value = state.values?.[name] ?? (defaultValue == null ? "" : String(defaultValue));
  const err = state.errors?.[name];
  return (
    <div className={className}>
      <label className={`label ${align ? "sm:flex sm:min-h-8 sm:items-end" : ""}`} htmlFor={id}>
        <span>
          {label}
          {unit && <span className="ml-1 normal-case tracking-normal text-ink-400">({unit})</span>}
        </span>
      </label>
      <input
        // Remount with the submitted values: React resets a form after its action runs.
        key={value}
        id={id}
        name={name}
        type={type}
        defaultValue={value}
        readOnly={readOnly}
        disabled={readOnly}
        placeholder={placeholder}
        inputMode={inputMode}
        aria-invalid={err ? true : undefined}
        aria-describedby={err ? `${id}-error` : undefined}
        className={`field ${type === "text" && inputMode ? "num" : ""} ${err ? "border-alert-500" : ""}`}
      />
      {hint && <p className="mt-1 text-xs text-ink-400">{hint}</p>}
      {err && (
        <p id={`${id}-error`} className="mt-1 text-xs text-alert-400">
          {err}
        </p>
      )}
    </div>
  );
}
