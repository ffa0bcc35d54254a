import { describe, expect, it } from "vitest";
import { parseNmea } from "@/lib/ingest/parse-nmea";
import { parseGpx } from "@/lib/ingest/parse-gpx";
import { IngestError } from "@/lib/ingest/ingest-error";
import { poorFixReason } from "@/lib/ingest/fix-quality";

/**
 * Poor GPS fixes dropped by satellite count and HDOP. Sentences are built here with the NMEA 0183
 * checksum (XOR of every character between '$' and '*', two hex digits — NMEA 0183 §5.2.1) and the
 * GGA field order of NMEA 0183 (time, lat, N/S, lon, E/W, quality, satellites, HDOP, altitude, M, …);
 * GPX <sat>/<hdop> are GPX 1.1 wptType elements (topografix.com/GPX/1/1).
 * Limits: 4 satellites (a fix solves four unknowns, textbook principle from memory); HDOP 5 (Lapbench default).
 */
function sentence(body: string): string {
  let x = 0;
  for (let i = 0; i < body.length; i++) x ^= body.charCodeAt(i);
  return `$${body}*${x.toString(16).toUpperCase().padStart(2, "0")}`;
}

/** One epoch at 12:00:ss on 2031-05-17: RMC valid, GGA with `quality`, `sats` and `hdop`. */
function epoch(ss: number, sats: string, hdop: string, quality = "1"): string[] {
  const t = `1200${String(ss).padStart(2, "0")}.00`;
  const lat = `4807.${String(38 + ss).padStart(3, "0")}`;
  return [
    sentence(`GPRMC,${t},A,${lat},N,01131.000,E,022.4,084.4,170531,,,A`),
    sentence(`GPGGA,${t},${lat},N,01131.000,E,${quality},${sats},${hdop},545.4,M,46.9,M,,`),
  ];
}

describe("poorFixReason", () => {
  it("3 satellites is too few, 4 is enough; HDOP 5 passes, 5.1 does not; a missing field is no reason", () => {
    expect(poorFixReason(3, 1)).toBe("satellites");
    expect(poorFixReason(4, 1)).toBeNull();
    expect(poorFixReason(9, 5)).toBeNull();
    expect(poorFixReason(9, 5.1)).toBe("hdop");
    expect(poorFixReason(undefined, undefined)).toBeNull();
    expect(poorFixReason(NaN, NaN)).toBeNull();
  });
});

describe("NMEA: fixes with too few satellites, too high an HDOP or a dead-reckoned GGA are dropped and counted", () => {
  const lines = [
    ...epoch(0, "08", "0.9"),
    ...epoch(1, "03", "2.0"), // too few satellites
    ...epoch(2, "09", "8.3"), // HDOP too high
    ...epoch(3, "00", "50.0", "6"), // dead reckoning: RMC says A, GGA says not a satellite fix
    ...epoch(4, "07", ""), // no HDOP given: kept
    ...epoch(5, "10", "1.1"),
  ];

  it("keeps 3 of 6 epochs and says why the others went", async () => {
    const s = await parseNmea(lines.join("\r\n") + "\r\n", { fileName: "poor.nmea" });
    expect(s.rows).toBe(3);
    expect(Array.from(s.timeS)).toEqual([0, 4, 5]);
    expect(s.metadata.nmea_poor_fixes_dropped).toBe("3");
    expect(s.notes).toContain("3 poor GPS fixes dropped: 1 with fewer than 4 satellites, 1 with HDOP above 5, 1 marked by GGA as dead reckoning or no satellite fix (satellite minimum: a full fix needs four; HDOP limit: Lapbench default).");
  });

  it("a log whose every fix is poor is refused with the counts, not read as a track", async () => {
    const bad = [...epoch(0, "03", "4.1"), ...epoch(1, "03", "4.1")];
    const e = await parseNmea(bad.join("\n"), { fileName: "three-sats.nmea" }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(IngestError);
    expect((e as IngestError).code).toBe("NMEA_NO_FIX");
    expect((e as IngestError).message).toBe('"three-sats.nmea" has no GPS fix good enough to use: all 2 fixes are poor (2 with fewer than 4 satellites); at least 4 satellites and HDOP at most 5 are needed.');
  });

  it("RMC without any GGA has no satellite count: every fix is kept", async () => {
    const rmcOnly = lines.filter((l) => l.startsWith("$GPRMC"));
    const s = await parseNmea(rmcOnly.join("\n"), { fileName: "rmc.nmea" });
    expect(s.rows).toBe(6);
    expect(s.metadata.nmea_poor_fixes_dropped).toBeUndefined();
  });
});

describe("GPX: <sat> and <hdop> drop poor track points", () => {
  const pt = (i: number, extra: string) => `<trkpt lat="48.1${i}" lon="11.5${i}"><ele>500</ele><time>2031-05-17T12:00:0${i}Z</time>${extra}</trkpt>`;
  const gpx = (pts: string[]) => `<?xml version="1.0"?><gpx version="1.1" creator="test" xmlns="http://www.topografix.com/GPX/1/1"><trk><trkseg>${pts.join("")}</trkseg></trk></gpx>`;

  it("drops a 3-satellite point and an HDOP-7 point, keeps the rest with the note", () => {
    const s = parseGpx(gpx([pt(0, "<sat>9</sat><hdop>0.8</hdop>"), pt(1, "<sat>3</sat>"), pt(2, "<hdop>7</hdop>"), pt(3, ""), pt(4, "<sat>12</sat><hdop>1.0</hdop>")]), { fileName: "q.gpx" });
    expect(s.rows).toBe(3);
    expect(Array.from(s.timeS)).toEqual([0, 3, 4]);
    expect(s.notes).toEqual(["2 poor GPS fixes dropped: 1 with fewer than 4 satellites, 1 with HDOP above 5 (satellite minimum: a full fix needs four; HDOP limit: Lapbench default)."]);
  });

  it("all points poor: refused with the count", () => {
    expect(() => parseGpx(gpx([pt(0, "<sat>2</sat>"), pt(1, "<hdop>12</hdop>")]), { fileName: "poor.gpx" })).toThrow(
      '"poor.gpx" has no GPS fix good enough to use: all 2 fixes are poor (1 with fewer than 4 satellites, 1 with HDOP above 5); at least 4 satellites and HDOP at most 5 are needed.',
    );
  });
});
