import type { Metadata } from "next";
import { pageTeam } from "@/lib/auth/page-guard";
import { listTeamActivity } from "@/lib/data/activity-log";
import { ActivityList } from "@/components/record/activity-list";

export const metadata: Metadata = { title: "Activity" };

export default async function ActivityPage() {
  const ctx = await pageTeam({ roles: ["owner", "engineer"] }, "/activity");
  const entries = await listTeamActivity(ctx);
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
        <h1 className="text-2xl font-semibold">Activity</h1>
        <p className="mt-1 text-sm text-ink-400">Who changed what and when: setup saves, thresholds, tracks, roles, acknowledgements, deletions and engine moves. The latest 200.</p>
      </div>
      <section className="card">
        <ActivityList entries={entries} showSession />
      </section>
    </div>
  );
}
