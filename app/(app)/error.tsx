"use client";

export default function AppError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="card border-alert-500/50">
      <h1 className="text-lg font-semibold text-alert-400">This screen could not be shown</h1>
      <p className="mt-2 text-sm text-ink-300">{error.message || "An unexpected error occurred."} No data was changed.</p>
      {error.digest && <p className="num mt-2 text-xs text-ink-400">Reference: {error.digest}</p>}
      <button className="btn-primary mt-4" onClick={reset}>Try again</button>
    </div>
  );
}
