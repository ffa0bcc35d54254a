/**
 * Reading a CSV in ranges on worker threads gives exactly what the single-thread reader gives:
 * the same samples bit for bit (time, every channel, counts, min, max), metadata and notes — or,
 * for bad input, the same refusal with the same message. The reference is the single-thread path
 * of the same code, run in the same test; ranges as small as 64 characters put range boundaries
 * on every kind of row (repeated time stamps, short rows, text cells, quotes, blank lines).
 */
import { createHash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { Readable } from "node:stream";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { IngestError, LIMITS, parseCsvStream, readCsvHeader, suggestMapping, type IngestLimits, type Mapping, type ParsedSeries } from "@/lib/ingest";
import { createCsvThreadPool, type CsvThreadPool } from "@/workers/ingest/csv-thread-pool";

const SAMPLES = join(__dirname, "../../../sample-logs/files");
const HOSTILE = join(__dirname, "../../fixtures/hostile");

let pool: CsvThreadPool;
beforeAll(() => {
  pool = createCsvThreadPool(2);
});
afterAll(async () => {
  await pool?.close();
});

const bitsOf = (a: ArrayBufferView) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

/** Everything a parse returns, hashed bit for bit (NaN payloads, −0 included). */
function digest(s: ParsedSeries): string {
  const h = createHash("sha256");
  h.update(bitsOf(s.timeS));
  for (const c of s.channels) {
    h.update(JSON.stringify([c.name, c.role, c.unit, c.sampleCount, c.values.length]));
    h.update(bitsOf(new Float64Array([c.min, c.max])));
    h.update(bitsOf(c.values));
  }
  h.update(JSON.stringify([s.rows, s.metadata, s.notes ?? null]));
  return h.digest("hex");
}

const pieces = (bytes: Buffer, size: number) =>
  Readable.from(
    (function* () {
      for (let i = 0; i < bytes.length; i += size) yield bytes.subarray(i, i + size);
    })(),
  );

async function outcome(bytes: Buffer, mapping: Mapping, chunkChars?: number, limits: IngestLimits = LIMITS): Promise<string> {
  try {
    const s = await parseCsvStream(pieces(bytes, 4096), mapping, limits, undefined, { fileName: "t.csv", ...(chunkChars ? { threads: pool, chunkChars } : {}) });
    return `rows ${s.rows} ${digest(s)}`;
  } catch (e) {
    if (e instanceof IngestError) return `${e.code}: ${e.message} ${JSON.stringify([e.line, e.column, e.byteOffset, e.duplicateRows])}`;
    throw e;
  }
}

function mappingOf(text: string, extra: Partial<Mapping> = {}): Mapping {
  const h = readCsvHeader(text.slice(0, 65536), text.length <= 65536);
  return { ...suggestMapping(h.columns, h.sampleRows), ...extra };
}

/** Thread results for several range sizes, each equal to the single-thread result; returns that. */
async function expectSame(text: string | Buffer, mapping: Mapping, limits: IngestLimits = LIMITS, sizes = [64, 257, 4000, 1 << 20]): Promise<string> {
  const bytes = typeof text === "string" ? Buffer.from(text, "utf8") : text;
  const single = await outcome(bytes, mapping, undefined, limits);
  for (const chunkChars of sizes) {
    expect(await outcome(bytes, mapping, chunkChars, limits), `ranges of ${chunkChars} characters`).toBe(single);
  }
  return single;
}

/** An invented 100 Hz export; `edit(i, cells)` changes row i's cells (time, speed, brake, note). */
function exportCsv(rows: number, edit: (i: number, cells: string[]) => string[] | null = (_, c) => c, header = "Time [s],Front wheel speed [km/h],Front brake [bar],Note"): string {
  const lines = ["# logger: test unit (invented)", header];
  for (let i = 0; i < rows; i++) {
    const cells = edit(i, [(i / 100).toFixed(2), (100 + 50 * Math.sin(i / 100)).toFixed(3), i % 300 < 40 ? "8.5" : i % 7 === 0 ? "" : "0", i % 11 === 0 ? "NA" : String(i % 5)]);
    if (cells) lines.push(cells.join(","));
  }
  return lines.join("\n") + "\n";
}

describe("CSV ranges on worker threads = the single-thread reader", () => {
  it.each(["three-laps-20hz.csv", "three-laps-10hz.csv", "demo-session-10min-rider-b.csv"])("sample log %s: same samples bit for bit", async (file) => {
    const bytes = readFileSync(join(SAMPLES, file));
    const single = await expectSame(bytes, mappingOf(bytes.subarray(0, 65536).toString("utf8")), LIMITS, [5000, 100_000, 1 << 20]);
    expect(single).toMatch(/^rows [1-9]\d{3,} /);
  }, 120_000);

  it("every hostile CSV: the same result or the same refusal, word for word", async () => {
    const files = readdirSync(HOSTILE).filter((f) => f.endsWith(".csv"));
    expect(files.length).toBeGreaterThanOrEqual(20);
    const anyMapping: Mapping = { timeFormat: "seconds", columns: [{ index: 0, name: "Time", role: "time", unit: "s", scale: 1, offset: 0 }] };
    let refused = 0;
    for (const f of files) {
      const bytes = readFileSync(join(HOSTILE, f));
      let mapping = anyMapping;
      try {
        mapping = mappingOf(bytes.subarray(0, 65536).toString("utf8"));
      } catch {
        // a header the reader refuses: parseCsvStream refuses it again, the same way on both paths
      }
      if (!(await expectSame(bytes, mapping)).startsWith("rows")) refused++;
    }
    expect(refused).toBeGreaterThanOrEqual(15);
  }, 60_000);

  it("NA cells, empty cells and text in a column left as other", async () => {
    const text = exportCsv(3000, (i, c) => (i > 400 && i % 97 === 13 ? [c[0], c[1], c[2], "pit"] : c));
    const mapping = mappingOf(text);
    const single = await expectSame(text, mapping);
    expect(single).toMatch(/^rows 3000 /);
    // The notes were made (else the comparison would not cover them).
    const s = await parseCsvStream(pieces(Buffer.from(text), 999), mapping, LIMITS, undefined, { threads: pool, chunkChars: 64 });
    expect(s.notes?.join(" ")).toMatch(/cells of text \(e\.g\. 'pit'\) left out/);
    expect(s.notes?.join(" ")).toMatch(/cells written NA were read as empty/);
  });

  it("repeated time stamps: kept first, and refused with the same count and line", async () => {
    const text = exportCsv(3000, (i, c) => (i % 10 === 3 ? [((i - 1) / 100).toFixed(2), ...c.slice(1)] : c));
    expect(await expectSame(text, mappingOf(text, { duplicateTimes: "keepFirst" }))).toMatch(/^rows 2700 /);
    expect(await expectSame(text, mappingOf(text))).toMatch(/^DUPLICATE_TIME: Line 6, .*300 rows repeat/);
  });

  it("time going backwards late in the file", async () => {
    const text = exportCsv(3000, (i, c) => (i === 2400 ? ["23.50", ...c.slice(1)] : c));
    expect(await expectSame(text, mappingOf(text))).toMatch(/^TIME_BACKWARDS: Line 2403,/);
  });

  it("a bad cell, a ragged row and a cut-off last line", async () => {
    const bad = exportCsv(3000, (i, c) => (i === 2500 ? [c[0], "fast", c[2], c[3]] : c));
    expect(await expectSame(bad, mappingOf(bad))).toMatch(/^NOT_A_NUMBER: Line 2503,/);
    const ragged = exportCsv(3000, (i, c) => (i === 1700 ? c.slice(0, 3) : c));
    expect(await expectSame(ragged, mappingOf(ragged))).toMatch(/^FIELD_COUNT: Line 1703 has 3 fields/);
    const cut = exportCsv(3000).replace(/,[^,\n]*,[^,\n]*\n$/, "\n");
    expect(await expectSame(cut, mappingOf(cut))).toMatch(/^TRUNCATED_LINE: Line 3002 \(the last line\)/);
  });

  it("blank lines, quoted cells from the middle on (read on the main thread from there) and the row limit", async () => {
    const text = exportCsv(3000, (i, c) => (i % 500 === 250 ? [...c.slice(0, 3), c[3] + "\n"] : i >= 1800 && i % 3 === 0 ? [c[0], `"${c[1]}"`, c[2], c[3]] : c));
    expect(await expectSame(text, mappingOf(text))).toMatch(/^rows 3000 /);
    // Row 2000 (0-based) is on line 3 + 2000 + the 4 blank lines before it.
    expect(await expectSame(text, mappingOf(text), { ...LIMITS, maxRows: 2000 })).toMatch(/^TOO_MANY_ROWS: Line 2007: more than 2,000 rows/);
  });

  it("bytes refused late in the file (bad UTF-8, a zero byte, an over-long line), past the first 64 kB the decoder holds back", async () => {
    const text = exportCsv(20_000);
    const at = text.indexOf("\n", Math.floor(text.length * 0.8)) + 3;
    const badUtf8 = Buffer.concat([Buffer.from(text.slice(0, at)), Buffer.from([0xe9]), Buffer.from(text.slice(at))]);
    expect(await expectSame(badUtf8, mappingOf(text))).toMatch(/^NOT_UTF8: .*\(line 16\d{3}\)/);
    const nul = Buffer.concat([Buffer.from(text.slice(0, at)), Buffer.from([0]), Buffer.from(text.slice(at))]);
    expect(await expectSame(nul, mappingOf(text))).toMatch(/^BINARY_FILE: /);
    // A bad cell long before the unreadable bytes is what both paths name.
    const both = exportCsv(20_000, (i, c) => (i === 2000 ? [c[0], "fast", c[2], c[3]] : c));
    const bothBytes = Buffer.concat([Buffer.from(both.slice(0, at)), Buffer.from([0xe9]), Buffer.from(both.slice(at))]);
    expect(await expectSame(bothBytes, mappingOf(both))).toMatch(/^NOT_A_NUMBER: Line 2003,/);
    const long = exportCsv(20_000, (i, c) => (i === 17_000 ? [c[0], c[1], c[2], "9".repeat(2000)] : c));
    expect(await expectSame(long, mappingOf(long), { ...LIMITS, maxLineBytes: 1000 })).toMatch(/^LINE_TOO_LONG: /);
  }, 60_000);

  it("ISO 8601 date-time stamps", async () => {
    const text = exportCsv(2000, (i, c) => [new Date(Date.UTC(2026, 4, 1, 10) + i * 10).toISOString(), ...c.slice(1)], "Time,Front wheel speed [km/h],Front brake [bar],Note");
    const mapping = mappingOf(text);
    expect(mapping.timeFormat).toBe("iso8601");
    expect(await expectSame(text, mapping)).toMatch(/^rows 2000 /);
  });
});
