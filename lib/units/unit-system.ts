/**
 * Metric or imperial display, chosen per person. The choice lives in a cookie (`lapbench-units`)
 * so server-rendered tables and client charts agree without an account setting yet; stored values
 * stay SI. Metric is lib/units/display.ts; imperial converts the same quantities with the
 * NIST SP 811 (2008) Appendix B.8 factors, written SI → display (the inverse of SP 811's
 * "to convert from … to SI" factor).
 */
import { displayUnitFor, type DisplayUnit } from "./display";

export type UnitSystem = "metric" | "imperial";
export const UNIT_COOKIE = "lapbench-units";

/** mph → m/s = 4.4704 E-01 (exact). */
export const MPS_TO_MPH = 1 / 0.44704;
/** psi (lbf/in²) → Pa = 6.894 757 E+03. */
export const PA_TO_PSI = 1 / 6894.757;
/** in → m = 2.54 E-02 (exact). */
export const M_TO_IN = 1 / 0.0254;
/** ft → m = 3.048 E-01 (exact). */
export const M_TO_FT = 1 / 0.3048;

export function parseUnitSystem(v: string | null | undefined): UnitSystem {
  return v === "imperial" ? "imperial" : "metric";
}

/** Display unit of a channel in the chosen system. */
export function displayUnitIn(system: UnitSystem, role: string, siUnit: string): DisplayUnit {
  const metric = displayUnitFor(role, siUnit);
  if (system === "metric") return metric;
  if (role === "fork_travel" || role === "shock_travel") return { unit: "in", factor: M_TO_IN, offset: 0, decimals: 2 };
  switch (siUnit) {
    case "m/s":
      return { unit: "mph", factor: MPS_TO_MPH, offset: 0, decimals: 1 };
    case "Pa":
      return { unit: "psi", factor: PA_TO_PSI, offset: 0, decimals: 1 };
    case "m":
      return { unit: "ft", factor: M_TO_FT, offset: 0, decimals: 0 };
    case "degC":
      // °F = °C × 9/5 + 32 (SP 811 B.8, temperature interval and scale).
      return { unit: "°F", factor: 9 / 5, offset: 32, decimals: 1 };
    default:
      return metric;
  }
}

/** Distance along a lap (the Compare x axis) in the chosen system. */
export function distanceUnitIn(system: UnitSystem): DisplayUnit {
  return system === "imperial" ? { unit: "ft", factor: M_TO_FT, offset: 0, decimals: 0 } : { unit: "m", factor: 1, offset: 0, decimals: 0 };
}
