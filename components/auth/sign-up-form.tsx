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

  return (
    <form onSubmit={handleSubmit(onSubmit)} className="space-y-4" noValidate>
      <AuthField id="name" label="Name" autoComplete="name" registration={register("name")} error={formState.errors.name} />
      <AuthField id="email" label="E-mail" type="email" autoComplete="email" registration={register("email")} error={formState.errors.email} />
      <AuthField id="password" label="Password" type="password" autoComplete="new-password" registration={register("password")} error={formState.errors.password} />
      <AuthField id="confirm" label="Password again" type="password" autoComplete="new-password" registration={register("confirm")} error={formState.errors.confirm} />
      <AuthFormError error={error} />
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
