import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { readCsvHeader, suggestMapping, type ParsedSeries } from "@/lib/ingest";
import { importFile } from "./import-file";
import { at } from "../../fixtures/at";

/**
 * The generated sample logs (sample-logs/files, written by `npm run samples`) parsed end to end and
 * checked against the generator's own truth files: header → role, SI units, row count, rates.
 */
const DIR = join(__dirname, "../../../sample-logs/files");

interface Truth {
  sampleRateHz: number;
  gpsRateHz: number;
  samples: number;
  metadata: { startedAt: string };
  channels: { header: string; role: string; siUnit: string }[];
  laps: { topSpeedMps: number }[];
}
const truthOf = (file: string): Truth => JSON.parse(readFileSync(join(DIR, file), "utf8"));
const ch = (s: ParsedSeries, role: string) => s.channels.find((c) => c.role === role)!;

describe("sample logs from sample-logs/files", () => {
  it.each(["three-laps-20hz", "three-laps-10hz"])("%s.csv: suggested roles are the generator's intended roles", (base) => {
    const truth = truthOf(`${base}.truth.json`);
    const head = readFileSync(join(DIR, `${base}.csv`)).subarray(0, 65536).toString("utf8");
    const header = readCsvHeader(head, false);
    const mapping = suggestMapping(header.columns, header.sampleRows);
    const byHeader = new Map(header.columns.map((c) => [c.header, at(mapping.columns, c.index).role]));
    for (const c of truth.channels) expect(byHeader.get(c.header), c.header).toBe(c.role);
    expect(mapping.timeFormat).toBe("seconds");
  });

  it.each(["three-laps-20hz", "three-laps-10hz"])("%s.csv parses: rows, clock, SI units, GPS density as the truth says", async (base) => {
    const truth = truthOf(`${base}.truth.json`);
    const s = await importFile(join(DIR, `${base}.csv`));
    expect(s.rows).toBe(truth.samples);
    expect(at(s.timeS, 1) - at(s.timeS, 0)).toBeCloseTo(1 / truth.sampleRateHz, 9);
    for (const c of truth.channels) expect(ch(s, c.role).unit, c.header).toBe(c.siUnit);
    // GPS columns are sparse: one fix every sampleRate/gpsRate rows.
    expect(ch(s, "gps_lat").sampleCount).toBeCloseTo((s.rows * truth.gpsRateHz) / truth.sampleRateHz, -1);
    expect(ch(s, "speed_front").sampleCount).toBe(s.rows);
    // km/h → m/s conversion checked against the generator's top speed (m/s), within 1%.
    const top = Math.max(...truth.laps.map((l) => l.topSpeedMps));
    expect(Math.abs(ch(s, "speed_front").max - top) / top).toBeLessThan(0.01);
    expect(s.metadata["started at"]).toBe(truth.metadata.startedAt);
  });

  it("three-laps.gpx and three-laps.nmea (same 10 Hz fixes) agree with each other and with the 10 Hz CSV", async () => {
    const truth = truthOf("three-laps.gps.truth.json");
    const gpx = await importFile(join(DIR, "three-laps.gpx"));
    const nmea = await importFile(join(DIR, "three-laps.nmea"));
    const csv = await importFile(join(DIR, "three-laps-10hz.csv"));
    expect(gpx.rows).toBe(nmea.rows);
    expect(gpx.metadata.start_time_iso).toBe(truth.metadata.startedAt);
    expect(nmea.metadata.start_time_iso).toBe(truth.metadata.startedAt);
    expect(gpx.timeS[1]).toBeCloseTo(1 / truth.gpsRateHz, 9);
    const csvLat = ch(csv, "gps_lat").values.filter((v) => !Number.isNaN(v));
    expect(csvLat.length).toBe(gpx.rows);
    let worstLat = 0;
    let speedDiff = 0;
    for (let i = 0; i < gpx.rows; i++) {
      expect(at(nmea.timeS, i)).toBeCloseTo(at(gpx.timeS, i), 6);
      worstLat = Math.max(worstLat, Math.abs(at(ch(gpx, "gps_lat").values, i) - at(ch(nmea, "gps_lat").values, i)), Math.abs(at(csvLat, i) - at(ch(gpx, "gps_lat").values, i)));
      speedDiff += Math.abs(at(ch(gpx, "gps_speed").values, i) - at(ch(nmea, "gps_speed").values, i));
    }
    // Float32 spacing at 46° is 3.8e-6°; the files print 7 decimals (GPX/CSV) and 6 decimals of minutes (NMEA).
    expect(worstLat).toBeLessThan(1e-5);
    // GPX speed is derived from positions, NMEA speed is the receiver's: mean difference under 1 m/s.
    expect(speedDiff / gpx.rows).toBeLessThan(1);
  });
});
