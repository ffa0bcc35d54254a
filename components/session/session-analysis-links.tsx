import Link from "next/link";

/** Links from a session to its analysis screens. */
export function SessionAnalysisLinks({ sessionId, current }: { sessionId: number; current?: "slip" | "suspension" | "gears" | "brief" }) {
  const items = [
    { key: "slip", href: `/sessions/${sessionId}/slip`, label: "Drive slip" },
    { key: "suspension", href: `/sessions/${sessionId}/suspension`, label: "Suspension use" },
    { key: "gears", href: `/sessions/${sessionId}/gears`, label: "Gears" },
    { key: "brief", href: `/sessions/${sessionId}/brief`, label: "Rider brief" },
  ] as const;
  return (
    <nav aria-label="Session analysis" className="flex flex-wrap gap-2">
      {current ? (
        <Link href={`/sessions/${sessionId}`} className="btn-quiet text-xs">
          ← Session
        </Link>
      ) : null}
      {items.map((i) => (
        <Link key={i.key} href={i.href} aria-current={current === i.key ? "page" : undefined} className={`btn-quiet text-xs ${current === i.key ? "border-signal-500 text-signal-400" : ""}`}>
          {i.label}
        </Link>
      ))}
    </nav>
  );
}
