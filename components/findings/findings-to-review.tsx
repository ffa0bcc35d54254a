import Link from "next/link";
import type { listFindingsToReview } from "@/lib/data/findings";
import { findingKindLabel, SEVERITY_LABEL } from "@/lib/findings/finding-labels";

const DOT: Record<string, string> = { critical: "bg-alert-400", warning: "bg-signal-400", info: "bg-ink-400" };

/** Unacknowledged findings of the team's recent sessions the caller may see, with links. */
export async function FindingsToReview({ items: pending }: { items: ReturnType<typeof listFindingsToReview> }) {
  const items = await pending;
  if (items.length === 0)
    return <p className="text-sm text-ink-400">Nothing to review. Findings appear here when an analysed session shows something that looks wrong.</p>;
  return (
    <ul className="space-y-2" data-testid="findings-to-review">
      {items.map((f) => (
        <li key={f.id}>
          <Link href={`/sessions/${f.sessionId}#findings-heading`} className="group flex gap-2 rounded-md px-1 py-1 hover:bg-ink-850">
            <span className={`mt-1.5 h-2 w-2 shrink-0 rounded-full ${DOT[f.severity]}`} aria-label={SEVERITY_LABEL[f.severity]} />
            <span className="min-w-0 text-sm">
              <span className="block font-medium text-ink-100 group-hover:text-signal-400">{findingKindLabel(f.kind)}</span>
              <span className="block truncate text-xs text-ink-400">
                {f.sessionTitle}
                {f.lapNumber != null ? ` · lap ${f.lapNumber}` : ""}
              </span>
            </span>
          </Link>
        </li>
      ))}
    </ul>
  );
}
