import { listRecentSessions } from "@/lib/data/sessions";
import type { TeamContext } from "@/lib/auth/guard";

const STATUS_STYLE: Record<string, string> = {
  ready: "text-ok-400",
  failed: "text-alert-400",
  parsing: "text-signal-400",
  queued: "text-signal-400",
  uploaded: "text-ink-300",
  mapping: "text-ink-300",
};

export async function RecentSessions({ ctx, canUpload }: { ctx: TeamContext; canUpload: boolean }) {
  const sessions = await listRecentSessions(ctx);
  if (sessions.length === 0)
    return (
      <div className="rounded-md border border-dashed border-ink-700 px-4 py-8 text-center" data-testid="sessions-empty">
        <p className="font-medium">No sessions yet</p>
        <p className="mt-1 text-sm text-ink-400">
          {canUpload
            ? "Sessions appear here once a logger export has been uploaded and read."
            : ctx.role === "rider"
              ? "Your sessions appear here once the team has uploaded them."
              : "Sessions appear here once an engineer uploads a logger export."}
        </p>
      </div>
    );
  return (
    <table className="table-plain" data-testid="sessions-table">
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
              <span className="font-medium">{s.title}</span>
              <span className="block text-xs text-ink-400">{s.eventName ?? ""} {s.startedAt ? new Date(s.startedAt).toISOString().slice(0, 16).replace("T", " ") + " UTC" : ""}</span>
            </td>
            <td>{s.riderName ?? "—"}</td>
            <td>{s.bikeName ?? "—"}</td>
            <td className="capitalize">{s.kind}</td>
            <td className={STATUS_STYLE[s.status] ?? ""}>
              {s.status}
              {s.status === "parsing" ? ` ${s.progress}%` : ""}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
