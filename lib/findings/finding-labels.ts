import type { FindingKind, FindingSeverity } from "./types";

/** Plain words for each finding kind, as the team reads them on screen. */
export const FINDING_KIND_LABEL: Record<FindingKind, string> = {
  brake_on_straight: "Brake pressure on a straight",
  rev_ceiling: "Rev ceiling exceeded",
  pit_overspeed: "Pit-lane speed above the limit",
  wheel_spin: "Wheel spin beyond target",
  bottoming: "Suspension bottoming",
  sensor_flat: "Sensor flat or stuck",
  gps_dropout: "GPS dropout",
  gps_jump: "GPS position jump",
  clock_gap: "Gap in the sample clock",
};

export const SEVERITY_LABEL: Record<FindingSeverity, string> = { critical: "Critical", warning: "Warning", info: "Info" };

/** Kinds about brakes, suspension or engine limits: these carry the safety caution. */
export const CAUTION_KINDS: ReadonlySet<string> = new Set<FindingKind>(["brake_on_straight", "rev_ceiling", "bottoming"]);

export function findingKindLabel(kind: string): string {
  return (FINDING_KIND_LABEL as Record<string, string>)[kind] ?? kind.replace(/_/g, " ");
}
