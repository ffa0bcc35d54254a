import Link from "next/link";
import type { SessionListItem } from "@/lib/data/sessions";

const STATUS_STYLE: Record<string, string> = {
  ready: "text-ok-400",
  failed: "text-alert-400",
  parsing: "text-signal-400",
  queued: "text-signal-400",
  uploaded: "text-ink-300",
  mapping: "text-signal-400",
};

const STATUS_WORD: Record<string, string> = {
  ready: "ready",
  failed: "failed",
  parsing: "reading",
  queued: "queued",
  uploaded: "uploaded",
  mapping: "needs mapping",
};

function when(s: SessionListItem): string {
  const iso = s.startedAt ?? s.createdAt;
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}

/** Sessions as a table; each title links to its session page. */
export function SessionTable({ sessions, testId = "sessions-table" }: { sessions: SessionListItem[]; testId?: string }) {
  return (
    <div className="overflow-x-auto">
      <table className="table-plain" data-testid={testId}>
        <thead>
          <tr>
            <th>Session</th>
            <th>Rider</th>
            <th>Bike</th>
            <th>Kind</th>
            <th>Status</th>
          </tr>
        </thead>
        <tbody>
          {sessions.map((s) => (
            <tr key={s.id}>
              <td>
                <Link href={`/sessions/${s.id}`} className="font-medium text-ink-100 hover:text-signal-400 hover:underline">
                  {s.title}
                </Link>
                <span className="block text-xs text-ink-400">
                  {s.eventName ? `${s.eventName} · ` : ""}
                  {when(s)}
                </span>
              </td>
              <td>{s.riderName ?? "—"}</td>
              <td>{s.bikeName ?? "—"}</td>
              <td className="capitalize">{s.kind}</td>
              <td className={STATUS_STYLE[s.status] ?? ""} title={s.status === "failed" ? (s.statusReason ?? undefined) : undefined}>
                {STATUS_WORD[s.status] ?? s.status}
                {s.status === "parsing" ? ` ${s.progress}%` : ""}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
