import type { listSessionFindings } from "@/lib/data/findings";
import { projectOnOutline } from "@/lib/geo/outline-path";
import { FindingsPanel, type PanelFinding } from "@/components/findings/findings-panel";

/** The session's findings: list, filters, marks on the outline, acknowledge with a note. */
/** `canAcknowledge`: the caller's role may acknowledge findings (the page asks the role table). */
export async function SessionFindings({ data, canAcknowledge }: { data: ReturnType<typeof listSessionFindings>; canAcknowledge: boolean }) {
  const { findings, outline } = await data;
  const rows: PanelFinding[] = findings.map((f) => ({
    ...f,
    at: outline && f.lat != null && f.lon != null ? projectOnOutline(outline, f.lat, f.lon) : null,
  }));
  return (
    <section aria-labelledby="findings-heading" className="card" data-testid="session-findings">
      <h2 id="findings-heading" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">
        Findings
      </h2>
      <FindingsPanel findings={rows} outline={outline?.points ?? null} canAcknowledge={canAcknowledge} />
    </section>
  );
}
