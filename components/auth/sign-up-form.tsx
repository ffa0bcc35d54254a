"use client";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import Link from "next/link";
import { authClient } from "@/lib/auth/client";
import { safeReturnPath } from "@/lib/http/safe-return-path";

const MIN = 10;
const schema = z
  .object({
    name: z.string().trim().min(2, "Enter your name as the team will see it").max(120),
    email: z.email("Enter a valid e-mail address"),
    password: z.string().min(MIN, `Use at least ${MIN} characters`).max(128),
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" });
type Values = z.infer<typeof schema>;

export function SignUpForm({ next, email }: { next?: string; email?: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { email: email ?? "" } });

  async function onSubmit(v: Values) {
    setError(null);
    // The address-confirmation link mailed on sign-up comes back to the same page.
    const { error } = await authClient.signUp.email({ name: v.name, email: v.email, password: v.password, callbackURL: safeReturnPath(next, "/teams/new") });
    if (error) {
      setError(error.message || "Could not create the account.");
      return;
    }
    router.push(safeReturnPath(next, "/teams/new"));
    router.refresh();
  }

  const err = (k: keyof Values) =>
    formState.errors[k] && <p className="mt-1 text-xs text-alert-400">{formState.errors[k]?.message}</p>;

  return (
    <form onSubmit={handleSubmit(onSubmit)} className="space-y-4" noValidate>
      <div>
        <label className="label" htmlFor="name">Name</label>
        <input id="name" autoComplete="name" className="field" {...register("name")} />
        {err("name")}
      </div>
      <div>
        <label className="label" htmlFor="email">E-mail</label>
        <input id="email" type="email" autoComplete="email" className="field" {...register("email")} />
        {err("email")}
      </div>
      <div>
        <label className="label" htmlFor="password">Password</label>
        <input id="password" type="password" autoComplete="new-password" className="field" {...register("password")} />
        {err("password")}
      </div>
      <div>
        <label className="label" htmlFor="confirm">Password again</label>
        <input id="confirm" type="password" autoComplete="new-password" className="field" {...register("confirm")} />
        {err("confirm")}
      </div>
      {error && (
        <p role="alert" data-testid="form-error" className="rounded-md border border-alert-500/50 bg-alert-500/10 px-3 py-2 text-sm text-alert-400">
          {error}
        </p>
      )}
      <button type="submit" className="btn-primary w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Creating…" : "Create account"}
      </button>
      <p className="text-sm text-ink-300">
        Already have an account?{" "}
        <Link href={next ? `/sign-in?next=${encodeURIComponent(next)}` : "/sign-in"} className="text-signal-400 hover:underline">Sign in</Link>
      </p>
    </form>
  );
}
