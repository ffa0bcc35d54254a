/**
 * Sample-file writers read back with the parsers the app uses (papaparse, fast-xml-parser,
 * nmea-simple), and the generator's determinism.
 */
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import Papa from "papaparse";
import { XMLParser, XMLValidator } from "fast-xml-parser";
import { parseNmeaSentence } from "nmea-simple";
import { generateSession, RIDERS, type GeneratedSession } from "@/sample-logs/generate-session";
import { csvChunks, csvHeader, formatNumber, gpsFixIndices, nmeaChecksum, toCsvString, toGpxString, toNmeaString, writeChunks } from "@/sample-logs/write-formats";
import { at } from "../../fixtures/at";

let s: GeneratedSession;
let dir: string;

beforeAll(() => {
  s = generateSession({ seed: 21, flyingLaps: 1, gpsRateHz: 10, brakeOnStraightLaps: [1], revCeilingLap: null, pitOverspeed: "out" });
  dir = mkdtempSync(path.join(tmpdir(), "lapbench-samples-"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function parseCsv(text: string, delimiter: string): { meta: string[]; rows: string[][] } {
  const lines = text.split("\n");
  const meta = lines.filter((l) => l.startsWith("# "));
  const body = lines.filter((l) => !l.startsWith("#")).join("\n");
  const res = Papa.parse<string[]>(body, { delimiter, skipEmptyLines: true });
  expect(res.errors).toEqual([]);
  return { meta, rows: res.data };
}

describe("CSV", () => {
  it("formats numbers with trailing zeros dropped and an optional decimal comma", () => {
    expect(formatNumber(12.5, 2)).toBe("12.5");
    expect(formatNumber(0, 2)).toBe("0");
    expect(formatNumber(-0.001, 1)).toBe("0");
    expect(formatNumber(1234.567, 1, true)).toBe("1234,6");
    expect(formatNumber(13456.4, 0)).toBe("13456");
  });

  it("round-trips through papaparse: metadata, 'Name [unit]' headers, values, empty GPS cells", () => {
    const { meta, rows } = parseCsv(toCsvString(s), ",");
    expect(meta).toContain(`# rider: ${RIDERS.a.name}`);
    expect(meta).toContain(`# started at: ${s.metadata.startedAt}`);
    const [header, ...data] = rows;
    if (!header) throw new Error("the CSV has no header row");
    expect(header).toEqual(csvHeader(s, "s"));
    expect(at(header, 0)).toBe("Time [s]");
    expect(header).toContain("Front wheel speed [km/h]");
    expect(header).toContain("Front brake pressure [bar]");
    expect(data).toHaveLength(s.timeS.length);
    const iSpeed = header.indexOf("Front wheel speed [km/h]");
    const iBrake = header.indexOf("Front brake pressure [bar]");
    const iLat = header.indexOf("GPS latitude [deg]");
    const speed = s.channels.find((c) => c.role === "speed_front")!.data;
    const brake = s.channels.find((c) => c.role === "brake_front")!.data;
    const lat = s.channels.find((c) => c.role === "gps_lat")!.data;
    let worstSpeed = 0, worstBrake = 0, emptyCells = 0;
    for (let j = 0; j < data.length; j++) {
      expect(Number(at(data, j)[0])).toBeCloseTo(at(s.timeS, j), 3);
      worstSpeed = Math.max(worstSpeed, Math.abs(Number(at(data, j)[iSpeed]) - at(speed, j) * 3.6));
      worstBrake = Math.max(worstBrake, Math.abs(Number(at(data, j)[iBrake]) - at(brake, j) / 1e5));
      if (Number.isNaN(lat[j])) {
        if (at(data, j)[iLat] === "") emptyCells++;
      } else expect(Number(at(data, j)[iLat])).toBeCloseTo(at(lat, j), 7);
    }
    expect(worstSpeed).toBeLessThanOrEqual(0.05 + 1e-6);
    expect(worstBrake).toBeLessThanOrEqual(0.005 + 1e-6);
    // 100 Hz rows, 10 Hz fixes: nine empty latitude cells out of ten.
    expect(emptyCells).toBe(s.timeS.length - gpsFixIndices(s).length);
    expect(emptyCells / s.timeS.length).toBeCloseTo(0.9, 2);
  });

  it("';' with decimal comma and tab variants hold the same values as the ',' file", () => {
    const plain = parseCsv(toCsvString(s), ",").rows;
    const comma = parseCsv(toCsvString(s, { delimiter: ";", decimalComma: true }), ";").rows;
    const tab = parseCsv(toCsvString(s, { delimiter: "\t" }), "\t").rows;
    expect(comma[0]).toEqual(plain[0]);
    expect(tab).toEqual(plain);
    let differing = 0;
    for (let j = 1; j < plain.length; j++) {
      for (let k = 0; k < at(plain, j).length; k++) if (at(at(comma, j), k).replace(",", ".") !== at(at(plain, j), k)) differing++;
    }
    expect(differing).toBe(0);
    expect(comma.slice(1).some((r) => at(r, 0).includes(","))).toBe(true);
    expect(() => toCsvString(s, { delimiter: ",", decimalComma: true })).toThrow(/';'/);
  });

  it("writes time as integer milliseconds or ISO 8601", () => {
    const ms = parseCsv(toCsvString(s, { time: "ms" }), ",").rows;
    expect(at(ms, 0)[0]).toBe("Time [ms]");
    expect(at(ms, 101)[0]).toBe("1000");
    const iso = parseCsv(toCsvString(s, { time: "iso" }), ",").rows;
    expect(at(iso, 0)[0]).toBe("Time");
    expect(Date.parse(at(at(iso, 251), 0)) - Date.parse(s.metadata.startedAt)).toBe(2500);
    expect(at(iso, 1)[0]).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
  });

  it("streams to a file in chunks with the same bytes as the in-memory text", async () => {
    const file = path.join(dir, "stream.csv");
    let chunks = 0;
    const counted = (function* () {
      for (const c of csvChunks(s, { rowsPerChunk: 500 })) {
        chunks++;
        yield c;
      }
    })();
    const bytes = await writeChunks(file, counted);
    const text = readFileSync(file, "utf8");
    expect(text).toBe(toCsvString(s));
    expect(bytes).toBe(Buffer.byteLength(text));
    expect(chunks).toBeGreaterThan(s.timeS.length / 500);
  });
});

describe("GPX 1.1", () => {
  it("is well-formed XML with one trkpt per fix, in time order", () => {
    const xml = toGpxString(s);
    expect(XMLValidator.validate(xml)).toBe(true);
    const doc = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: "" }).parse(xml);
    expect(doc.gpx.version).toBe("1.1");
    expect(doc.gpx.xmlns).toBe("http://www.topografix.com/GPX/1/1");
    const pts = doc.gpx.trk.trkseg.trkpt as { lat: string; lon: string; ele: number; time: string }[];
    const fixes = gpsFixIndices(s);
    expect(pts).toHaveLength(fixes.length);
    const lat = s.channels.find((c) => c.role === "gps_lat")!.data;
    expect(Number(at(pts, 50).lat)).toBeCloseTo(at(lat, at(fixes, 50)), 7);
    for (let k = 1; k < pts.length; k++) expect(Date.parse(at(pts, k).time) - Date.parse(at(pts, k - 1).time)).toBe(100);
  });

  it("a broken document is rejected by the validator (the check can fail)", () => {
    const xml = toGpxString(s).replace("</trkseg>", "");
    expect(XMLValidator.validate(xml)).not.toBe(true);
  });
});

describe("NMEA 0183", () => {
  it("has an RMC and a GGA sentence per fix, each accepted by nmea-simple's parser", () => {
    const lines = toNmeaString(s).split("\r\n").filter(Boolean);
    const fixes = gpsFixIndices(s);
    expect(lines).toHaveLength(2 * fixes.length);
    const lat = s.channels.find((c) => c.role === "gps_lat")!.data;
    const lon = s.channels.find((c) => c.role === "gps_lon")!.data;
    const spd = s.channels.find((c) => c.role === "gps_speed")!.data;
    for (let k = 0; k < fixes.length; k += 7) {
      // parseNmeaSentence throws on a wrong checksum.
      const rmc = parseNmeaSentence(at(lines, 2 * k));
      const gga = parseNmeaSentence(at(lines, 2 * k + 1));
      if (rmc.sentenceId !== "RMC" || gga.sentenceId !== "GGA") throw new Error("wrong sentence order");
      const j = at(fixes, k);
      expect(rmc.latitude).toBeCloseTo(at(lat, j), 6);
      expect(rmc.longitude).toBeCloseTo(at(lon, j), 6);
      expect(gga.latitude).toBeCloseTo(at(lat, j), 6);
      expect(rmc.speedKnots).toBeCloseTo((at(spd, j) * 3600) / 1852, 2); // 1 knot = 1852 m/h
      expect(rmc.datetime.getTime() - Date.parse(s.metadata.startedAt)).toBe(Math.round(at(s.timeS, j) * 1000));
      expect(gga.fixType).toBe("fix");
    }
  });

  it("checksum is the XOR of the body (worked example) and a changed body fails to parse", () => {
    // Widely quoted GGA example (gpsd's NMEA notes; quoted from memory), checksum 47.
    expect(nmeaChecksum("GPGGA,123519,4807.038,N,01131.000,E,1,08,0.9,545.4,M,46.9,M,,")).toBe("47");
    const line = at(toNmeaString(s).split("\r\n"), 0);
    expect(() => parseNmeaSentence(line.replace(",A,", ",V,"))).toThrow();
  });
});

describe("determinism", () => {
  const hash = (x: GeneratedSession) => createHash("sha256").update(toCsvString(x)).update(JSON.stringify(x.truth)).digest("hex");

  it("the same seed gives the same file and truth; another seed does not", () => {
    const opts = { seed: 5, flyingLaps: 1, brakeOnStraightLaps: [], revCeilingLap: null, pitOverspeed: null } as const;
    const a = generateSession({ ...opts, brakeOnStraightLaps: [] });
    const b = generateSession({ ...opts, brakeOnStraightLaps: [] });
    const c = generateSession({ ...opts, brakeOnStraightLaps: [], seed: 6 });
    expect(hash(a)).toBe(hash(b));
    expect(hash(a)).not.toBe(hash(c));
  });

  it("the GPS rate does not change the ride: same lap times at 10 and 20 Hz", () => {
    const a = generateSession({ seed: 5, flyingLaps: 1, gpsRateHz: 10 });
    const b = generateSession({ seed: 5, flyingLaps: 1, gpsRateHz: 20 });
    expect(b.truth.laps.map((l) => l.lapTimeMs)).toEqual(a.truth.laps.map((l) => l.lapTimeMs));
    expect(() => generateSession({ seed: 5, flyingLaps: 1, gpsRateHz: 30 })).toThrow(/divide/);
  });
});
