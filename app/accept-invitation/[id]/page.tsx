import type { Metadata } from "next";
import Link from "next/link";
import { headers } from "next/headers";
import { auth } from "@/lib/auth/auth";
import { getInvitation } from "@/lib/data/team";
import { Logo } from "@/components/ui/logo";
import { AcceptInvitationButton } from "@/components/team/accept-invitation";
import { ResendVerificationButton } from "@/components/auth/resend-verification";

export const metadata: Metadata = { title: "Team invitation" };

export default async function AcceptInvitationPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const [invitation, session] = await Promise.all([getInvitation(id), auth.api.getSession({ headers: await headers() })]);
  const here = `/accept-invitation/${encodeURIComponent(id)}`;
  let body: React.ReactNode;
  if (!invitation || invitation.status === "canceled" || invitation.status === "rejected") {
    body = <p role="alert" className="text-alert-400">This invitation does not exist or was withdrawn. Ask the team owner for a new one.</p>;
  } else if (invitation.status === "accepted") {
    body = <p>This invitation was already accepted. <Link className="text-signal-400" href="/home">Go to team home</Link></p>;
  } else if (new Date(invitation.expiresAt) < new Date()) {
    body = <p role="alert" className="text-alert-400">This invitation expired on {invitation.expiresAt.slice(0, 10)}. Ask the team owner to send it again.</p>;
  } else if (!session) {
    body = (
      <div className="space-y-3">
        <p>Sign in or create an account with <strong>{invitation.email}</strong> to accept.</p>
        <div className="flex gap-3">
          <Link className="btn-primary" href={`/sign-up?next=${encodeURIComponent(here)}&email=${encodeURIComponent(invitation.email)}`}>Create account</Link>
          <Link className="btn-quiet" href={`/sign-in?next=${encodeURIComponent(here)}`}>Sign in</Link>
        </div>
      </div>
    );
  } else if (session.user.email.toLowerCase() !== invitation.email.toLowerCase()) {
    body = (
      <p role="alert" className="text-alert-400">
        This invitation is for {invitation.email}, but you are signed in as {session.user.email}. Sign out and sign in with the invited address.
      </p>
    );
  } else if (!session.user.emailVerified) {
    body = (
      <div className="space-y-3" data-testid="verify-first">
        <p>
          Confirm your address first: we sent a link to <strong>{invitation.email}</strong>. Open it, then come back here.
        </p>
        <ResendVerificationButton email={invitation.email} callbackURL={here} />
      </div>
    );
  } else {
    body = <AcceptInvitationButton invitationId={invitation.id} />;
  }
  return (
    <main className="mx-auto max-w-md px-6 py-16">
      <Logo className="text-xl" />
      <h1 className="mt-10 text-2xl font-semibold">{invitation ? `Join ${invitation.teamName}` : "Team invitation"}</h1>
      {invitation && (
        <p className="mb-6 mt-1 text-sm text-ink-300">
          {invitation.inviterName ?? "A team owner"} invited {invitation.email} as <span className="capitalize">{invitation.role}</span>.
        </p>
      )}
      <div className="card">{body}</div>
    </main>
  );
}
