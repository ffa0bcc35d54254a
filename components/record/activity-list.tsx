import Link from "next/link";
import type { ActivityEntry } from "@/lib/data/activity-log";

const when = (iso: string) => `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;

/** Who changed what and when, newest first. */
export function ActivityList({ entries, showSession = false }: { entries: ActivityEntry[]; showSession?: boolean }) {
  if (entries.length === 0) return <p className="text-sm text-ink-400">Nothing recorded yet.</p>;
  return (
    <ol className="divide-y divide-ink-800 text-sm" data-testid="activity-list">
      {entries.map((e) => (
        <li key={e.id} className="flex flex-wrap items-baseline gap-x-3 py-1.5" data-testid="activity-entry" data-action={e.action}>
          <span className="num text-xs text-ink-400">{when(e.createdAt)}</span>
          <span className="font-semibold">{e.actorName ?? "a former member"}</span>
          <span className="text-ink-100">{e.summary}</span>
          {showSession && e.sessionId != null && (
            <Link className="text-xs text-signal-400 hover:underline" href={`/sessions/${e.sessionId}`}>
              session {e.sessionId}
            </Link>
          )}
        </li>
      ))}
    </ol>
  );
}
