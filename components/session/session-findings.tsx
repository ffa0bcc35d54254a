import { pageTeam } from "@/lib/auth/page-guard";
import { listSessionFindings } from "@/lib/data/findings";
import { projectOnOutline } from "@/lib/geo/outline-path";
import { FindingsPanel, type PanelFinding } from "@/components/findings/findings-panel";

/** The session's findings: list, filters, marks on the outline, acknowledge with a note. */
export async function SessionFindings({ sessionId, teamId, canAcknowledge }: { sessionId: number; teamId: string; canAcknowledge: boolean }) {
  const ctx = await pageTeam({}, `/sessions/${sessionId}`);
  // The page chose the team; a switch in between must not show another team's findings.
  if (ctx.teamId !== teamId) return null;
  const { findings, outline } = await listSessionFindings(ctx, sessionId);
  const rows: PanelFinding[] = findings.map((f) => ({
    ...f,
    at: outline && f.lat != null && f.lon != null ? projectOnOutline(outline, f.lat, f.lon) : null,
  }));
  return (
    <section aria-labelledby="findings-heading" className="card" data-testid="session-findings">
      <h2 id="findings-heading" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">
        Findings
      </h2>
      <FindingsPanel findings={rows} outline={outline?.points ?? null} canAcknowledge={canAcknowledge && ctx.role !== "rider" && ctx.role !== "viewer"} />
    </section>
  );
}
