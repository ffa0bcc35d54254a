import type { Metadata } from "next";
import Link from "next/link";
import { pageTeam } from "@/lib/auth/page-guard";
import { roleCan } from "@/lib/auth/guard";
import { parseId } from "@/lib/http/parse-id";
import { listSessions } from "@/lib/data/session-list";
import { SessionTable } from "@/components/sessions/session-table";

export const metadata: Metadata = { title: "Sessions" };

type Search = Promise<Record<string, string | string[] | undefined>>;

export default async function SessionsPage({ searchParams }: { searchParams: Search }) {
  const ctx = await pageTeam({}, "/sessions");
  const q = await searchParams;
  const eventId = parseId(q.event);
  const riderId = parseId(q.rider);
  const { sessions, events, riders } = await listSessions(ctx, { eventId, riderId });
  const canUpload = roleCan(ctx.role, { "session-data": ["upload"] });
  const filtered = eventId != null || riderId != null;

  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
          <h1 className="text-2xl font-semibold">Sessions</h1>
          {ctx.role === "rider" && <p className="mt-1 text-sm text-ink-400">Your own sessions and those shared with riders.</p>}
        </div>
        {canUpload && <Link href="/upload" className="btn-primary">Upload a log</Link>}
      </div>

      {/* A plain GET form: the filter lives in the URL, so a link reproduces it. */}
      <form method="get" className="card flex flex-wrap items-end gap-4" aria-label="Filter sessions">
        <div>
          <label className="label" htmlFor="f-event">Event</label>
          <select id="f-event" name="event" defaultValue={eventId ?? ""} className="field w-auto min-w-48">
            <option value="">All events</option>
            {events.map((e) => (
              <option key={e.id} value={e.id}>{e.name}</option>
            ))}
          </select>
        </div>
        <div>
          <label className="label" htmlFor="f-rider">Rider</label>
          <select id="f-rider" name="rider" defaultValue={riderId ?? ""} className="field w-auto min-w-48">
            <option value="">All riders</option>
            {riders.map((r) => (
              <option key={r.id} value={r.id}>{r.name}</option>
            ))}
          </select>
        </div>
        <button className="btn-quiet">Filter</button>
        {filtered && <Link href="/sessions" className="text-sm text-ink-300 hover:underline">Clear</Link>}
      </form>

      <section className="card" aria-label="Session list">
        {sessions.length === 0 ? (
          <p className="py-6 text-center text-sm text-ink-400" data-testid="sessions-empty">
            {filtered ? "No sessions match this filter." : "No sessions yet."}
          </p>
        ) : (
          <SessionTable sessions={sessions} />
        )}
      </section>
    </div>
  );
}
