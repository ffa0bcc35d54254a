import { CAUTION_TEXT } from "@/lib/findings/caution";

export interface LedgerSession {
  /** Engine running time in the session (s) — EngineUsage.runningS. */
  durationS: number;
  distanceM: number;
  timeAboveRpmS?: number;
  ceilingExceedances?: number;
}

export interface EngineInterval {
  /** Rebuild interval in running hours (from the manufacturer's service data). */
  rebuildIntervalH?: number;
  /** Rebuild interval in km. */
  rebuildIntervalKm?: number;
}

/**
 * Warn when this share of the rebuild interval is used. 80 % is Lapbench's default, not a
 * manufacturer's figure: it leaves a race weekend or two to plan the rebuild.
 */
export const DEFAULT_LEDGER_WARN_PCT = 80;

export interface EngineLedger {
  sessionCount: number;
  hours: number;
  km: number;
  /** Share of each interval used (%); null when that interval is not set. */
  hoursUsedPct: number | null;
  kmUsedPct: number | null;
  /** The larger of the two: what decides the rebuild. */
  usedPct: number | null;
  timeAboveRpmS: number;
  ceilingExceedances: number;
  warning: { level: "near" | "due"; message: string; caution: string } | null;
}

/** Engine life since the last rebuild, summed over the sessions it ran. */
export function engineLedger(
  sessions: readonly LedgerSession[],
  engine: EngineInterval,
  warnAtPct: number = DEFAULT_LEDGER_WARN_PCT,
): EngineLedger {
  let s = 0;
  let m = 0;
  let above = 0;
  let exceed = 0;
  for (const x of sessions) {
    s += x.durationS;
    m += x.distanceM;
    above += x.timeAboveRpmS ?? 0;
    exceed += x.ceilingExceedances ?? 0;
  }
  const hours = s / 3600;
  const km = m / 1000;
  const hoursUsedPct = engine.rebuildIntervalH ? (100 * hours) / engine.rebuildIntervalH : null;
  const kmUsedPct = engine.rebuildIntervalKm ? (100 * km) / engine.rebuildIntervalKm : null;
  const used = [hoursUsedPct, kmUsedPct].filter((x): x is number => x !== null);
  const usedPct = used.length ? Math.max(...used) : null;
  let warning: EngineLedger["warning"] = null;
  if (usedPct !== null && usedPct >= warnAtPct) {
    const due = usedPct >= 100;
    warning = {
      level: due ? "due" : "near",
      message: due
        ? `Rebuild interval reached: ${usedPct.toFixed(0)} % used (${hours.toFixed(1)} h, ${km.toFixed(0)} km).`
        : `Rebuild interval nearing: ${usedPct.toFixed(0)} % used (${hours.toFixed(1)} h, ${km.toFixed(0)} km); Lapbench warns from ${warnAtPct} % by default.`,
      caution: CAUTION_TEXT,
    };
  }
  return { sessionCount: sessions.length, hours, km, hoursUsedPct, kmUsedPct, usedPct, timeAboveRpmS: above, ceilingExceedances: exceed, warning };
}
