export default function Loading() {
  return (
    <div className="space-y-4" role="status" aria-live="polite">
      <div className="h-8 w-64 animate-pulse rounded bg-ink-800" />
      <div className="grid gap-4 md:grid-cols-3">
        {[0, 1, 2].map((i) => (
          <div key={i} className="h-32 animate-pulse rounded-lg bg-ink-900" />
        ))}
      </div>
      <span className="sr-only">Loading…</span>
    </div>
  );
}
