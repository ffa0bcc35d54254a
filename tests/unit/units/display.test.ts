/**
 * Display units against NIST Special Publication 811 (2008), Appendix B.8. Each expected value is
 * the SP 811 factor (or its exact definition) applied by hand, named beside the case.
 */
import { describe, expect, it } from "vitest";
import { displayUnitFor, formatDisplay, toDisplay } from "@/lib/units/display";
import { KMH_TO_MPS, BAR_TO_PA, PSI_TO_PA, MPH_TO_MPS, STANDARD_GRAVITY_MPS2, lookupUnit, convertToSi } from "@/lib/ingest/units";

describe("displayUnitFor", () => {
  it.each([
    ["speed_front", "m/s", "km/h"],
    ["gps_speed", "m/s", "km/h"],
    ["brake_front", "Pa", "bar"],
    ["fork_travel", "m", "mm"],
    ["shock_travel", "m", "mm"],
    ["gps_alt", "m", "m"],
    ["accel_lat", "m/s2", "g"],
    ["engine_rpm", "rpm", "rpm"],
    ["water_temp", "degC", "°C"],
    ["gps_lat", "deg", "°"],
    ["gear", "", ""],
    ["other", "furlong", "furlong"],
  ])("%s stored in %j is shown in %j", (role, si, shown) => {
    expect(displayUnitFor(role, si).unit).toBe(shown);
  });
});

describe("SI → display, checked against NIST SP 811 B.8", () => {
  it.each([
    // km/h → m/s = 2.777 778 E-01 (exact 1/3.6): 27.777… m/s is 100 km/h.
    ["speed_front", "m/s", 100 / 3.6, 100],
    // mile per hour → m/s = 4.4704 E-01 (exact); mile = 1.609 344 E+03 m: 1 mph = 1.609344 km/h.
    ["speed_rear", "m/s", 0.44704, 1.609344],
    // knot → m/s = 5.144 444 E-01 (nautical mile 1852 m exact): 1 kn = 1.852 km/h.
    ["gps_speed", "m/s", 1852 / 3600, 1.852],
    // bar → Pa = 1.0 E+05 (exact).
    ["brake_front", "Pa", 1.0e5, 1],
    // psi → Pa = 6.894 757 E+03: 1 psi = 0.068 947 57 bar.
    ["brake_rear", "Pa", 6.894757e3, 0.06894757],
    // millimetre = 10^-3 m (SP 811 Table 5 prefix milli).
    ["fork_travel", "m", 0.1234, 123.4],
    // inch → m = 2.54 E-02 (exact): 1 in of shock travel = 25.4 mm.
    ["shock_travel", "m", 2.54e-2, 25.4],
    // standard acceleration of free fall = 9.806 65 m/s² (exact).
    ["accel_long", "m/s2", 9.80665, 1],
    ["accel_lat", "m/s2", -2 * 9.80665, -2],
  ])("%s: %f %s", (role, si, value, expected) => {
    expect(toDisplay(value as number, displayUnitFor(role as string, si as string))).toBeCloseTo(expected as number, 9);
  });

  it("undoes the import conversion: a value imported in the display unit reads back unchanged", () => {
    // The import side (lib/ingest/units.ts) carries the same SP 811 factors as SI-bound constants.
    const cases: [string, string, string, number][] = [
      ["speed_front", "m/s", "km/h", 187.3],
      ["brake_front", "Pa", "bar", 11.25],
      ["fork_travel", "m", "mm", 97.5],
      ["accel_lat", "m/s2", "g", 1.35],
    ];
    for (const [role, si, unit, v] of cases) {
      const conv = lookupUnit(unit)!;
      const stored = convertToSi(v, conv);
      expect(toDisplay(stored, displayUnitFor(role, si))).toBeCloseTo(v, 9);
    }
    expect(KMH_TO_MPS * 3.6).toBeCloseTo(1, 15);
    expect(BAR_TO_PA).toBe(1e5);
    expect(PSI_TO_PA).toBeCloseTo(6894.757, 3);
    expect(MPH_TO_MPS).toBe(0.44704);
    expect(STANDARD_GRAVITY_MPS2).toBe(9.80665);
  });
});

describe("formatDisplay", () => {
  it.each([
    [null, "speed_front", "m/s", "—"],
    [Number.NaN, "speed_front", "m/s", "—"],
    [100 / 3.6, "speed_front", "m/s", "100.0"],
    [12.5e5, "brake_front", "Pa", "12.50"],
    [-0.00001, "fork_travel", "m", "0.0"],
    [46.00022491, "gps_lat", "deg", "46.000225"],
    [13980.4, "engine_rpm", "rpm", "13980"],
  ])("%s (%s, %s) → %j", (si, role, unit, text) => {
    expect(formatDisplay(si as number | null, displayUnitFor(role as string, unit as string))).toBe(text);
  });
});
