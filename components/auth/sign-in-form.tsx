"use client";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import Link from "next/link";
import { authClient } from "@/lib/auth/client";
import { safeReturnPath } from "@/lib/http/safe-return-path";
import { AuthField, AuthFormError } from "./auth-field";

const schema = z.object({
  email: z.email("Enter the e-mail address you signed up with"),
  password: z.string().min(1, "Enter your password"),
});
type Values = z.infer<typeof schema>;

export function SignInForm({ next }: { next?: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(schema) });

  async function onSubmit(values: Values) {
    setError(null);
    const { error } = await authClient.signIn.email(values);
    if (error) {
      setError(
        error.status === 429
          ? "Too many sign-in attempts. Wait a minute and try again."
          : error.message || "Sign-in failed. Check the e-mail and password.",
      );
      return;
    }
    router.push(safeReturnPath(next, "/"));
    router.refresh();
  }

  return (
    <form onSubmit={handleSubmit(onSubmit)} className="space-y-4" noValidate>
      <AuthField id="email" label="E-mail" type="email" autoComplete="email" registration={register("email")} error={formState.errors.email} />
      <AuthField id="password" label="Password" type="password" autoComplete="current-password" registration={register("password")} error={formState.errors.password} />
      <AuthFormError error={error} />
      <button type="submit" className="btn-primary w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Signing in…" : "Sign in"}
      </button>
      <div className="flex justify-between text-sm text-ink-300">
        <Link href="/forgot-password" className="hover:text-signal-400">Forgot password?</Link>
        <Link href={next ? `/sign-up?next=${encodeURIComponent(next)}` : "/sign-up"} className="hover:text-signal-400">Create an account</Link>
      </div>
    </form>
  );
}
