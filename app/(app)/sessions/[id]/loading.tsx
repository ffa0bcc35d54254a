export default function Loading() {
  return (
    <div className="space-y-6" role="status" aria-live="polite">
      <div className="space-y-2">
        <div className="h-3 w-24 animate-pulse rounded bg-ink-800" />
        <div className="h-8 w-72 animate-pulse rounded bg-ink-800" />
      </div>
      <div className="grid grid-cols-2 gap-4 sm:grid-cols-4">
        {Array.from({ length: 8 }, (_, i) => (
          <div key={i} className="h-10 animate-pulse rounded bg-ink-900" />
        ))}
      </div>
      <div className="h-16 animate-pulse rounded-lg bg-ink-900" />
      <div className="h-64 animate-pulse rounded-lg bg-ink-900" />
      <span className="sr-only">Loading the session…</span>
    </div>
  );
}
