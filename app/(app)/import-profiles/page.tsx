import type { Metadata } from "next";
import { pageTeam } from "@/lib/auth/page-guard";
import { listImportProfiles } from "@/lib/data/import-profiles";
import { ProfileCard } from "@/components/import-profiles/profile-card";

export const metadata: Metadata = { title: "Import profiles" };

export default async function ImportProfilesPage() {
  const ctx = await pageTeam({ permission: { setup: ["edit"] } }, "/import-profiles");
  const profiles = await listImportProfiles(ctx);
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
        <h1 className="text-2xl font-semibold">Import profiles</h1>
        <p className="mt-1 max-w-3xl text-sm text-ink-300">
          Each profile is the column mapping saved for one CSV header. Every later file with the same columns is read with it, without asking. Fix a role or a unit
          here; a session already read keeps its data until you use “Map again” on its page.
        </p>
      </div>
      {profiles.length === 0 ? (
        <p className="card text-sm text-ink-400">No Import profiles yet. One is saved the first time you map the columns of a CSV upload.</p>
      ) : (
        profiles.map((p) => <ProfileCard key={p.id} profile={p} />)
      )}
    </div>
  );
}
