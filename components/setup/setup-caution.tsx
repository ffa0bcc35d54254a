import { CAUTION_TEXT } from "@/lib/findings/caution";

/** The caution the engine-life and setup screens carry (a symptom is not a diagnosis; service data, technical rules and qualified mechanics decide). */
export function SetupCaution({ className = "" }: { className?: string }) {
  return (
    <aside role="note" aria-label="Caution" data-testid="caution" className={`flex gap-3 rounded-md border border-signal-600/50 bg-signal-500/5 px-4 py-3 text-sm text-ink-100 ${className}`}>
      <svg viewBox="0 0 20 20" className="mt-0.5 h-4 w-4 flex-none text-signal-400" aria-hidden>
        <path d="M10 2 19 18H1z" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
        <path d="M10 8v4.5M10 14.6v.2" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
      </svg>
      <p>{CAUTION_TEXT}</p>
    </aside>
  );
}
