import type { BrakingPoint } from "./braking-points";

export interface BrakingDifference {
  name: string;
  /** Metres earlier (+) or later (−) than the reference; null when either lap did not brake. */
  onsetEarlierM: number | null;
  /** Release earlier (+) / later (−) than the reference (m). */
  releaseEarlierM: number | null;
  /** Minimum speed minus the reference's (m/s). */
  minSpeedDeltaMps: number;
  /** Peak pressure minus the reference's (Pa). */
  peakPressureDeltaPa: number | null;
  /** One plain sentence for the Rider brief. */
  text: string;
}

/**
 * Braking differences of a lap against the reference lap, corner by corner (matched by name).
 * Braking 12 m before the reference's onset is +12 ("12 m earlier"); after it is −12
 * ("12 m later"). Differences under `sameWithinM` read as "about the same point".
 */
export function compareBraking(
  lapPoints: readonly BrakingPoint[],
  referencePoints: readonly BrakingPoint[],
  opts: { referenceLabel?: string; sameWithinM?: number } = {},
): BrakingDifference[] {
  const label = opts.referenceLabel ?? "your best lap";
  const sameWithinM = opts.sameWithinM ?? 2;
  const refByName = new Map(referencePoints.map((r) => [r.name, r]));
  const out: BrakingDifference[] = [];
  for (const p of lapPoints) {
    const r = refByName.get(p.name);
    if (!r) continue;
    const onset = p.onsetDistanceM !== null && r.onsetDistanceM !== null ? r.onsetDistanceM - p.onsetDistanceM : null;
    const release = p.releaseDistanceM !== null && r.releaseDistanceM !== null ? r.releaseDistanceM - p.releaseDistanceM : null;
    const peak = p.peakPressurePa !== null && r.peakPressurePa !== null ? p.peakPressurePa - r.peakPressurePa : null;
    let text: string;
    if (onset === null) {
      text = p.braked === r.braked ? `${p.name}: no braking on either lap.` : p.braked ? `${p.name}: you braked here; on ${label} you did not.` : `${p.name}: you did not brake here; on ${label} you did.`;
    } else {
      const m = Math.round(Math.abs(onset));
      text = Math.abs(onset) < sameWithinM ? `${p.name}: you braked at about the same point as on ${label}.` : `${p.name}: you braked ${m} m ${onset > 0 ? "earlier" : "later"} than on ${label}.`;
    }
    out.push({ name: p.name, onsetEarlierM: onset, releaseEarlierM: release, minSpeedDeltaMps: p.minSpeedMps - r.minSpeedMps, peakPressureDeltaPa: peak, text });
  }
  return out;
}
