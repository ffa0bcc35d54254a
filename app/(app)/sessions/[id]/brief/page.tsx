import type { Metadata } from "next";
import { briefForViewer } from "@/lib/data/viewer-analyses";
import { listBriefSessions } from "@/lib/data/brief-sessions";
import { viewerSession } from "@/lib/auth/viewer-session";
import { AnalysisHeader } from "@/components/analysis/analysis-header";
import { BriefView } from "@/components/brief/brief-view";

export const metadata: Metadata = { title: "Rider brief" };

export default async function SessionBriefPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ lap?: string }> }) {
  const { id } = await params;
  const sp = await searchParams;
  const { ctx, session } = await viewerSession(id, `/sessions/${id}/brief`);
  const [brief, sessions] = await Promise.all([briefForViewer(ctx, session.id, { lap: sp.lap ? Number(sp.lap) : null }), listBriefSessions(ctx)]);
  return (
    <div className="space-y-6">
      <AnalysisHeader title="Rider brief" session={session} current="brief" />
      <BriefView brief={brief} sessions={sessions} isRider={ctx.role === "rider"} basePath={(sid, lap) => `/sessions/${sid}/brief${lap != null ? `?lap=${lap}` : ""}`} />
    </div>
  );
}
