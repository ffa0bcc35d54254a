/** Metric/imperial display (lib/units/unit-system.ts) against NIST SP 811 (2008) Appendix B.8. */
import { describe, it, expect } from "vitest";
import { displayUnitIn, distanceUnitIn, parseUnitSystem, type UnitSystem } from "@/lib/units/unit-system";
import { toDisplay } from "@/lib/units/display";

describe("displayUnitIn", () => {
  it.each([
    // [system, role, SI unit, SI value, expected display value, unit, source]
    ["imperial", "speed_front", "m/s", 0.44704, 1, "mph", "SP 811 B.8: mile per hour = 4.4704 E-01 m/s (exact)"],
    ["imperial", "brake_front", "Pa", 6894.757, 1, "psi", "SP 811 B.8: psi = 6.894 757 E+03 Pa"],
    ["imperial", "fork_travel", "m", 0.0254, 1, "in", "SP 811 B.8: inch = 2.54 E-02 m (exact)"],
    ["imperial", "gps_alt", "m", 0.3048, 1, "ft", "SP 811 B.8: foot = 3.048 E-01 m (exact)"],
    ["imperial", "water_temp", "degC", 100, 212, "°F", "SP 811 B.8: t/°F = 1.8 t/°C + 32"],
    ["metric", "speed_front", "m/s", 1, 3.6, "km/h", "SP 811 B.8: km/h = 2.777 778 E-01 m/s (1/3.6)"],
    ["metric", "brake_front", "Pa", 1e5, 1, "bar", "SP 811 B.8: bar = 1.0 E+05 Pa (exact)"],
    ["imperial", "engine_rpm", "rpm", 13000, 13000, "rpm", "no conversion"],
  ] as [UnitSystem, string, string, number, number, string, string][])("%s %s %s: %d → %d %s (%s)", (system, role, si, value, expected, unit) => {
    const d = displayUnitIn(system, role, si);
    expect(d.unit).toBe(unit);
    expect(toDisplay(value, d)).toBeCloseTo(expected, 9);
  });

  it("distance on the Compare axis is metres or feet", () => {
    expect(toDisplay(0.3048, distanceUnitIn("imperial"))).toBeCloseTo(1, 12);
    expect(distanceUnitIn("metric").unit).toBe("m");
  });

  it("anything but 'imperial' reads as metric", () => {
    expect(parseUnitSystem("imperial")).toBe("imperial");
    expect(parseUnitSystem(undefined)).toBe("metric");
    expect(parseUnitSystem("furlongs")).toBe("metric");
  });
});
