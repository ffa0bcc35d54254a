import type { Metadata } from "next";
import { Suspense } from "react";
import { cookies } from "next/headers";
import { redirect } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { listRecentSessions } from "@/lib/data/sessions";
import { defaultCompareLaps } from "@/lib/data/compare-default";
import { UNIT_COOKIE, parseUnitSystem } from "@/lib/units/unit-system";
import { CompareView } from "@/components/compare/compare-view";

export const metadata: Metadata = { title: "Compare" };

export default async function ComparePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const ctx = await pageTeam({}, "/compare");
  const sp = await searchParams;
  // The lap table's form sends one `lap` per ticked box; the view's URL holds them as `laps`.
  if (sp.lap) {
    const ticked = Array.isArray(sp.lap) ? sp.lap : [sp.lap];
    redirect(`/compare?laps=${ticked.map((l) => encodeURIComponent(l).replace(/%3A/gi, ":")).join(",")}`);
  }
  // Opened with no view in the URL (from the menu): start on the latest ready session's two fastest flying laps.
  if (Object.keys(sp).length === 0) {
    const first = await defaultCompareLaps(ctx);
    if (first) redirect(`/compare?laps=${first.laps.map((n) => `${first.sessionId}:${n}`).join(",")}`);
  }
  const sessions = (await listRecentSessions(ctx, 100)).map((s) => ({ id: s.id, title: s.title, status: s.status, riderName: s.riderName, startedAt: s.startedAt }));
  const units = parseUnitSystem((await cookies()).get(UNIT_COOKIE)?.value);
  return (
    <div className="space-y-4">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
        <h1 className="text-2xl font-semibold">Compare</h1>
      </div>
      <Suspense fallback={<div className="h-96 animate-pulse rounded-lg bg-ink-900" />}>
        <CompareView sessions={sessions} initialUnits={units} />
      </Suspense>
    </div>
  );
}
