import type { Metadata } from "next";
import { Suspense } from "react";
import { pageTeam } from "@/lib/auth/page-guard";
import { roleCan } from "@/lib/auth/guard";
import { RecentSessions } from "@/components/sessions/recent-sessions";
import { FindingsToReview } from "@/components/findings/findings-to-review";
import { EngineMarks } from "@/components/record/engine-marks";
import { listRecentSessions } from "@/lib/data/sessions";
import { listFindingsToReview } from "@/lib/data/findings";
import { enginesNearingRebuild } from "@/lib/data/engine-season";

export const metadata: Metadata = { title: "Team home" };

export default async function HomePage() {
  const ctx = await pageTeam({}, "/home");
  const canUpload = roleCan(ctx.role, { "session-data": ["upload"] });
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
          <h1 className="text-2xl font-semibold">Team home</h1>
        </div>
      </div>
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        <section aria-labelledby="recent" className="card">
          <h2 id="recent" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">
            {ctx.role === "rider" ? "Your sessions" : "Recent sessions"}
          </h2>
          <Suspense fallback={<div className="h-24 animate-pulse rounded bg-ink-850" />}>
            <RecentSessions sessions={listRecentSessions(ctx)} canUpload={canUpload} isRider={ctx.role === "rider"} />
          </Suspense>
        </section>
        <aside className="space-y-6">
          <Suspense fallback={null}>
            <EngineMarks near={ctx.role === "owner" || ctx.role === "engineer" ? enginesNearingRebuild(ctx) : null} />
          </Suspense>
          <section className="card" aria-labelledby="findings">
            <h2 id="findings" className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-300">Findings to review</h2>
            <Suspense fallback={<div className="h-16 animate-pulse rounded bg-ink-850" />}>
              <FindingsToReview items={listFindingsToReview(ctx, { limit: 8 })} />
            </Suspense>
          </section>
          <section className="card" aria-labelledby="you">
            <h2 id="you" className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-300">Your access</h2>
            <p className="text-sm text-ink-300">{accessText(ctx.role)}</p>
          </section>
        </aside>
      </div>
    </div>
  );
}

function accessText(role: string): string {
  switch (role) {
    case "owner":
      return "You run this team: members, roles and invitations, and everything the engineers do.";
    case "engineer":
      return "You upload logs, edit tracks, bikes, engines and setup sheets, and acknowledge findings.";
    case "rider":
      return "You see your own sessions and those shared with riders, and can add notes to your sessions.";
    default:
      return "You can view the team's sessions and setup sheets. Nothing can be changed from this account.";
  }
}
