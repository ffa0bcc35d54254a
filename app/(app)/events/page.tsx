import type { Metadata } from "next";
import Link from "next/link";
import { pageTeam } from "@/lib/auth/page-guard";
import { listEvents, listTrackOptions } from "@/lib/data/events";
import { canEditSetup } from "@/lib/data/setup-access";
import { EventForm } from "@/components/events/event-forms";

export const metadata: Metadata = { title: "Events" };

function dates(a: string | null, b: string | null): string {
  if (!a) return "No dates";
  return b && b !== a ? `${a} – ${b}` : a;
}

export default async function EventsPage() {
  const ctx = await pageTeam({}, "/events");
  const editable = canEditSetup(ctx);
  const [events, tracks] = await Promise.all([listEvents(ctx), listTrackOptions(ctx)]);
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
        <h1 className="text-2xl font-semibold">Events</h1>
        <p className="mt-1 text-sm text-ink-400">
          Race meetings and test days with their sessions.{!editable && " Read-only: engineers and the owner add and change events."}
        </p>
      </div>
      {editable && (
        <section className="card" aria-labelledby="add-event-h">
          <h2 id="add-event-h" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Add an event</h2>
          <EventForm event={{ name: "", trackId: null, startsOn: null, endsOn: null }} tracks={tracks} />
        </section>
      )}
      {events.length === 0 && <p className="card text-sm text-ink-400">No events yet.</p>}
      {events.map((e) => (
        <section key={e.id} className="card" aria-label={e.name} data-testid="event">
          <header className="flex flex-wrap items-baseline justify-between gap-2">
            <h2 className="text-lg font-semibold">{e.name}</h2>
            <p className="text-sm text-ink-300">
              <span className="num">{dates(e.startsOn, e.endsOn)}</span>
              {" · "}
              {e.trackId ? <Link className="text-signal-400 hover:underline" href={`/tracks/${e.trackId}`}>{e.trackName}</Link> : <span className="text-ink-400">no track</span>}
              {" · "}
              <Link className="text-signal-400 hover:underline" href={`/events/${e.id}/report`}>Report</Link>
            </p>
          </header>
          {e.sessions.length === 0 ? (
            <p className="mt-2 text-sm text-ink-400">No sessions {ctx.role === "rider" ? "you can see " : ""}in this event yet.</p>
          ) : (
            <table className="table-plain mt-3">
              <thead>
                <tr>
                  <th>Session</th>
                  <th>Kind</th>
                  <th>Rider</th>
                  <th>Started (UTC)</th>
                  <th>Status</th>
                </tr>
              </thead>
              <tbody>
                {e.sessions.map((s) => (
                  <tr key={s.id}>
                    <td><Link className="text-signal-400 hover:underline" href={`/sessions/${s.id}`}>{s.title}</Link></td>
                    <td className="capitalize">{s.kind}</td>
                    <td className="text-ink-300">{s.riderName ?? "—"}</td>
                    <td className="num text-ink-300">{s.startedAt ? s.startedAt.slice(0, 16).replace("T", " ") : "—"}</td>
                    <td className={s.status === "failed" ? "text-alert-400" : s.status === "ready" ? "text-ok-400" : "text-ink-300"}>{s.status}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          {editable && (
            <details className="mt-3 border-t border-ink-800 pt-3">
              <summary className="cursor-pointer text-sm text-ink-300 hover:text-ink-100">Edit {e.name}</summary>
              <div className="mt-3">
                <EventForm event={e} tracks={tracks} />
              </div>
            </details>
          )}
        </section>
      ))}
    </div>
  );
}
