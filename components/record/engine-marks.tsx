import Link from "next/link";
import type { enginesNearingRebuild } from "@/lib/data/engine-season";

/** Team home mark for engineers and owners: engines at or past 80 % of their rebuild interval. */
export async function EngineMarks({ near: pending }: { near: ReturnType<typeof enginesNearingRebuild> | null }) {
  if (!pending) return null;
  const near = await pending;
  if (near.length === 0) return null;
  return (
    <section className="card border-signal-600/60" aria-labelledby="engines-near" data-testid="engines-nearing">
      <h2 id="engines-near" className="mb-2 text-sm font-semibold uppercase tracking-wide text-signal-400">Engines nearing rebuild</h2>
      <ul className="space-y-1 text-sm">
        {near.map((e) => (
          <li key={e.id}>
            <Link className="text-signal-400 hover:underline" href="/engines">
              {e.serial}
            </Link>{" "}
            {e.bikeName ? `in ${e.bikeName}` : "on the shelf"}: <span className="num">{e.ledger.usedPct!.toFixed(0)} %</span> of its interval used
          </li>
        ))}
      </ul>
      <p className="mt-2 text-xs text-ink-400">Plan the rebuild by the manufacturer&apos;s service data.</p>
    </section>
  );
}
