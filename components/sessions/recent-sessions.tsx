import Link from "next/link";
import type { SessionListItem } from "@/lib/data/sessions";
import { SessionTable } from "./session-table";

export async function RecentSessions({ sessions: pending, canUpload, isRider }: { sessions: Promise<SessionListItem[]>; canUpload: boolean; isRider: boolean }) {
  const sessions = await pending;
  if (sessions.length === 0)
    return (
      <div className="rounded-md border border-dashed border-ink-700 px-4 py-8 text-center" data-testid="sessions-empty">
        <p className="font-medium">No sessions yet</p>
        <p className="mt-1 text-sm text-ink-400">
          {canUpload
            ? "Sessions appear here once a logger export has been uploaded and read."
            : isRider
              ? "Your sessions appear here once the team has uploaded them."
              : "Sessions appear here once an engineer uploads a logger export."}
        </p>
        {canUpload && (
          <Link href="/upload" className="btn-primary mt-4">Upload a log</Link>
        )}
      </div>
    );
  return (
    <>
      <SessionTable sessions={sessions} />
      <p className="mt-3 text-right text-sm">
        <Link href="/sessions" className="text-ink-300 hover:text-signal-400 hover:underline">All sessions →</Link>
      </p>
    </>
  );
}
