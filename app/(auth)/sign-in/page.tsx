import type { Metadata } from "next";
import { SignInForm } from "@/components/auth/sign-in-form";
import { demoTeamPresent } from "@/lib/data/demo-team";
import { safeReturnPath } from "@/lib/http/safe-return-path";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { next: asked } = await searchParams;
  const next = asked ? safeReturnPath(asked, "") || undefined : undefined;
  const demo = await demoTeamPresent();
  return (
    <>
      <h1 className="text-2xl font-semibold">Sign in</h1>
      <p className="mb-6 mt-1 text-sm text-ink-300">Your team&apos;s sessions, laps and findings.</p>
      <SignInForm next={next} />
      {demo && (
        <p className="mt-6 rounded border border-ink-700 p-3 text-xs text-ink-300" data-testid="demo-note">
          This install carries the invented demo team and its demo sign-ins (see the README): it was started with{" "}
          <code>npm start -- --demo</code> or on an empty database. Anyone who can open this page can use them.
        </p>
      )}
    </>
  );
}
