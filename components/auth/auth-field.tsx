import type { InputHTMLAttributes } from "react";
import type { FieldError, UseFormRegisterReturn } from "react-hook-form";

/** One labelled input of the sign-in and sign-up forms, with its field error under it. */
export function AuthField({
  id,
  label,
  registration,
  error,
  ...input
}: { id: string; label: string; registration: UseFormRegisterReturn; error?: FieldError } & Pick<InputHTMLAttributes<HTMLInputElement>, "type" | "autoComplete">) {
  return (
    <div>
      <label className="label" htmlFor={id}>{label}</label>
      <input id={id} className="field" {...input} {...registration} />
      {error && <p className="mt-1 text-xs text-alert-400">{error.message}</p>}
    </div>
  );
}

/** The form-level error (the server's refusal), announced to screen readers. */
export function AuthFormError({ error }: { error: string | null }) {
  if (!error) return null;
  return (
    <p role="alert" data-testid="form-error" className="rounded-md border border-alert-500/50 bg-alert-500/10 px-3 py-2 text-sm text-alert-400">
      {error}
    </p>
  );
}
