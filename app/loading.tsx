export default function Loading() {
  return (
    <div className="flex min-h-[50vh] items-center justify-center" role="status" aria-live="polite">
      <div className="h-1 w-48 overflow-hidden rounded bg-ink-800">
        <div className="h-full w-1/3 animate-pulse bg-signal-500" />
      </div>
      <span className="sr-only">Loading…</span>
    </div>
  );
}
