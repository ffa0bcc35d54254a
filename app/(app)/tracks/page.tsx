import type { Metadata } from "next";
import Link from "next/link";
import { pageTeam } from "@/lib/auth/page-guard";
import { listSessionsWithoutTrack, listTracks } from "@/lib/data/track-editor";
import { canEditSetup } from "@/lib/data/setup-access";
import { CreateTrackForm } from "@/components/tracks/create-track-form";

export const metadata: Metadata = { title: "Tracks" };

export default async function TracksPage() {
  const ctx = await pageTeam({}, "/tracks");
  const editable = canEditSetup(ctx);
  const [tracks, free] = await Promise.all([listTracks(ctx), editable ? listSessionsWithoutTrack(ctx) : []]);
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
        <h1 className="text-2xl font-semibold">Tracks</h1>
        <p className="mt-1 text-sm text-ink-400">
          Gates, corners and the pit-lane limit of each circuit, set on the recorded GPS outline.{!editable && " Read-only: engineers and the owner edit tracks."}
        </p>
      </div>
      <section className="card" aria-labelledby="tracks-h">
        <h2 id="tracks-h" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Tracks</h2>
        {tracks.length === 0 ? (
          <p className="text-sm text-ink-400">No tracks yet.</p>
        ) : (
          <table className="table-plain" data-testid="tracks-table">
            <thead>
              <tr>
                <th>Track</th>
                <th className="text-right">Lap</th>
                <th>Gates</th>
                <th className="text-right">Corners</th>
                <th className="text-right">Pit limit</th>
                <th className="text-right">Sessions</th>
              </tr>
            </thead>
            <tbody>
              {tracks.map((t) => (
                <tr key={t.id}>
                  <td className="font-medium"><Link className="text-signal-400 hover:underline" href={`/tracks/${t.id}`}>{t.name}</Link></td>
                  <td className="num text-right">{t.lengthM ? `${Math.round(t.lengthM)} m` : "—"}</td>
                  <td className="text-ink-300">
                    {t.hasStartFinish ? "start/finish" : <span className="text-signal-400">no start/finish</span>}
                    {t.sectorCount > 0 && `, ${t.sectorCount} sector${t.sectorCount === 1 ? "" : "s"}`}
                  </td>
                  <td className="num text-right">{t.cornerCount}</td>
                  <td className="num text-right">{t.pitSpeedLimitKmh ? `${t.pitSpeedLimitKmh} km/h` : "—"}</td>
                  <td className="num text-right">{t.sessionCount}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      {editable && (
        <section className="card" aria-labelledby="new-track-h">
          <h2 id="new-track-h" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">New track</h2>
          <CreateTrackForm sessions={free} />
        </section>
      )}
    </div>
  );
}
