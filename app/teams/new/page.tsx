import type { Metadata } from "next";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import Link from "next/link";
import { auth } from "@/lib/auth/auth";
import { Logo } from "@/components/ui/logo";
import { CreateTeamForm } from "@/components/team/create-team-form";

export const metadata: Metadata = { title: "Start a team" };

export default async function NewTeamPage() {
  const session = await auth.api.getSession({ headers: await headers() });
  if (!session) redirect("/sign-in?next=/teams/new");
  return (
    <main className="mx-auto max-w-md px-6 py-16">
      <Logo className="text-xl" />
      <h1 className="mt-10 text-2xl font-semibold">Start a team</h1>
      <p className="mb-6 mt-1 text-sm text-ink-300">
        You become its owner and can invite engineers, riders and crew. Were you invited to a team instead? Open the link in the invitation e-mail.
      </p>
      <CreateTeamForm />
      <p className="mt-6 text-sm text-ink-400">
        Signed in as {session.user.email}. <Link className="text-signal-400" href="/home">Back</Link>
      </p>
    </main>
  );
}
