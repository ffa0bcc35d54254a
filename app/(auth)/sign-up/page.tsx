import type { Metadata } from "next";
import { SignUpForm } from "@/components/auth/sign-up-form";
import { safeReturnPath } from "@/lib/http/safe-return-path";

export const metadata: Metadata = { title: "Create an account" };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<{ next?: string; email?: string }> }) {
  const { next, email } = await searchParams;
  return (
    <>
      <h1 className="text-2xl font-semibold">Create an account</h1>
      <p className="mb-6 mt-1 text-sm text-ink-300">Then start a team, or accept the invitation you were sent.</p>
      <SignUpForm next={next ? safeReturnPath(next, "") || undefined : undefined} email={email} />
    </>
  );
}
