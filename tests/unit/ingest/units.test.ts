import { describe, expect, it } from "vitest";
import { CHANNEL_ROLES, ROLE_SI_UNIT } from "@/lib/channels/roles";
import {
  BAR_TO_PA,
  convertToSi,
  INCH_TO_M,
  KMH_TO_MPS,
  KNOT_TO_MPS,
  lookupUnit,
  MPH_TO_MPS,
  PSI_TO_PA,
  STANDARD_GRAVITY_MPS2,
  unitConversion,
  unitsForRole,
} from "@/lib/ingest";
import { ingestErrorOf } from "./import-file";

describe("unit factors against NIST SP 811 (2008), Appendix B", () => {
  it.each([
    // [factor, value from SP 811, tolerance, what]
    [MPH_TO_MPS, 0.44704, 0, "mile per hour → m/s, exact (B.8)"],
    [KMH_TO_MPS * 3.6, 1, 1e-15, "kilometre per hour = 1/3.6 m/s, exact (B.8)"],
    [BAR_TO_PA, 100_000, 0, "bar → Pa, exact (B.8)"],
    [INCH_TO_M, 0.0254, 0, "inch → m, exact (B.8)"],
    [PSI_TO_PA, 6894.757, 0.0005, "psi → Pa, 6.894 757 E+03 (B.8)"],
    [STANDARD_GRAVITY_MPS2, 9.80665, 0, "standard acceleration of gravity, exact (B.8)"],
    // From memory: NIST SP 811 B.8 lists knot = 5.144 444 E-01 m/s (1852 m per hour).
    [KNOT_TO_MPS, 0.5144444, 5e-8, "knot → m/s (B.8, memory)"],
  ] as const)("%s ≈ %s (%s)", (factor, nist, tol, _what) => {
    expect(Math.abs(factor - nist)).toBeLessThanOrEqual(tol);
  });

  it("mile is 1609.344 m exactly (SP 811 B.8): 1 mi/h × 3600 s = 1609.344 m", () => {
    expect(MPH_TO_MPS * 3600).toBeCloseTo(1609.344, 9);
  });

  it.each([
    ["speed_front", "km/h", 36, 10], // 36/3.6 (SP 811, exact)
    ["speed_rear", "mph", 60, 26.8224], // 60 × 0.44704 (SP 811, exact)
    ["gps_speed", "kn", 10, 5.144444], // 10 × 1852/3600
    ["brake_front", "bar", 12.5, 1_250_000],
    ["brake_rear", "psi", 100, 689_475.7], // 100 × 6894.757
    ["brake_rear", "kPa", 250, 250_000],
    ["fork_travel", "mm", 120, 0.12],
    ["fork_travel", "in", 4, 0.1016], // 4 × 0.0254
    ["shock_travel", "cm", 5, 0.05],
    ["lean_angle", "rad", Math.PI / 4, 45],
    ["throttle", "fraction", 0.25, 25],
    ["tyre_temp_front", "degF", 212, 100], // (212 − 32)/1.8 (SP 811 B.9)
    ["water_temp", "K", 373.15, 100], // T − 273.15 (SP 811)
    ["water_temp", "°C", 85, 85],
    ["accel_long", "g", 1.5, 14.709975], // 1.5 × 9.80665
    ["accel_lat", "m/s²", 3, 3],
    ["engine_rpm", "1/min", 12000, 12000],
    ["gps_alt", "ft", 1000, 304.8], // 0.3048 m exact (SP 811 B.8)
  ] as const)("%s in %s: %s → %s SI", (role, unit, value, si) => {
    const c = unitConversion(role, unit, `${role} [${unit}]`);
    expect(c.siUnit).toBe(ROLE_SI_UNIT[role]);
    // Relative 1e-6: SP 811 prints psi to 7 significant figures (6.894 757 E+03).
    expect(Math.abs(convertToSi(value, c) - si)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(si)));
  });

  it("every role's SI unit is the SI unit of the quantity its units convert to", () => {
    for (const role of CHANNEL_ROLES) {
      if (role === "other") continue;
      for (const u of unitsForRole(role)) expect(lookupUnit(u)!.siUnit, `${role} ${u}`).toBe(ROLE_SI_UNIT[role]);
    }
  });

  it("an unknown unit is a specific error naming the column and the accepted units", async () => {
    const err = await ingestErrorOf(() => unitConversion("brake_front", "furlong", "Front brake [furlong]"));
    expect(err.code).toBe("UNKNOWN_UNIT");
    expect(err.message).toMatch(/'furlong' is not a unit Lapbench knows; for brake front expected one of: bar, mbar, psi, kPa, MPa, Pa/);
  });

  it("a unit of the wrong quantity is refused: km/h for a brake pressure", async () => {
    const err = await ingestErrorOf(() => unitConversion("brake_front", "km/h", "Front brake [km/h]"));
    expect(err.code).toBe("UNKNOWN_UNIT");
    expect(err.message).toMatch(/'km\/h' is a unit of speed/);
  });

  it("role 'other' keeps an unknown unit raw and converts a known one to SI", () => {
    const raw = unitConversion("other", "zorks", "Mystery [zorks]");
    expect([raw.factor, raw.offset, raw.siUnit]).toEqual([1, 0, "zorks"]);
    const kpa = unitConversion("other", "kPa", "Oil pressure [kPa]");
    expect([kpa.factor, kpa.siUnit]).toEqual([1000, "Pa"]);
  });
});
