import { describe, expect, it } from "vitest";
import { sniffFormat } from "@/lib/ingest";

const b = (s: string) => Buffer.from(s, "utf8");

describe("sniffFormat", () => {
  it.each([
    ["plain CSV", b("Time [s],Throttle [%]\n0,1\n"), "csv"],
    ["CSV with UTF-8 BOM", Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), b("Time [s];Throttle [%]\n")]), "csv"],
    ["GPX", b('<?xml version="1.0"?>\n<gpx version="1.1">'), "gpx"],
    ["GPX without declaration", b('  <gpx version="1.1" creator="x">'), "gpx"],
    ["NMEA GP", b("$GPRMC,100000.00,A,4807.038,N,01131.000,E,10.0,84.4,010524,,,A*6A\r\n"), "nmea"],
    ["NMEA GN", b("$GNGGA,100000.00,4807.038,N,01131.000,E,1,08,0.9,545.4,M,46.9,M,,*47\r\n"), "nmea"],
  ] as const)("%s → %s", (_what, bytes, format) => {
    expect(sniffFormat(bytes, "x").format).toBe(format);
  });

  it("reports the BOM", () => {
    expect(sniffFormat(Buffer.from([0xef, 0xbb, 0xbf, 0x61, 0x2c, 0x62]), "x.csv")).toEqual({ format: "csv", hasBom: true });
  });

  it("a multi-byte character cut by the end of the sniffed bytes is not an error, unless it is the whole file", () => {
    const cut = Buffer.concat([b("Name,Rémi"), Buffer.from([0xc3])]);
    expect(sniffFormat(cut, "x.csv").format).toBe("csv");
    const whole = sniffFormat(cut, "x.csv", true);
    expect(whole.format).toBe("rejected");
  });

  it.each([
    ["overlong encoding", [0x41, 0xc0, 0xaf], 1],
    ["UTF-16 surrogate encoded in UTF-8", [0x41, 0x42, 0xed, 0xa0, 0x80], 2],
    ["above U+10FFFF", [0xf4, 0x90, 0x80, 0x80], 0],
    ["lone continuation byte", [0x41, 0x80], 1],
  ])("invalid UTF-8 (%s, RFC 3629) is rejected at byte offset %#", (_what, bytes, offset) => {
    const r = sniffFormat(Buffer.from(bytes as number[]), "x.csv", true);
    expect(r).toMatchObject({ format: "rejected", code: "NOT_UTF8", byteOffset: offset });
  });

  it("names the file's extension for a renamed archive", () => {
    const r = sniffFormat(Buffer.from([0x1f, 0x8b, 0x08, 0x00]), "session.txt");
    expect(r).toMatchObject({ format: "rejected", code: "COMPRESSED_ARCHIVE" });
    expect(r.format === "rejected" && r.reason).toMatch(/gzip-compressed archive renamed \.txt/);
  });
});
