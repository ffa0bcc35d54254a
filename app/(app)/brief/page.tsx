import type { Metadata } from "next";
import Link from "next/link";
import { pageTeam } from "@/lib/auth/page-guard";
import { listBriefSessions } from "@/lib/data/brief-sessions";
import { briefForViewer } from "@/lib/data/viewer-analyses";
import { BriefView } from "@/components/brief/brief-view";

export const metadata: Metadata = { title: "Rider brief" };

/** The rider's landing page: the brief of their latest analysed session (?session=, ?lap= to pick another). */
export default async function BriefPage({ searchParams }: { searchParams: Promise<{ session?: string; lap?: string }> }) {
  const ctx = await pageTeam({}, "/brief");
  const sp = await searchParams;
  const sessions = await listBriefSessions(ctx);
  const chosen = sessions.find((s) => String(s.id) === sp.session) ?? sessions[0];
  const isRider = ctx.role === "rider";
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{chosen ? chosen.title : ctx.teamName}</p>
          <h1 className="text-2xl font-semibold">Rider brief</h1>
        </div>
        {isRider ? (
          <Link href="/home" className="btn-quiet text-xs">
            Team home
          </Link>
        ) : null}
      </div>
      {chosen ? (
        <BriefView
          brief={await briefForViewer(ctx, chosen.id, { lap: sp.lap ? Number(sp.lap) : null })}
          sessions={sessions}
          isRider={isRider}
          basePath={(id, lap) => `/brief?session=${id}${lap != null ? `&lap=${lap}` : ""}`}
        />
      ) : (
        <p className="card text-sm text-ink-400" data-testid="brief-empty">
          {isRider ? "No analysed session of yours yet. Your brief appears here once the team has uploaded one." : "No analysed sessions yet."}
        </p>
      )}
    </div>
  );
}
