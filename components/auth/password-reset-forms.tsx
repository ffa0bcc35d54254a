"use client";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import Link from "next/link";
import { authClient } from "@/lib/auth/client";

const requestSchema = z.object({ email: z.email("Enter a valid e-mail address") });

export function RequestResetForm() {
  const [sent, setSent] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<z.infer<typeof requestSchema>>({ resolver: zodResolver(requestSchema) });
  if (sent)
    return (
      <p role="status" className="text-sm text-ink-300">
        If an account uses that address, an e-mail with a reset link is on its way. The link is valid for one hour.
      </p>
    );
  return (
    <form
      noValidate
      className="space-y-4"
      onSubmit={handleSubmit(async ({ email }) => {
        setError(null);
        const { error } = await authClient.requestPasswordReset({ email, redirectTo: "/reset-password" });
        if (error) setError(error.message || "Could not send the e-mail.");
        else setSent(true);
      })}
    >
      <div>
        <label className="label" htmlFor="email">E-mail</label>
        <input id="email" type="email" className="field" {...register("email")} />
        {formState.errors.email && <p className="mt-1 text-xs text-alert-400">{formState.errors.email.message}</p>}
      </div>
      {error && <p role="alert" className="text-sm text-alert-400">{error}</p>}
      <button className="btn-primary w-full" disabled={formState.isSubmitting}>Send reset link</button>
    </form>
  );
}

const resetSchema = z
  .object({ password: z.string().min(10, "Use at least 10 characters").max(128), confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" });

export function ResetPasswordForm({ token }: { token: string | null }) {
  const [done, setDone] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<z.infer<typeof resetSchema>>({ resolver: zodResolver(resetSchema) });
  if (!token) return <p role="alert" className="text-sm text-alert-400">This reset link is incomplete or has expired. Ask for a new one.</p>;
  if (done)
    return (
      <p role="status" className="text-sm text-ink-300">
        Password changed. <Link className="text-signal-400" href="/sign-in">Sign in</Link>
      </p>
    );
  return (
    <form
      noValidate
      className="space-y-4"
      onSubmit={handleSubmit(async ({ password }) => {
        setError(null);
        const { error } = await authClient.resetPassword({ newPassword: password, token });
        if (error) setError(error.message || "This reset link is invalid or has expired.");
        else setDone(true);
      })}
    >
      <div>
        <label className="label" htmlFor="password">New password</label>
        <input id="password" type="password" autoComplete="new-password" className="field" {...register("password")} />
        {formState.errors.password && <p className="mt-1 text-xs text-alert-400">{formState.errors.password.message}</p>}
      </div>
      <div>
        <label className="label" htmlFor="confirm">New password again</label>
        <input id="confirm" type="password" autoComplete="new-password" className="field" {...register("confirm")} />
        {formState.errors.confirm && <p className="mt-1 text-xs text-alert-400">{formState.errors.confirm.message}</p>}
      </div>
      {error && <p role="alert" className="text-sm text-alert-400">{error}</p>}
      <button className="btn-primary w-full" disabled={formState.isSubmitting}>Set new password</button>
    </form>
  );
}
