import { readdirSync } from "node:fs";
import { join } from "node:path";
import { Readable } from "node:stream";
import { describe, expect, it } from "vitest";
import { LIMITS, parseCsvStream, parseCsvText, type IngestErrorCode, type Mapping } from "@/lib/ingest";
import { importFile, ingestErrorOf } from "./import-file";

const DIR = join(__dirname, "../../fixtures/hostile");

/** file → expected error code and what the message must say (line / column / offset where they apply). */
const CORPUS: [file: string, code: IngestErrorCode, message: RegExp][] = [
  ["empty.csv", "EMPTY_FILE", /empty \(0 bytes\)/],
  ["header-only.csv", "HEADER_ONLY", /header \(line 4\) but no data lines/],
  ["binary.csv", "BINARY_FILE", /binary file.*zero byte at byte offset 8 \(line 3\)/],
  ["pipe-delimiter.csv", "WRONG_DELIMITER", /Line 1 \(the header\) splits into only one column.*'\|'.*Accepted delimiters: comma, semicolon, tab/],
  ["non-numeric-cell.csv", "NOT_A_NUMBER", /^Line 5, column 'Front brake \[bar\]': expected a number \(e\.g\. 12\.5\), found 'abc'/],
  ["nan-cell.csv", "NON_FINITE_NUMBER", /^Line 4, column 'Front wheel speed \[km\/h\]': expected a number, found 'NaN'; leave the cell empty/],
  ["infinity-cell.csv", "NON_FINITE_NUMBER", /^Line 6, column 'Front brake \[bar\]': expected a number, found 'Infinity'/],
  ["time-backwards.csv", "TIME_BACKWARDS", /^Line 5, column 'Time \[s\]': time goes backwards, '0\.08' after '0\.10' on line 4/],
  ["duplicate-time.csv", "DUPLICATE_TIME", /^Line 4, column 'Time \[s\]': the time '0\.05' repeats the one on line 3/],
  ["duplicate-headers.csv", "DUPLICATE_HEADER", /^Line 1, column 4: the header name 'Front brake \[bar\]' appears twice, in columns 2 and 4/],
  ["truncated-last-line.csv", "TRUNCATED_LINE", /^Line 7 \(the last line\) has 2 of 4 fields: the file looks cut off/],
  ["ragged-row.csv", "FIELD_COUNT", /^Line 5 has 3 fields; the header has 4/],
  ["unknown-unit.csv", "UNKNOWN_UNIT", /Column 'Front brake \[furlong\]': unit 'furlong' is not a unit Lapbench knows; for brake front expected one of: bar, .*psi, kPa/],
  ["formula-in-header.csv", "FORMULA_IN_HEADER", /^Line 1, column 2: the header name '=cmd\|' \/C calc'!A0' starts like a spreadsheet formula/],
  ["latin1.csv", "NOT_UTF8", /not UTF-8: byte 0xE9 at byte offset 12 \(line 1\)/],
  ["utf16le-bom.csv", "NOT_UTF8", /UTF-16 little-endian.*not UTF-8/],
  ["utf16le-no-bom.csv", "NOT_UTF8", /UTF-16 text without a byte-order mark/],
  ["gzip-renamed.csv", "COMPRESSED_ARCHIVE", /gzip-compressed archive renamed \.csv/],
  ["zip-renamed.csv", "COMPRESSED_ARCHIVE", /zip archive.* renamed \.csv/],
  ["gpx-broken.gpx", "XML_INVALID", /not well-formed XML: line 6, column \d+: Expected closing tag 'trkpt'/],
  ["gpx-cut-off.gpx", "XML_INVALID", /not well-formed XML: line \d+, column \d+: the file ends before these elements are closed: <gpx>, <trk>, <trkseg>/],
  ["gpx-no-track-points.gpx", "GPX_NO_POINTS", /no track points.*2 route points/],
  ["gpx-point-without-time.gpx", "GPX_BAD_POINT", /^Line 5: track point 2 has no <time>/],
  ["xml-not-gpx.gpx", "GPX_NOT_GPX", /XML but has no <gpx> root element/],
  ["nmea-all-bad-checksums.nmea", "NMEA_ALL_BAD_CHECKSUMS", /All 3 NMEA sentences have a missing or wrong checksum.*first at line 1/],
  ["nmea-no-fix.nmea", "NMEA_NO_FIX", /none of its 4 RMC\/GGA sentences has a valid fix/],
  ["nmea-time-backwards.nmea", "TIME_BACKWARDS", /^Line 4: the fix time 10:00:00\.150 is before the fix on line 3 \(10:00:00\.200\)/],
  ["no-time-column.csv", "NO_TIME_COLUMN", /No column is mapped to time.*'Front wheel speed \[km\/h\]', 'Throttle \[%\]'/],
  ["only-time-column.csv", "ONLY_TIME_COLUMN", /only a time column \('Time'\)/],
  ["iso-time-not-monotonic.csv", "TIME_BACKWARDS", /^Line 4, column 'Time': time goes backwards, '2024-05-01T09:59:59\.900Z' after '2024-05-01T10:00:00\.100Z' on line 3/],
  ["lone-cr-line-endings.csv", "UNSUPPORTED_TEXT", /^Line 1 ends with a lone carriage return/],
  ["empty-header-name.csv", "EMPTY_HEADER_NAME", /^Line 1, column 2 has no name \(next to 'Time \[s\]' and 'Throttle \[%\]'\)/],
  ["no-header-row.csv", "NO_HEADER", /^Line 1 holds numbers, not column names/],
  ["unclosed-quote.csv", "UNCLOSED_QUOTE", /^Line 3: a quoted field is not closed/],
  ["bad-time-text.csv", "BAD_TIME", /^Line 4, column 'Time \[s\]': expected a time in seconds.*found '10:00:01'/],
  ["html-page.csv", "UNSUPPORTED_TEXT", /web page \(HTML\)/],
  ["number-out-of-range.csv", "NUMBER_OUT_OF_RANGE", /^Line 3, column 'Throttle \[%\]': the number '1e400' is out of range/],
  ["hex-number.csv", "NOT_A_NUMBER", /^Line 3, column 'Throttle \[%\]': expected a number \(e\.g\. 12\.5\), found '0x1F'/],
  ["missing-unit.csv", "MISSING_UNIT", /Column 'Front wheel speed' has no unit; for speed front choose one of: km\/h, mph, m\/s, kn/],
];

describe("hostile corpus: every bad file gets a specific error", () => {
  it("has at least 28 files on disk, each in the table", () => {
    const onDisk = readdirSync(DIR).filter((f) => !f.endsWith(".mjs") && !f.endsWith(".md"));
    expect(onDisk.length).toBeGreaterThanOrEqual(28);
    expect(onDisk.sort()).toEqual(CORPUS.map(([f]) => f).sort());
  });

  it.each(CORPUS)("%s → %s", async (file, code, message) => {
    const err = await ingestErrorOf(importFile(join(DIR, file)));
    expect(err.code).toBe(code);
    expect(err.message).toMatch(message);
  });

  // parseCsvStream defends itself too: handed a non-CSV file directly, it refuses it the same way.
  const anyMapping: Mapping = { timeFormat: "seconds", columns: [{ index: 0, name: "Time", role: "time", unit: "s", scale: 1, offset: 0 }] };
  it.each([
    ["binary.csv", "BINARY_FILE"],
    ["gzip-renamed.csv", "COMPRESSED_ARCHIVE"],
    ["zip-renamed.csv", "COMPRESSED_ARCHIVE"],
    ["utf16le-bom.csv", "NOT_UTF8"],
    ["latin1.csv", "NOT_UTF8"],
    ["empty.csv", "EMPTY_FILE"],
  ] as const)("parseCsvStream alone refuses %s with %s", async (file, code) => {
    const { readFileSync } = await import("node:fs");
    const err = await ingestErrorOf(parseCsvText(readFileSync(join(DIR, file)), anyMapping, LIMITS, file));
    expect(err.code).toBe(code);
  });
});

describe("hostile inputs generated on the fly", () => {
  const mapping2: Mapping = {
    timeFormat: "seconds",
    columns: [
      { index: 0, name: "Time", role: "time", unit: "s", scale: 1, offset: 0 },
      { index: 1, name: "Throttle", role: "throttle", unit: "%", scale: 1, offset: 0 },
    ],
  };

  it("10,000 columns → TOO_MANY_COLUMNS naming the count and the limit", async () => {
    const header = ["Time [s]", ...Array.from({ length: 9999 }, (_, i) => `Channel ${i + 1} [V]`)].join(",");
    const row = ["0", ...Array.from({ length: 9999 }, () => "1")].join(",");
    const err = await ingestErrorOf(parseCsvText(`${header}\n${row}\n`, mapping2));
    expect(err.code).toBe("TOO_MANY_COLUMNS");
    expect(err.message).toMatch(/The header \(line 1\) has 10,000 columns; at most 512 are accepted/);
  });

  it("a line over 1 MiB → LINE_TOO_LONG with its line number", async () => {
    const text = `Time [s],Throttle [%]\n0,1\n0.1,${"9".repeat(LIMITS.maxLineBytes + 10)}\n`;
    const err = await ingestErrorOf(parseCsvText(text, mapping2));
    expect(err.code).toBe("LINE_TOO_LONG");
    expect(err.message).toMatch(/^Line 3 is longer than the limit of 1 MiB/);
    expect(err.line).toBe(3);
  });

  it("a file over the size limit → FILE_TOO_LARGE, checked on bytes read from a stream", async () => {
    const limits = { ...LIMITS, maxBytes: 1024 * 1024 };
    let produced = 0;
    // An endless well-formed CSV: the limit, not the end of input, must stop it.
    const endless = Readable.from(
      (function* () {
        yield Buffer.from("Time [s],Throttle [%]\n");
        for (let i = 0; ; i++) {
          const chunk = Buffer.from(Array.from({ length: 1000 }, (_, k) => `${i * 1000 + k},50\n`).join(""));
          produced += chunk.length;
          yield chunk;
        }
      })(),
    );
    const err = await ingestErrorOf(parseCsvStream(endless, mapping2, limits));
    expect(err.code).toBe("FILE_TOO_LARGE");
    expect(err.message).toMatch(/larger than the limit of 1 MiB/);
    expect(produced).toBeLessThan(2 * 1024 * 1024);
  });

  it("more rows than the limit → TOO_MANY_ROWS at the first row over it", async () => {
    const text = "Time [s],Throttle [%]\n" + Array.from({ length: 11 }, (_, i) => `${i},1\n`).join("");
    const err = await ingestErrorOf(parseCsvText(text, mapping2, { ...LIMITS, maxRows: 10 }));
    expect(err.code).toBe("TOO_MANY_ROWS");
    expect(err.message).toMatch(/^Line 12: more than 10 rows/);
  });

  it("a mapping made for another header → MAPPING_MISMATCH", async () => {
    const err = await ingestErrorOf(parseCsvText("Time [s],Rear brake [bar]\n0,1\n", mapping2));
    expect(err.code).toBe("MAPPING_MISMATCH");
    expect(err.message).toMatch(/column 2 is 'Rear brake' here but 'Throttle' in the mapping/);
  });
});
