"use client";

export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main className="mx-auto max-w-xl p-10">
      <div className="card border-alert-500/50">
        <h1 className="text-lg font-semibold text-alert-400">Something went wrong on this page</h1>
        <p className="mt-2 text-sm text-ink-300">
          {error.message || "An unexpected error occurred."} Nothing you saved was lost. Try again, and if it keeps
          happening, note the reference below for your data engineer.
        </p>
        {error.digest && <p className="num mt-2 text-xs text-ink-400">Reference: {error.digest}</p>}
        <button className="btn-primary mt-4" onClick={reset}>
          Try again
        </button>
      </div>
    </main>
  );
}
