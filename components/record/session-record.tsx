import Link from "next/link";
import type { listSessionActivity } from "@/lib/data/activity-log";
import { ActivityList } from "./activity-list";

/** On the session page: printable sheets, setup history, and the session's activity log. */
export async function SessionRecord({ entries: pending, sessionId }: { entries: ReturnType<typeof listSessionActivity>; sessionId: number }) {
  const entries = await pending;
  return (
    <section className="card space-y-3" aria-labelledby="record-h" data-testid="session-record">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="record-h" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Record</h2>
        <p className="flex flex-wrap gap-3 text-sm">
          <Link className="text-signal-400 hover:underline" href={`/print/session/${sessionId}`}>Printable summary</Link>
          <Link className="text-signal-400 hover:underline" href={`/print/setup/${sessionId}`}>Printable setup sheet</Link>
          <Link className="text-signal-400 hover:underline" href={`/sessions/${sessionId}/setup`}>Setup history</Link>
        </p>
      </div>
      <p className="text-xs text-ink-400">Printable sheets are A4; save them as PDF through the browser&apos;s print dialogue.</p>
      <h3 className="text-xs font-semibold uppercase tracking-wide text-trace-400">Activity on this session</h3>
      <ActivityList entries={entries} />
    </section>
  );
}
