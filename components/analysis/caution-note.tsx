import { CAUTION_TEXT } from "@/lib/findings/caution";

/** The safety caution (a symptom, not a diagnosis; inspect; work follows service data and qualified mechanics) wherever brakes, suspension, engine or setup are concerned. */
export function CautionNote({ className = "" }: { className?: string }) {
  return (
    <p role="note" data-testid="caution" className={`rounded-md border border-signal-600/50 bg-signal-500/10 px-3 py-2 text-xs leading-relaxed text-signal-400 ${className}`}>
      <span className="font-semibold">Caution. </span>
      {CAUTION_TEXT}
    </p>
  );
}
