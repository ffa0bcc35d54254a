import { ROLE_SI_UNIT, type ChannelRole } from "@/lib/channels/roles";
import { IngestError, quoteForMessage } from "./ingest-error";

/*
 * Conversion factors. Source: NIST Special Publication 811 (2008 edition), "Guide for the Use of
 * the International System of Units (SI)", Appendix B.8 (factors in alphabetical order) and B.9
 * (by kind of quantity). "exact" marks factors SP 811 prints in bold (exact by definition).
 */
/** mile per hour → metre per second, exact (SP 811 B.8: 4.4704 E-01). */
export const MPH_TO_MPS = 0.44704;
/** kilometre per hour → metre per second, exact (SP 811 B.8: 2.777 778 E-01 = 1/3.6). */
export const KMH_TO_MPS = 1 / 3.6;
/** knot (nautical mile per hour) → metre per second; nautical mile = 1852 m exact (SP 811 B.8: 5.144 444 E-01). */
export const KNOT_TO_MPS = 1852 / 3600;
/** bar → pascal, exact (SP 811 B.8: 1.0 E+05). */
export const BAR_TO_PA = 100_000;
/**
 * pound-force per square inch → pascal (SP 811 B.8: 6.894 757 E+03). Computed from its exact
 * definition, lbf = 0.45359237 kg × 9.80665 m/s² and in = 0.0254 m, giving 6894.757293168…
 */
export const PSI_TO_PA = (0.45359237 * 9.80665) / (0.0254 * 0.0254);
/** inch → metre, exact (SP 811 B.8: 2.54 E-02). */
export const INCH_TO_M = 0.0254;
/** foot → metre, exact (SP 811 B.8: 3.048 E-01). */
export const FOOT_TO_M = 0.3048;
/** Standard acceleration of free fall g_n → m/s², exact (SP 811 B.8 "standard gravity": 9.806 65 E+00). */
export const STANDARD_GRAVITY_MPS2 = 9.80665;
/** kelvin → degree Celsius: t/°C = T/K − 273.15, exact (SP 811 B.9 / §4.2.1.1). */
export const KELVIN_OFFSET = 273.15;
/** degree Fahrenheit → degree Celsius: t/°C = (t/°F − 32)/1.8, exact (SP 811 B.9). */
export const FAHRENHEIT_PER_CELSIUS = 1.8;
/** radian → degree: 180/π (SP 811 B.8: degree = 1.745 329 E-02 rad). */
export const RAD_TO_DEG = 180 / Math.PI;
/**
 * Air-fuel ratio → lambda: stoichiometric AFR of petrol ≈ 14.7 (common practice, no published
 * source here; fuel-dependent — ethanol blends are lower; change the mapping's scale if needed).
 */
export const STOICHIOMETRIC_AFR_PETROL = 14.7;

/** The quantity a unit measures; each role accepts one quantity. */
export type Quantity =
  | "time"
  | "speed"
  | "pressure"
  | "length"
  | "angle"
  | "percent"
  | "rotation"
  | "temperature"
  | "acceleration"
  | "count"
  | "lambda";

/** A linear conversion: si = value × factor + offset. */
export interface UnitConversion {
  /** Canonical spelling of the source unit. */
  unit: string;
  quantity: Quantity;
  /** Target unit (the role's SI unit). */
  siUnit: string;
  factor: number;
  offset: number;
}

interface UnitDef {
  canonical: string;
  quantity: Quantity;
  factor: number;
  offset: number;
}

const SI_UNIT_OF: Record<Quantity, string> = {
  time: "s",
  speed: "m/s",
  pressure: "Pa",
  length: "m",
  angle: "deg",
  percent: "%",
  rotation: "rpm",
  temperature: "degC",
  acceleration: "m/s2",
  count: "",
  lambda: "",
};

function def(canonical: string, quantity: Quantity, factor: number, offset = 0): UnitDef {
  return { canonical, quantity, factor, offset };
}

/** Known units by normalised spelling (see normaliseUnit). */
const UNITS = new Map<string, UnitDef>();
function add(d: UnitDef, ...spellings: string[]): void {
  for (const s of [d.canonical.toLowerCase(), ...spellings]) UNITS.set(s, d);
}
add(def("s", "time", 1), "sec", "secs", "second", "seconds");
add(def("ms", "time", 1e-3), "msec", "millisecond", "milliseconds");
add(def("us", "time", 1e-6), "usec", "microsecond", "microseconds");
add(def("km/h", "speed", KMH_TO_MPS), "kmh", "kph", "km/hr", "kmph");
add(def("mph", "speed", MPH_TO_MPS), "mi/h", "mi/hr");
add(def("m/s", "speed", 1), "mps");
add(def("kn", "speed", KNOT_TO_MPS), "kt", "kts", "knot", "knots");
add(def("bar", "pressure", BAR_TO_PA));
add(def("mbar", "pressure", BAR_TO_PA / 1000));
add(def("psi", "pressure", PSI_TO_PA), "lbf/in2");
add(def("kPa", "pressure", 1000));
add(def("MPa", "pressure", 1e6));
add(def("Pa", "pressure", 1));
add(def("mm", "length", 1e-3));
add(def("cm", "length", 1e-2));
add(def("m", "length", 1), "metre", "metres", "meter", "meters");
add(def("km", "length", 1000));
add(def("in", "length", INCH_TO_M), "inch", "inches");
add(def("ft", "length", FOOT_TO_M), "foot", "feet");
add(def("deg", "angle", 1), "degree", "degrees", "°");
add(def("rad", "angle", RAD_TO_DEG), "radian", "radians");
add(def("%", "percent", 1), "percent", "pct");
add(def("fraction", "percent", 100), "0-1", "0..1", "ratio", "frac");
add(def("rpm", "rotation", 1), "1/min", "r/min", "rev/min", "min-1");
add(def("degC", "temperature", 1), "°c", "celsius", "c");
add(def("degF", "temperature", 1 / FAHRENHEIT_PER_CELSIUS, -32 / FAHRENHEIT_PER_CELSIUS), "°f", "fahrenheit", "f");
add(def("K", "temperature", 1, -KELVIN_OFFSET), "kelvin");
add(def("g", "acceleration", STANDARD_GRAVITY_MPS2), "gn", "g0");
add(def("m/s2", "acceleration", 1), "m/s/s", "m s-2");
add(def("lambda", "lambda", 1), "λ");
add(def("AFR", "lambda", 1 / STOICHIOMETRIC_AFR_PETROL), "a/f");
add(def("count", "count", 1), "#", "n");

/** Which quantity each role holds. */
export const ROLE_QUANTITY: Record<ChannelRole, Quantity | null> = {
  time: "time",
  speed_front: "speed",
  speed_rear: "speed",
  gps_speed: "speed",
  gps_lat: "angle",
  gps_lon: "angle",
  gps_alt: "length",
  engine_rpm: "rotation",
  throttle: "percent",
  brake_front: "pressure",
  brake_rear: "pressure",
  fork_travel: "length",
  shock_travel: "length",
  lean_angle: "angle",
  gear: "count",
  lap_beacon: "count",
  tyre_temp_front: "temperature",
  tyre_temp_rear: "temperature",
  water_temp: "temperature",
  lambda: "lambda",
  accel_long: "acceleration",
  accel_lat: "acceleration",
  other: null,
};

/** Lower-case, trim, unify superscripts and micro signs: "M/S²" → "m/s2", "µs" → "us". */
export function normaliseUnit(unit: string): string {
  return unit
    .trim()
    .toLowerCase()
    .replace(/[µμ]/g, "u")
    .replace(/²/g, "2")
    .replace(/\^2/g, "2")
    .replace(/\s+/g, " ")
    .replace(/^° ?c$/, "°c")
    .replace(/^° ?f$/, "°f")
    .replace(/^deg ?c$/, "degc")
    .replace(/^deg ?f$/, "degf");
}

/** The known unit for a spelling, or undefined. */
export function lookupUnit(unit: string): UnitConversion | undefined {
  const d = UNITS.get(normaliseUnit(unit));
  if (!d) return undefined;
  return { unit: d.canonical, quantity: d.quantity, siUnit: SI_UNIT_OF[d.quantity], factor: d.factor, offset: d.offset };
}

/** Canonical spellings a role accepts, for messages and the mapping UI. */
export function unitsForRole(role: ChannelRole): string[] {
  const q = ROLE_QUANTITY[role];
  if (q === null) return [];
  const seen = new Set<string>();
  for (const d of UNITS.values()) if (d.quantity === q) seen.add(d.canonical);
  return [...seen];
}

/** Roles whose values carry no unit: an empty unit is read as the role's own. */
const UNITLESS_QUANTITIES: ReadonlySet<Quantity> = new Set(["count", "lambda"]);

/**
 * The conversion of a column's values to the SI unit of its role (ROLE_SI_UNIT).
 * Throws IngestError UNKNOWN_UNIT / MISSING_UNIT naming the column and the units accepted.
 * Role "other": a known unit is converted to its quantity's SI unit; an unknown one is kept raw.
 */
export function unitConversion(role: ChannelRole, unit: string, columnName: string): UnitConversion {
  const quantity = ROLE_QUANTITY[role];
  const trimmed = unit.trim();
  if (quantity === null) {
    const known = trimmed === "" ? undefined : lookupUnit(trimmed);
    return known ?? { unit: trimmed, quantity: "count", siUnit: trimmed, factor: 1, offset: 0 };
  }
  if (trimmed === "") {
    if (UNITLESS_QUANTITIES.has(quantity)) {
      return { unit: "", quantity, siUnit: ROLE_SI_UNIT[role], factor: 1, offset: 0 };
    }
    throw new IngestError(
      "MISSING_UNIT",
      `Column ${quoteForMessage(columnName)} has no unit; for ${role.replace(/_/g, " ")} choose one of: ${unitsForRole(role).join(", ")}.`,
      { column: columnName },
    );
  }
  const known = lookupUnit(trimmed);
  if (!known || known.quantity !== quantity) {
    const what = known ? `a unit of ${known.quantity}` : "not a unit Lapbench knows";
    throw new IngestError(
      "UNKNOWN_UNIT",
      `Column ${quoteForMessage(columnName)}: unit ${quoteForMessage(trimmed)} is ${what}; for ${role.replace(/_/g, " ")} expected one of: ${unitsForRole(role).join(", ")}.`,
      { column: columnName },
    );
  }
  return { ...known, siUnit: ROLE_SI_UNIT[role] };
}

/** Convert one value (for tests and single values; the parsers fold factor and offset into the loop). */
export function convertToSi(value: number, conversion: UnitConversion): number {
  return value * conversion.factor + conversion.offset;
}
