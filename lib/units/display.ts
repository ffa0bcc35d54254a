/**
 * How stored SI values are shown to people. Everything inside Lapbench is SI (ROLE_SI_UNIT); the
 * screens show the unit the trade reads: km/h, bar, mm of travel, g. Metric only for now — the
 * per-user imperial choice adds a second table beside this one.
 *
 * Factors from NIST Special Publication 811 (2008), Appendix B.8, written as SI → display
 * (the inverse of the SP 811 "to convert from … to SI" factor).
 */
import type { ChannelRole } from "@/lib/channels/roles";

export interface DisplayUnit {
  /** Unit shown on screen, e.g. "km/h". */
  unit: string;
  /** display = si × factor + offset. */
  factor: number;
  offset: number;
  /** Digits after the decimal point that are meaningful for this quantity. */
  decimals: number;
}

/** m/s → km/h: SP 811 B.8 gives km/h → m/s = 2.777 778 E-01 (1/3.6, exact), so ×3.6. */
export const MPS_TO_KMH = 3.6;
/** Pa → bar: SP 811 B.8 gives bar → Pa = 1.0 E+05 (exact), so ×1e-5. */
export const PA_TO_BAR = 1e-5;
/** m → mm: SI prefix milli = 10^-3 (SP 811 §4.3, Table 5), so ×1000. */
export const M_TO_MM = 1000;
/** m/s² → g_n: SP 811 B.8 standard acceleration of free fall = 9.806 65 m/s² (exact). */
export const MPS2_TO_G = 1 / 9.80665;

const same = (unit: string, decimals: number): DisplayUnit => ({ unit, factor: 1, offset: 0, decimals });

/** By SI unit: the default display of each stored unit. */
const BY_SI_UNIT: Record<string, DisplayUnit> = {
  "m/s": { unit: "km/h", factor: MPS_TO_KMH, offset: 0, decimals: 1 },
  Pa: { unit: "bar", factor: PA_TO_BAR, offset: 0, decimals: 2 },
  m: same("m", 1),
  "m/s2": { unit: "g", factor: MPS2_TO_G, offset: 0, decimals: 2 },
  s: same("s", 2),
  deg: same("°", 1),
  degC: same("°C", 1),
  "%": same("%", 1),
  rpm: same("rpm", 0),
  "": same("", 2),
};

/** Where the role says more than the unit: suspension travel is read in mm, positions to ~0.1 m. */
const BY_ROLE: Partial<Record<ChannelRole, DisplayUnit>> = {
  fork_travel: { unit: "mm", factor: M_TO_MM, offset: 0, decimals: 1 },
  shock_travel: { unit: "mm", factor: M_TO_MM, offset: 0, decimals: 1 },
  // 1e-6 degree of latitude is about 0.11 m: enough to tell two lines through a corner apart.
  gps_lat: same("°", 6),
  gps_lon: same("°", 6),
  gear: same("", 0),
  lap_beacon: same("", 0),
  lambda: same("λ", 3),
};

/** The display unit for a channel stored in `siUnit` with `role`; unknown units are shown as stored. */
export function displayUnitFor(role: string, siUnit: string): DisplayUnit {
  const byRole = BY_ROLE[role as ChannelRole];
  if (byRole) return byRole;
  return BY_SI_UNIT[siUnit] ?? same(siUnit, 3);
}

/** One stored value in its display unit. */
export function toDisplay(si: number, d: DisplayUnit): number {
  return si * d.factor + d.offset;
}

/** A stored value formatted for a table cell ("—" when there is none). */
export function formatDisplay(si: number | null | undefined, d: DisplayUnit): string {
  if (si == null || !Number.isFinite(si)) return "—";
  const v = toDisplay(si, d);
  // "-0.0" reads like a sensor fault; show zero plainly.
  const text = v.toFixed(d.decimals);
  return /^-0(\.0+)?$/.test(text) ? text.slice(1) : text;
}
