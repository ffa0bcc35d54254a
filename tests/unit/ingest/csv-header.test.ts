import { describe, expect, it } from "vitest";
import { headerSignature, readCsvHeader, splitNameAndUnit, suggestMapping } from "@/lib/ingest";
import { at } from "../../fixtures/at";

describe("readCsvHeader", () => {
  it("reads metadata lines, the header, names and units", () => {
    const h = readCsvHeader("# rider: Test Rider A\n# note: wet: partly\n\nTime [s],Front brake (bar),Gear\n0,1,2\n", true);
    expect(h.metadata).toEqual({ rider: "Test Rider A", note: "wet: partly" });
    expect(h.headerLine).toBe(4);
    expect(h.dataStartLine).toBe(5);
    expect(h.columns.map((c) => [c.index, c.name, c.unit])).toEqual([
      [0, "Time", "s"],
      [1, "Front brake", "bar"],
      [2, "Gear", ""],
    ]);
  });

  it.each([
    [",", "Time [s],Throttle [%]\n0.0,1\n0.1,2\n", false],
    [";", "Time [s];Throttle [%]\n0,0;1,5\n0,1;2,5\n", true],
    [";", "Time [s];Throttle [%]\n0.0;1.5\n0.1;2.5\n", false],
    ["\t", "Time [s]\tThrottle [%]\n0.0\t1\n0.1\t2\n", false],
  ])("detects delimiter %j (decimal comma: %s)", (delimiter, text, decimalComma) => {
    const h = readCsvHeader(text as string, true);
    expect(h.delimiter).toBe(delimiter);
    expect(h.decimalComma).toBe(decimalComma);
  });

  it("semicolon with decimal commas is not mistaken for comma-separated (comma counts vary per line)", () => {
    const h = readCsvHeader("Time [s];A [bar];B [bar]\n0,05;1;2,5\n0,10;1,5;2\n", true);
    expect(h.delimiter).toBe(";");
  });

  it("takes the last bracket group as the unit", () => {
    expect(splitNameAndUnit("Accel (long) [g]")).toEqual({ name: "Accel (long)", unit: "g" });
    expect(splitNameAndUnit("Throttle")).toEqual({ name: "Throttle", unit: "" });
  });

  it("drops a trailing empty column that every line has, keeping the field count", () => {
    const h = readCsvHeader("Time [s],Throttle [%],\n0,1,\n", true);
    expect(h.columns).toHaveLength(2);
    expect(h.fieldCount).toBe(3);
  });
});

describe("suggestMapping", () => {
  it.each([
    ["Time [s]", "time"],
    ["Front wheel speed [km/h]", "speed_front"],
    ["wheel_speed_front [km/h]", "speed_front"],
    ["Rear wheel [mph]", "speed_rear"],
    ["GPS speed [km/h]", "gps_speed"],
    ["Lat", "gps_lat"],
    ["Longitude [deg]", "gps_lon"],
    ["lng", "gps_lon"],
    ["Altitude [m]", "gps_alt"],
    ["Engine speed [rpm]", "engine_rpm"],
    ["TPS [%]", "throttle"],
    ["Front brake [bar]", "brake_front"],
    ["Rear brake [psi]", "brake_rear"],
    ["Fork position [mm]", "fork_travel"],
    ["Rear suspension [mm]", "shock_travel"],
    ["Roll angle [deg]", "lean_angle"],
    ["Gear", "gear"],
    ["Lap marker", "lap_beacon"],
    ["Front tyre temp [degC]", "tyre_temp_front"],
    ["Rear tire temperature [°F]", "tyre_temp_rear"],
    ["Coolant [degC]", "water_temp"],
    ["Lambda", "lambda"],
    ["Accel X [g]", "accel_long"],
    ["Accel lat [g]", "accel_lat"],
    ["Mystery [zorks]", "other"],
  ])("%s → %s", (header, role) => {
    const h = readCsvHeader(`Other column,${header}\n1,2\n`, true);
    expect(at(suggestMapping(h.columns).columns, 1).role).toBe(role);
  });

  it("a unit of the wrong kind keeps the name from deciding: 'Fork [bar]' is not fork travel", () => {
    const h = readCsvHeader("Time [s],Fork [bar]\n0,1\n", true);
    expect(at(suggestMapping(h.columns).columns, 1).role).toBe("other");
  });

  it("one column per role: the second front wheel speed becomes other", () => {
    const h = readCsvHeader("Time [s],Front speed [km/h],Front wheel speed [mph]\n0,1,2\n", true);
    expect(suggestMapping(h.columns).columns.map((c) => c.role)).toEqual(["time", "speed_front", "other"]);
  });

  it.each([
    ["Time [s]", ["0.00", "0.05"], "seconds"],
    ["Time [ms]", ["0", "50"], "milliseconds"],
    ["Time", ["1000", "1050", "1100"], "milliseconds"],
    ["Time", ["0.00", "0.05", "0.10"], "seconds"],
    // Whole numbers stepping by 1: a 1 kHz log in integer ms, not a 1 Hz one (a 1000× error otherwise).
    ["Time", ["0", "1", "2"], "milliseconds"],
    ["Time", ["5000", "5001", "5002", "5003"], "milliseconds"],
    ["Timestamp", ["2024-05-01T10:00:00.000Z", "2024-05-01T10:00:00.050Z"], "iso8601"],
    ["Timestamp", ["2024-05-01 10:00:00.000", "2024-05-01 10:00:00.050"], "iso8601"],
  ])("time format of %s with %j → %s", (name, values, format) => {
    const h = readCsvHeader(`${name},Throttle [%]\n${values.map((v) => `${v},1`).join("\n")}\n`, true);
    expect(suggestMapping(h.columns, h.sampleRows).timeFormat).toBe(format);
  });
});

describe("headerSignature", () => {
  const sig = (text: string) => headerSignature(readCsvHeader(text, true).columns);
  it("is a 64-character sha256 hex string", () => {
    expect(sig("Time [s],Throttle [%]\n")).toMatch(/^[0-9a-f]{64}$/);
  });
  it("ignores case, spacing, separators, bracket style and delimiter", () => {
    expect(sig("Time [s],Front_Wheel  Speed [KM/H]\n")).toBe(sig("time (s);front wheel speed (km/h)\n"));
  });
  it("changes when a unit, a name or the order changes", () => {
    const base = sig("Time [s],Throttle [%]\n");
    expect(sig("Time [ms],Throttle [%]\n")).not.toBe(base);
    expect(sig("Time [s],Throttle position [%]\n")).not.toBe(base);
    expect(sig("Throttle [%],Time [s]\n")).not.toBe(base);
  });
});
