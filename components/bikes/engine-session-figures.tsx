import type { LedgerSessionRow } from "@/lib/data/engines";

/** The four figures an engine ledger shows per session: hours, distance, time above the rpm mark, ceiling exceedances. */
export function EngineSessionFigures({ s }: { s: Pick<LedgerSessionRow, "hours" | "km" | "timeAboveRpmS" | "ceilingExceedances"> }) {
  return (
    <>
      <td className="num text-right">{s.hours.toFixed(2)}</td>
      <td className="num text-right">{s.km.toFixed(1)}</td>
      <td className="num text-right">{s.timeAboveRpmS.toFixed(1)} s</td>
      <td className="num text-right">{s.ceilingExceedances}</td>
    </>
  );
}
