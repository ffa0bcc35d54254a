/**
 * Mapping suggestions against header dialects of our own invention, written the way loggers
 * abbreviate when space is short (common practice; no real product's channel names): short names,
 * trailing or leading F/R, Fr/Rr, ft/rr, sensor pairs 1/2, camelCase, dotted paths, units in [..]
 * or (..), or no unit at all. Each file goes through the real header reader with a few rows of
 * plausible values, then suggestMapping; the score over all columns is printed in the test name.
 * A real recording (../shared/real-logs, MIT licence) is checked at the end.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { readCsvHeader, suggestMapping } from "@/lib/ingest";
import { lookupUnit } from "@/lib/ingest/units";
import type { ChannelRole } from "@/lib/channels/roles";
import { at } from "../../fixtures/at";

/** Sample values per kind, 8 rows, standing in the pit lane or rolling out (as a log starts). */
type Kind =
  | "ts" | "tms" | "kmh" | "mph" | "ms" | "rpm" | "pct" | "bar" | "psi" | "kpa" | "mm" | "inch" | "deg" | "lat" | "lon" | "alt"
  | "gear" | "beacon" | "degc" | "degf" | "lambda" | "afr" | "g" | "ms2" | "volt" | "degs" | "sats";
function values(kind: Kind, row: number): number {
  const r = row;
  switch (kind) {
    case "ts": return r * 0.01;
    case "tms": return 120000 + r * 10;
    case "kmh": return 4.2 + r * 0.35;
    case "mph": return 2.6 + r * 0.22;
    case "ms": return 1.17 + r * 0.1;
    case "rpm": return 3100 + r * 37;
    case "pct": return 8.5 + r * 0.7;
    case "bar": return 0.1 + (r % 3) * 0.05;
    case "psi": return 1.5 + (r % 3) * 0.7;
    case "kpa": return 10 + (r % 3) * 5;
    case "mm": return 31.2 + (r % 4) * 0.4;
    case "inch": return 1.23 + (r % 4) * 0.02;
    case "deg": return 0.4 + (r % 3) * 0.3;
    case "lat": return 61.2034512 + r * 0.0000021;
    case "lon": return -152.4412093 + r * 0.0000034;
    case "alt": return 118.4 + r * 0.1;
    case "gear": return r < 4 ? 1 : 2;
    case "beacon": return r === 5 ? 1 : 0;
    case "degc": return 71.5 + r * 0.1;
    case "degf": return 160.7 + r * 0.2;
    case "lambda": return 0.98 + (r % 2) * 0.01;
    case "afr": return 13.1 + (r % 2) * 0.1;
    case "g": return 0.05 + (r % 3) * 0.02;
    case "ms2": return 0.5 + (r % 3) * 0.2;
    case "volt": return 13.6 + (r % 2) * 0.1;
    case "degs": return 1.5 + r * 0.3;
    case "sats": return 9 + (r % 2);
  }
}
const DECIMALS: Partial<Record<Kind, number>> = { tms: 0, rpm: 0, gear: 0, beacon: 0, sats: 0, lat: 7, lon: 7, ts: 2 };

type Col = [header: string, expected: ChannelRole, kind: Kind];
interface Dialect {
  name: string;
  delimiter: "," | ";" | "\t";
  decimalComma?: boolean;
  columns: Col[];
}

const DIALECTS: Dialect[] = [
  {
    name: "short names, trailing F/R, ms, decimal comma",
    delimiter: ";",
    decimalComma: true,
    columns: [
      ["Time (ms)", "time", "tms"], ["Spd F (km/h)", "speed_front", "kmh"], ["Spd R (km/h)", "speed_rear", "kmh"], ["nEng (rpm)", "engine_rpm", "rpm"],
      ["Thr (%)", "throttle", "pct"], ["Prs F (bar)", "brake_front", "bar"], ["Prs R (bar)", "brake_rear", "bar"], ["Pos F (mm)", "fork_travel", "mm"],
      ["Pos R (mm)", "shock_travel", "mm"], ["Lat (deg)", "gps_lat", "lat"], ["Lon (deg)", "gps_lon", "lon"],
    ],
  },
  {
    name: "camelCase with Fr/Rr",
    delimiter: ",",
    columns: [
      ["Timestamp [s]", "time", "ts"], ["WhlSpdFr [km/h]", "speed_front", "kmh"], ["WhlSpdRr [km/h]", "speed_rear", "kmh"], ["EngRPM", "engine_rpm", "rpm"],
      ["TPS [%]", "throttle", "pct"], ["BrkPrsFr [bar]", "brake_front", "bar"], ["BrkPrsRr [bar]", "brake_rear", "bar"], ["ForkPos [mm]", "fork_travel", "mm"],
      ["ShockPos [mm]", "shock_travel", "mm"], ["RollAng [deg]", "lean_angle", "deg"], ["GPSLat", "gps_lat", "lat"], ["GPSLon", "gps_lon", "lon"],
      ["GPSAlt [m]", "gps_alt", "alt"], ["GearPos", "gear", "gear"], ["BeaconIR", "lap_beacon", "beacon"], ["BattV [V]", "other", "volt"],
    ],
  },
  {
    name: "engineering symbols",
    delimiter: "\t",
    columns: [
      ["t [s]", "time", "ts"], ["vF [km/h]", "speed_front", "kmh"], ["vR [km/h]", "speed_rear", "kmh"], ["n [1/min]", "engine_rpm", "rpm"],
      ["alpha_thr [%]", "throttle", "pct"], ["pF [bar]", "brake_front", "bar"], ["pR [bar]", "brake_rear", "bar"], ["sF [mm]", "fork_travel", "mm"],
      ["sR [mm]", "shock_travel", "mm"], ["phi [deg]", "lean_angle", "deg"], ["ax [g]", "accel_long", "g"], ["ay [g]", "accel_lat", "g"],
      ["T_w [°C]", "water_temp", "degc"], ["lam [-]", "lambda", "lambda"],
    ],
  },
  {
    name: "numbered sensor pairs, imperial units",
    delimiter: ",",
    columns: [
      ["Time [s]", "time", "ts"], ["Wheel 1 [mph]", "speed_front", "mph"], ["Wheel 2 [mph]", "speed_rear", "mph"], ["Revs [rpm]", "engine_rpm", "rpm"],
      ["Throttle [%]", "throttle", "pct"], ["Brake 1 [psi]", "brake_front", "psi"], ["Brake 2 [psi]", "brake_rear", "psi"], ["Susp 1 [in]", "fork_travel", "inch"],
      ["Susp 2 [in]", "shock_travel", "inch"], ["Tyre 1 [°F]", "tyre_temp_front", "degf"], ["Tyre 2 [°F]", "tyre_temp_rear", "degf"], ["Latitude", "gps_lat", "lat"],
      ["Longitude", "gps_lon", "lon"], ["Speed [mph]", "gps_speed", "mph"], ["Beacon", "lap_beacon", "beacon"],
    ],
  },
  {
    name: "upper-case acronyms",
    delimiter: ";",
    columns: [
      ["TIME [ms]", "time", "tms"], ["FWS [km/h]", "speed_front", "kmh"], ["RWS [km/h]", "speed_rear", "kmh"], ["RPM", "engine_rpm", "rpm"],
      ["TPS [%]", "throttle", "pct"], ["FBP [bar]", "brake_front", "bar"], ["RBP [bar]", "brake_rear", "bar"], ["FSUS [mm]", "fork_travel", "mm"],
      ["RSUS [mm]", "shock_travel", "mm"], ["ECT [°C]", "water_temp", "degc"], ["LAMBDA", "lambda", "lambda"], ["GEAR", "gear", "gear"],
      ["LAT", "gps_lat", "lat"], ["LON", "gps_lon", "lon"], ["ALT [m]", "gps_alt", "alt"],
    ],
  },
  {
    name: "long descriptive names in parentheses",
    delimiter: ",",
    columns: [
      ["Elapsed time (s)", "time", "ts"], ["Front wheel speed (km/h)", "speed_front", "kmh"], ["Rear wheel speed (km/h)", "speed_rear", "kmh"],
      ["Engine speed (rpm)", "engine_rpm", "rpm"], ["Throttle opening (%)", "throttle", "pct"], ["Front brake line pressure (bar)", "brake_front", "bar"],
      ["Rear brake line pressure (bar)", "brake_rear", "bar"], ["Front fork travel (mm)", "fork_travel", "mm"], ["Rear shock travel (mm)", "shock_travel", "mm"],
      ["Lean angle (deg)", "lean_angle", "deg"], ["Coolant temperature (°C)", "water_temp", "degc"], ["Oil temperature (°C)", "other", "degc"],
      ["Battery voltage (V)", "other", "volt"], ["Air-fuel ratio (AFR)", "lambda", "afr"], ["Longitudinal acceleration (g)", "accel_long", "g"],
      ["Lateral acceleration (g)", "accel_lat", "g"],
    ],
  },
  {
    name: "generic analog inputs named only by unit and side",
    delimiter: ",",
    columns: [
      ["Time [s]", "time", "ts"], ["AN1 [rpm]", "engine_rpm", "rpm"], ["AN2 [%]", "throttle", "pct"], ["AN3 F [bar]", "brake_front", "bar"],
      ["AN4 R [bar]", "brake_rear", "bar"], ["AN5 F [mm]", "fork_travel", "mm"], ["AN6 R [mm]", "shock_travel", "mm"], ["AN7 [lambda]", "lambda", "lambda"],
      ["FREQ1 F [km/h]", "speed_front", "kmh"], ["FREQ2 R [km/h]", "speed_rear", "kmh"], ["GPS_LAT [deg]", "gps_lat", "lat"], ["GPS_LON [deg]", "gps_lon", "lon"],
      ["GPS_SATS", "other", "sats"],
    ],
  },
  {
    name: "abbreviated with Fr/Rr, psi and mph",
    delimiter: ",",
    columns: [
      ["Time (sec)", "time", "ts"], ["WSpd Fr (mph)", "speed_front", "mph"], ["WSpd Rr (mph)", "speed_rear", "mph"], ["Eng Spd (rpm)", "engine_rpm", "rpm"],
      ["Thr Pos (%)", "throttle", "pct"], ["Brk Fr (psi)", "brake_front", "psi"], ["Brk Rr (psi)", "brake_rear", "psi"], ["Sus Fr (in)", "fork_travel", "inch"],
      ["Sus Rr (in)", "shock_travel", "inch"], ["Wtr Tmp (°F)", "water_temp", "degf"], ["Gr", "gear", "gear"], ["Lat G (g)", "accel_lat", "g"],
      ["Lon G (g)", "accel_long", "g"], ["GPS Spd (mph)", "gps_speed", "mph"], ["GPS Lat (deg)", "gps_lat", "lat"], ["GPS Lon (deg)", "gps_lon", "lon"],
    ],
  },
  {
    name: "lower case with ft/rr, kPa and m/s",
    delimiter: ";",
    columns: [
      ["t [s]", "time", "ts"], ["speed ft [m/s]", "speed_front", "ms"], ["speed rr [m/s]", "speed_rear", "ms"], ["eng rpm", "engine_rpm", "rpm"],
      ["thr [%]", "throttle", "pct"], ["brake ft [kPa]", "brake_front", "kpa"], ["brake rr [kPa]", "brake_rear", "kpa"], ["travel ft [mm]", "fork_travel", "mm"],
      ["travel rr [mm]", "shock_travel", "mm"], ["bank [deg]", "lean_angle", "deg"], ["lat [deg]", "gps_lat", "lat"], ["lon [deg]", "gps_lon", "lon"],
      ["gps v [m/s]", "gps_speed", "ms"], ["gear", "gear", "gear"], ["lap bcn", "lap_beacon", "beacon"],
    ],
  },
  {
    name: "leading F/R prefix",
    delimiter: ",",
    columns: [
      ["Time [s]", "time", "ts"], ["FSpeed [km/h]", "speed_front", "kmh"], ["RSpeed [km/h]", "speed_rear", "kmh"], ["Engine [rpm]", "engine_rpm", "rpm"],
      ["Grip [%]", "throttle", "pct"], ["FBrake [bar]", "brake_front", "bar"], ["RBrake [bar]", "brake_rear", "bar"], ["FSusp [mm]", "fork_travel", "mm"],
      ["RSusp [mm]", "shock_travel", "mm"], ["FTyre [°C]", "tyre_temp_front", "degc"], ["RTyre [°C]", "tyre_temp_rear", "degc"], ["Lambda1", "lambda", "lambda"],
      ["Beacon", "lap_beacon", "beacon"], ["Gear", "gear", "gear"], ["AccX [m/s²]", "accel_long", "ms2"], ["AccY [m/s²]", "accel_lat", "ms2"],
    ],
  },
  {
    name: "dotted paths",
    delimiter: ",",
    columns: [
      ["sys.time [ms]", "time", "tms"], ["wheel.front.speed [km/h]", "speed_front", "kmh"], ["wheel.rear.speed [km/h]", "speed_rear", "kmh"],
      ["engine.rpm", "engine_rpm", "rpm"], ["engine.throttle [%]", "throttle", "pct"], ["engine.coolant [°C]", "water_temp", "degc"],
      ["brake.front.pressure [bar]", "brake_front", "bar"], ["brake.rear.pressure [bar]", "brake_rear", "bar"], ["susp.front.pos [mm]", "fork_travel", "mm"],
      ["susp.rear.pos [mm]", "shock_travel", "mm"], ["imu.roll [deg]", "lean_angle", "deg"], ["imu.acc.x [g]", "accel_long", "g"], ["imu.acc.y [g]", "accel_lat", "g"],
      ["imu.yaw_rate [deg/s]", "other", "degs"], ["gps.lat [deg]", "gps_lat", "lat"], ["gps.lon [deg]", "gps_lon", "lon"], ["gps.alt [m]", "gps_alt", "alt"],
      ["gps.speed [km/h]", "gps_speed", "kmh"],
    ],
  },
  {
    name: "few units: values decide",
    delimiter: ",",
    columns: [
      ["Clock", "time", "ts"], ["Lat", "gps_lat", "lat"], ["Long", "gps_lon", "lon"], ["Speed [km/h]", "gps_speed", "kmh"], ["Revs", "engine_rpm", "rpm"],
      ["Gas", "throttle", "pct"], ["Gear", "gear", "gear"], ["Marker", "lap_beacon", "beacon"], ["Water", "water_temp", "degc"], ["AFR", "lambda", "afr"],
    ],
  },
  {
    name: "underscore names with unit suffix words",
    delimiter: "\t",
    columns: [
      ["time_s [s]", "time", "ts"], ["whl_spd_f [km/h]", "speed_front", "kmh"], ["whl_spd_r [km/h]", "speed_rear", "kmh"], ["eng_spd [rpm]", "engine_rpm", "rpm"],
      ["thr_pos [%]", "throttle", "pct"], ["brk_p_f [bar]", "brake_front", "bar"], ["brk_p_r [bar]", "brake_rear", "bar"], ["frk_trv [mm]", "fork_travel", "mm"],
      ["shk_trv [mm]", "shock_travel", "mm"], ["lean [deg]", "lean_angle", "deg"], ["t_tyre_f [°C]", "tyre_temp_front", "degc"], ["t_tyre_r [°C]", "tyre_temp_rear", "degc"],
      ["t_clt [°C]", "water_temp", "degc"], ["t_air [°C]", "other", "degc"], ["fuel_p [bar]", "other", "bar"], ["steer_ang [deg]", "other", "deg"],
    ],
  },
];

function csvOf(d: Dialect): string {
  const rows: string[] = [d.columns.map((c) => c[0]).join(d.delimiter)];
  for (let r = 0; r < 8; r++) {
    rows.push(
      d.columns
        .map(([, , kind]) => {
          const s = values(kind, r).toFixed(DECIMALS[kind] ?? 2);
          return d.decimalComma ? s.replace(".", ",") : s;
        })
        .join(d.delimiter),
    );
  }
  return rows.join("\n") + "\n";
}

interface Result {
  dialect: string;
  header: string;
  expected: ChannelRole;
  got: string;
  reason: string;
  unitClear: boolean;
}

const results: Result[] = DIALECTS.flatMap((d) => {
  const h = readCsvHeader(csvOf(d), true);
  const s = suggestMapping(h.columns, h.sampleRows);
  return d.columns.map(([header, expected], i) => {
    const unit = at(h.columns, i).unit;
    return { dialect: d.name, header, expected, got: at(s.columns, i).role, reason: at(s.columns, i).reason, unitClear: expected !== "other" && !!unit && !!lookupUnit(unit) };
  });
});
const right = results.filter((r) => r.got === r.expected).length;
const score = Math.round((1000 * right) / results.length) / 10;

describe(`mapping suggestions over ${DIALECTS.length} invented header dialects: ${right} of ${results.length} columns right (${score} %)`, () => {
  it("covers at least 12 dialects and 150 columns", () => {
    expect(DIALECTS.length).toBeGreaterThanOrEqual(12);
    expect(results.length).toBeGreaterThanOrEqual(150);
  });

  it(`suggests at least 90 % of columns right (score ${score} %)`, () => {
    const wrong = results.filter((r) => r.got !== r.expected).map((r) => `${r.dialect}: "${r.header}" → ${r.got} (expected ${r.expected}; ${r.reason})`);
    expect(score, wrong.join("\n")).toBeGreaterThanOrEqual(90);
  });

  it("leaves no column whose role is clear from its unit at Other", () => {
    const left = results.filter((r) => r.unitClear && r.got === "other").map((r) => `${r.dialect}: "${r.header}"`);
    expect(left).toEqual([]);
  });

  it("gives a reason for every suggestion", () => {
    expect(results.every((r) => r.reason.length > 5)).toBe(true);
  });

  it.each(DIALECTS.map((d) => [d.name, d] as const))("%s: each role at most once", (_, d) => {
    const h = readCsvHeader(csvOf(d), true);
    const roles = suggestMapping(h.columns, h.sampleRows).columns.map((c) => c.role).filter((r) => r !== "other");
    expect(new Set(roles).size).toBe(roles.length);
  });
});

type ClueCase = [cells: string[], rows: string[][], col: number, role: ChannelRole, decides: string];
describe("mapping suggestions: what one clue alone decides", () => {
  it.each<ClueCase>([
    // [header cells, sample rows, column, expected role, what decides]
    [["Time [s]", "Ch 3 [rpm]"], [["0", "1200"]], 1, "engine_rpm", "unit rpm"],
    [["Time [s]", "Ch 3 [%]"], [["0", "12.5"]], 1, "throttle", "unit %"],
    [["Time [s]", "Ch 3 F [psi]"], [["0", "3"]], 1, "brake_front", "unit psi + F"],
    [["Time [s]", "Ch 3 R [bar]"], [["0", "0.2"]], 1, "brake_rear", "unit bar + R"],
    [["Time [s]", "Ch 3 [AFR]"], [["0", "13.2"]], 1, "lambda", "unit AFR"],
    [["Stamp", "Ch 3"], [["0.00", "1"], ["0.01", "1"], ["0.02", "1"]], 0, "time", "first column increasing"],
    [["Time [s]", "Ch 3"], [["0", "0"], ["0.1", "1"], ["0.2", "0"]], 1, "lap_beacon", "0/1 values"],
    [["Time [s]", "Ch 3"], [["0", "1"], ["0.1", "2"], ["0.2", "3"]], 1, "gear", "integer steps 0–7"],
    [["Time [s]", "Ch 3"], [["0", "46.0012345"], ["0.1", "46.0012399"]], 1, "gps_lat", "GPS-like degrees"],
    [["Time [s]", "Ch 3"], [["0", "1350"], ["0.1", "1362"]], 1, "engine_rpm", "rpm-like magnitude"],
  ])("%j with rows %j: column %s → %s (%s)", (cells, rows, col, role) => {
    const text = [cells.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n";
    const h = readCsvHeader(text, true);
    expect(at(suggestMapping(h.columns, h.sampleRows).columns, col).role).toBe(role);
  });
});

const REAL = path.resolve(__dirname, "../../../../shared/real-logs/vehicle-csv/car-60s-wheel-speeds-83hz.csv");
describe("mapping suggestions on a real recording's header (car wheel speeds, MIT licence)", () => {
  it("front-left and rear-left wheel speeds become the front and rear wheel speeds", () => {
    const text = readFileSync(REAL, "utf8").split("\n").slice(0, 10).join("\n");
    const h = readCsvHeader(text, false);
    const roles = suggestMapping(h.columns, h.sampleRows).columns.map((c) => c.role);
    expect(roles[0]).toBe("time");
    expect(roles[1]).toBe("speed_front");
    expect(roles[3]).toBe("speed_rear");
  });
});
