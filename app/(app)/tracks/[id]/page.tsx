import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { getTrackEditor } from "@/lib/data/track-editor";
import { canEditSetup } from "@/lib/data/setup-access";
import { parseId } from "@/lib/http/parse-id";
import { HttpError } from "@/lib/http/http-error";
import { GateEditor } from "@/components/tracks/gate-editor";

export const metadata: Metadata = { title: "Track" };

export default async function TrackPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ session?: string }> }) {
  const { id: raw } = await params;
  const ctx = await pageTeam({}, `/tracks/${raw}`);
  const id = parseId(raw);
  if (!id) notFound();
  const sessionId = parseId((await searchParams).session ?? "");
  const data = await getTrackEditor(ctx, id, sessionId).catch((e) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  const editable = canEditSetup(ctx);
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">
            <Link href="/tracks" className="hover:underline">Tracks</Link>
          </p>
          <h1 className="text-2xl font-semibold">{data.name}</h1>
          {!editable && <p className="text-sm text-ink-400">Read-only: engineers and the owner edit gates and corners.</p>}
        </div>
        {data.sessions.length > 0 && (
          <form method="get" className="flex items-end gap-2" aria-label="Outline from a session">
            <div>
              <label className="label" htmlFor="outline-session">Draw from session</label>
              <select id="outline-session" name="session" defaultValue={data.sessionId ?? ""} className="field">
                <option value="">{data.outlineSource === "track" || !data.sessionId ? "Stored outline" : "Latest session"}</option>
                {data.sessions.map((s) => (
                  <option key={s.id} value={s.id}>{s.title}{s.startedAt ? ` · ${s.startedAt.slice(0, 10)}` : ""}</option>
                ))}
              </select>
            </div>
            <button className="btn-quiet">Show</button>
          </form>
        )}
      </div>
      <GateEditor key={`${data.id}-${data.sessionId ?? "t"}`} data={data} editable={editable} />
    </div>
  );
}
