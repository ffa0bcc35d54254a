import { readFileSync } from "node:fs";
import { join } from "node:path";
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { KMH_TO_MPS, MPH_TO_MPS, PSI_TO_PA, STANDARD_GRAVITY_MPS2, type ParsedSeries } from "@/lib/ingest";
import { importFile } from "./import-file";
import { at } from "../../fixtures/at";

const DIR = join(__dirname, "../../fixtures/formats");
const load = (f: string) => importFile(join(DIR, f));
const channel = (s: ParsedSeries, role: string) => {
  const c = s.channels.find((ch) => ch.role === role);
  if (!c) throw new Error(`no ${role} channel`);
  return c;
};
/** Float32 storage: compare with a relative tolerance of 1e-7 (about 2^-23). */
const f32 = (x: number) => Math.fround(x);

describe("good CSV variants parse to the same SI series", () => {
  // The reference: 36, 72, 108 km/h = 10, 20, 30 m/s (NIST SP 811: km/h = 1/3.6 m/s, exact);
  // brake 0, 1.5, 3 bar = 0, 150 000, 300 000 Pa (bar = 100 000 Pa, exact).
  it.each(["comma-metadata.csv", "semicolon-decimal-comma.csv", "tab.tsv", "bom.csv", "units-in-parentheses.csv"])("%s", async (file) => {
    const s = await load(file);
    expect(s.rows).toBe(3);
    expect([...s.timeS]).toEqual([0, 0.05, 0.1].map((t) => expect.closeTo(t, 12)));
    const v = channel(s, "speed_front");
    expect(v.unit).toBe("m/s");
    expect([...v.values]).toEqual([36, 72, 108].map((k) => f32(k * KMH_TO_MPS)));
    expect([v.min, v.max]).toEqual([f32(10), f32(30)]);
    const b = channel(s, "brake_front");
    expect(b.unit).toBe("Pa");
    expect([...b.values]).toEqual([0, 150_000, 300_000]);
    expect([...channel(s, "throttle").values]).toEqual([0, 50, 100]);
  });

  it("keeps the '# key: value' lines as metadata and records the time format", async () => {
    const s = await load("comma-metadata.csv");
    expect(s.metadata).toMatchObject({ rider: "Test Rider A", bike: "Bike 1", track: "Test Circuit North", source_format: "csv", time_format: "seconds" });
  });

  it("sparse GPS columns: empty cells are NaN, counted out of sampleCount", async () => {
    const s = await load("sparse-gps.csv");
    expect(s.rows).toBe(10);
    const lat = channel(s, "gps_lat");
    expect(lat.sampleCount).toBe(2);
    expect(Number.isNaN(lat.values[1])).toBe(true);
    // Latitude and longitude are kept as Float64 (FLOAT64_ROLES): the value as written.
    expect(lat.values[5]).toBe(45.10005);
    expect(lat.values).toBeInstanceOf(Float64Array);
    expect(channel(s, "speed_front").sampleCount).toBe(10);
    expect(channel(s, "gps_speed").sampleCount).toBe(2);
  });

  it("milliseconds: 1000, 1050, 1100 ms → 0, 0.05, 0.1 s from the first row", async () => {
    const s = await load("time-milliseconds.csv");
    expect(s.metadata.time_format).toBe("milliseconds");
    expect([...s.timeS]).toEqual([0, 0.05, 0.1].map((t) => expect.closeTo(t, 12)));
  });

  it("ISO 8601 across midnight: 23:59:59.950 → 00:00:00.050 next day is 0.1 s", async () => {
    const s = await load("time-iso8601.csv");
    expect(s.metadata.time_format).toBe("iso8601");
    expect(s.metadata.start_time_iso).toBe("2024-05-01T23:59:59.950Z");
    expect([...s.timeS]).toEqual([0, 0.05, 0.1].map((t) => expect.closeTo(t, 9)));
  });

  it("mixed line endings (CR LF and LF in one file) are accepted and read like LF", async () => {
    const s = await load("mixed-line-endings.csv");
    expect(s.rows).toBe(4);
    expect([...channel(s, "throttle").values]).toEqual([0, 50, 100, 100]);
  });

  it("why we normalise line endings ourselves: papaparse guesses one newline from the first chunk", () => {
    const text = readFileSync(join(DIR, "mixed-line-endings.csv"), "utf8");
    const guessed = Papa.parse<string[]>(text, { delimiter: "," });
    // It picks CR LF (the first line's ending) and then reads "0.00,36,0\n0.05,72,50" as one row.
    expect(guessed.meta.linebreak).toBe("\r\n");
    expect(guessed.data.length).toBeLessThan(5);
  });

  it("imperial units convert with the NIST SP 811 factors", async () => {
    const s = await load("imperial-units.csv");
    expect([...channel(s, "speed_rear").values]).toEqual([f32(60 * MPH_TO_MPS), f32(30 * MPH_TO_MPS)]); // 26.8224 m/s
    expect(channel(s, "speed_rear").values[0]).toBeCloseTo(26.8224, 4);
    expect(channel(s, "brake_rear").values[0]).toBeCloseTo(100 * 6894.757, 0); // psi → Pa (SP 811)
    expect(channel(s, "brake_rear").values[1]).toBe(f32(50 * PSI_TO_PA));
    expect([...channel(s, "fork_travel").values]).toEqual([f32(0.0254), f32(0.0508)]); // inch = 0.0254 m exact
    expect([...channel(s, "water_temp").values]).toEqual([100, 0]); // 212 °F, 32 °F → °C (SP 811 B.9)
    expect([...channel(s, "accel_long").values]).toEqual([f32(STANDARD_GRAVITY_MPS2), f32(-0.5 * STANDARD_GRAVITY_MPS2)]);
    expect(channel(s, "lean_angle").values[0]).toBeCloseTo(28.6479, 4); // 0.5 rad × 180/π
    expect([...channel(s, "shock_travel").values]).toEqual([f32(0.0254), f32(0.0508)]);
  });

  it("a trailing delimiter on every line is an empty extra column, not an error", async () => {
    const s = await load("trailing-delimiter.csv");
    expect(s.channels.map((c) => c.name)).toEqual(["Throttle"]);
    expect([...at(s.channels, 0).values]).toEqual([1, 2]);
  });

  it("quoted header names may contain the delimiter", async () => {
    const s = await load("quoted-header.csv");
    expect(s.channels.map((c) => c.name)).toEqual(["Front brake, lever", "Throttle"]);
  });

  it("'other' columns: a known unit goes to SI, an unknown one stays raw", async () => {
    const s = await load("other-columns.csv");
    const byName = Object.fromEntries(s.channels.map((c) => [c.name, c]));
    expect(byName["Oil pressure"]).toMatchObject({ role: "other", unit: "Pa", min: 300_000, max: 310_000 });
    expect(byName["Mystery channel"]).toMatchObject({ role: "other", unit: "zorks", min: 7, max: 8 });
    expect(byName.Gear).toMatchObject({ role: "gear", unit: "", min: 1, max: 2 });
  });
});

describe("GPX 1.1", () => {
  it("reads track points: position, <ele>, time from the first point, start time in metadata", async () => {
    const s = await load("track.gpx");
    expect(s.rows).toBe(5);
    expect([...s.timeS]).toEqual([0, 1, 2, 3, 4]);
    expect(s.metadata).toMatchObject({ source_format: "gpx", start_time_iso: "2024-05-01T10:00:00.000Z", gps_speed_source: "derived from positions" });
    expect([...channel(s, "gps_lat").values]).toEqual([45, 45.0001, 45.0002, 45.0003, 45.0004]);
    expect([...channel(s, "gps_alt").values]).toEqual([300, 301, 302, 303, 304]);
  });

  it("derives speed from positions when the file has none: 0.0001° of latitude per second at 45°N ≈ 11.1 m/s", async () => {
    // From memory: one degree of latitude at 45° is about 111.13 km on WGS-84.
    const s = await load("track.gpx");
    for (const v of channel(s, "gps_speed").values) expect(v).toBeCloseTo(11.113, 1);
  });

  it("uses a plain <speed> (m/s) from the point's extensions when every point has one", async () => {
    const s = await load("track-with-speed.gpx");
    expect(s.metadata.gps_speed_source).toBe("file");
    expect([...channel(s, "gps_speed").values]).toEqual([10, 11, 12]);
    expect([...s.timeS]).toEqual([0, 0.1, 0.2].map((t) => expect.closeTo(t, 12)));
  });
});

describe("NMEA 0183", () => {
  // 4807.0380,N = 48° + 7.038′ = 48.1173°; 01131.0000,E = 11° 31′ = 11.516667° (ddmm.mmmm, NMEA 0183).
  it("merges RMC and GGA of each epoch; keeps three-digit fractions of a second", async () => {
    const s = await load("rmc-gga-10hz.nmea");
    expect(s.rows).toBe(5);
    expect([...s.timeS]).toEqual([0, 0.1, 0.2, 0.3, 0.4].map((t) => expect.closeTo(t, 9)));
    expect(s.metadata.start_time_iso).toBe("2024-05-01T10:00:00.025Z");
    expect(channel(s, "gps_lat").values[0]).toBeCloseTo(48 + 7.038 / 60, 12);
    expect(channel(s, "gps_lon").values[0]).toBeCloseTo(11 + 31 / 60, 12);
    expect(channel(s, "gps_alt").values[0]).toBe(f32(545.4));
    // 10 kn × 1852/3600 = 5.1444 m/s (knot: NIST SP 811 B.8, memory).
    expect(channel(s, "gps_speed").values[0]).toBeCloseTo(5.14444, 4);
    expect(s.metadata.nmea_ignored_sentences).toBe("1"); // the GSV line
  });

  it("crosses midnight: 23:59:59 on 31 May → 00:00:01 on 1 June is 2 s", async () => {
    const s = await load("across-midnight.nmea");
    expect([...s.timeS]).toEqual([0, 1, 2]);
    expect(s.metadata.start_time_iso).toBe("2024-05-31T23:59:59.000Z");
  });

  it("counts lines with a bad checksum and goes on", async () => {
    const s = await load("some-bad-checksums.nmea");
    expect(s.rows).toBe(2);
    expect([...s.timeS]).toEqual([0, expect.closeTo(0.2, 9)]);
    expect(s.metadata).toMatchObject({ nmea_bad_checksum_lines: "1", nmea_first_bad_checksum_line: "2", nmea_other_lines: "1" });
  });
});
