import { Readable } from "node:stream";
import { describe, expect, it } from "vitest";
import { LIMITS, parseCsvStream, parseCsvText, readCsvHeader, suggestMapping, type IngestProgress, type Mapping } from "@/lib/ingest";
import { ingestErrorOf } from "./import-file";
import { at } from "../../fixtures/at";

const mappingFor = (text: string): Mapping => {
  const h = readCsvHeader(text, true);
  return suggestMapping(h.columns, h.sampleRows);
};
/** A stream that hands out `bytes` in pieces of `size` bytes. */
const pieces = (bytes: Buffer, size: number) =>
  Readable.from(
    (function* () {
      for (let i = 0; i < bytes.length; i += size) yield bytes.subarray(i, i + size);
    })(),
  );

describe("parseCsvStream", () => {
  const text =
    "# rider: Rémi Test (invented) — ünïcödé\r\n# bike: Bike 1\nTime [s];Front wheel speed [km/h];Front brake [bar]\r\n" +
    Array.from({ length: 300 }, (_, i) => `${(i / 100).toFixed(2).replace(".", ",")};${36 + (i % 7)};${i % 3 === 0 ? "" : "1,5"}${i % 2 ? "\r\n" : "\n"}`).join("");

  it("gives the same result whatever the chunk boundaries (split characters, split CR LF)", async () => {
    const bytes = Buffer.from(text, "utf8");
    const reference = await parseCsvText(bytes, mappingFor(text));
    expect(reference.rows).toBe(300);
    expect(reference.metadata.rider).toBe("Rémi Test (invented) — ünïcödé");
    for (const size of [1, 2, 3, 7, 13, 64, 4096]) {
      const s = await parseCsvStream(pieces(bytes, size), mappingFor(text));
      expect(s.rows, `chunk ${size}`).toBe(300);
      expect([...s.timeS]).toEqual([...reference.timeS]);
      expect(s.channels.map((c) => [...c.values])).toEqual(reference.channels.map((c) => [...c.values]));
      expect(s.metadata).toEqual(reference.metadata);
    }
  });

  it("reports progress with growing byte counts, ending at the file size", async () => {
    const bytes = Buffer.from(text, "utf8");
    const seen: IngestProgress[] = [];
    await parseCsvStream(pieces(bytes, 512), mappingFor(text), LIMITS, (p) => seen.push({ ...p }));
    expect(seen.length).toBeGreaterThan(1);
    for (let i = 1; i < seen.length; i++) expect(at(seen, i).bytesRead).toBeGreaterThanOrEqual(at(seen, i - 1).bytesRead);
    expect(seen.at(-1)).toEqual({ bytesRead: bytes.length, rows: 300 });
  });

  it("applies the mapping's scale and offset before the unit conversion", async () => {
    // A fork potentiometer logged in volts: 0 V = 0 mm, 5 V = 150 mm → scale 30 mm/V.
    const csv = "Time [s],Fork pot [V]\n0,0\n0.1,2.5\n0.2,5\n";
    const m = mappingFor(csv);
    m.columns[1] = { ...at(m.columns, 1), role: "fork_travel", unit: "mm", scale: 30, offset: 0 };
    const s = await parseCsvText(csv, m);
    expect([...at(s.channels, 0).values]).toEqual([0, 0.075, 0.15].map(Math.fround));
  });

  it("min, max and sampleCount skip empty cells; a channel with no samples has NaN min/max", async () => {
    const csv = "Time [s],Throttle [%],Gear\n0,,\n0.1,40,\n0.2,,\n0.3,-2,\n";
    const s = await parseCsvText(csv, mappingFor(csv));
    expect(s.channels[0]).toMatchObject({ sampleCount: 2, min: -2, max: 40 });
    expect(at(s.channels, 1).sampleCount).toBe(0);
    expect(at(s.channels, 1).min).toBeNaN();
  });

  it("grows its arrays past the initial capacity and trims them to the row count", async () => {
    const rows = 10_000;
    const csv = "Time [ms],Throttle [%]\n" + Array.from({ length: rows }, (_, i) => `${i * 10},${i % 101}\n`).join("");
    const s = await parseCsvText(csv, mappingFor(csv));
    expect(s.rows).toBe(rows);
    expect(s.timeS.length).toBe(rows);
    expect(s.timeS.buffer.byteLength).toBe(rows * 8);
    expect(s.timeS[rows - 1]).toBeCloseTo((rows - 1) / 100, 9);
    expect(at(s.channels, 0).values.length).toBe(rows);
  });

  it("a Latin-1 byte after the first 64 KiB is found while streaming, with its byte offset and line", async () => {
    const head = "Time [s],Throttle [%]\n";
    const body = Array.from({ length: 20000 }, (_, i) => `${i},50\n`).join("");
    const bytes = Buffer.concat([Buffer.from(head + body), Buffer.from("20000,5"), Buffer.from([0xb0]), Buffer.from("\n")]);
    expect(bytes.length).toBeGreaterThan(65536);
    const err = await ingestErrorOf(parseCsvStream(pieces(bytes, 4096), mappingFor(head + "0,1\n")));
    expect(err.code).toBe("NOT_UTF8");
    expect(err.byteOffset).toBe(bytes.length - 2);
    expect(err.line).toBe(20002);
    expect(err.message).toMatch(/byte 0xB0 at byte offset \d+ \(line 20002\)/);
  });

  it("a zero byte deep in the file → BINARY_FILE with its line", async () => {
    const head = "Time [s],Throttle [%]\n";
    const body = Array.from({ length: 9000 }, (_, i) => `${i},50\n`).join("");
    const bytes = Buffer.concat([Buffer.from(head + body), Buffer.from([0x00]), Buffer.from("\n")]);
    const err = await ingestErrorOf(parseCsvStream(pieces(bytes, 65536), mappingFor(head + "0,1\n")));
    expect(err.code).toBe("BINARY_FILE");
    expect(err.line).toBe(9002);
  });

  it("two columns mapped to one role is refused", async () => {
    const csv = "Time [s],A [bar],B [bar]\n0,1,2\n";
    const m = mappingFor(csv);
    m.columns[1] = { ...at(m.columns, 1), role: "brake_front" };
    m.columns[2] = { ...at(m.columns, 2), role: "brake_front" };
    const err = await ingestErrorOf(parseCsvText(csv, m));
    expect(err.code).toBe("MAPPING_MISMATCH");
    expect(err.message).toMatch(/'A' and 'B' are both mapped to brake front/);
  });

  it("'ignore' leaves a column out", async () => {
    const csv = "Time [s],Throttle [%],Junk\n0,1,x\n0.1,2,y\n";
    const m = mappingFor(csv);
    m.columns[2] = { ...at(m.columns, 2), role: "ignore" };
    const s = await parseCsvText(csv, m);
    expect(s.channels.map((c) => c.name)).toEqual(["Throttle"]);
  });
});

describe("real-world CSV quirks", () => {
  it("a 1 kHz export with times rounded to 1 ms repeats stamps: refused by default, first of each kept on request and counted", async () => {
    // Invented: 1 kHz samples whose times were rounded to whole ms, so every 5th row repeats a stamp.
    const rows: string[] = [];
    let t = 0;
    for (let i = 0; i < 100; i++) {
      rows.push(`${t},${i}`);
      if (i % 5 !== 4) t++;
    }
    const text = `Time [ms],Throttle [%]\n${rows.join("\n")}\n`;
    const refused = await ingestErrorOf(parseCsvText(Buffer.from(text), mappingFor(text)));
    expect(refused.code).toBe("DUPLICATE_TIME");
    expect(refused.message).toMatch(/keeping the first row of each time stamp/);
    // The refusal counts every repeat (the same 19 the kept import drops), not only the first.
    expect(refused.message).toMatch(/19 rows repeat the time stamp of the row before/);
    expect(refused.duplicateRows).toBe(19);
    const kept = await parseCsvText(Buffer.from(text), { ...mappingFor(text), duplicateTimes: "keepFirst" });
    // 100 rows, 20 repeats (i = 4, 9, …, 99 leave t unchanged for the next row; the last has none after it): 19 dropped.
    expect(kept.rows).toBe(81);
    expect(kept.notes?.join(" ")).toMatch(/^19 rows repeating the time stamp/);
    // The first row of each stamp is kept: throttle at t = 4 ms is row i = 4, not i = 5.
    const th = kept.channels.find((c) => c.role === "throttle")!.values;
    expect(th[4]).toBe(4);
    expect(th[5]).toBe(6);
  });

  it("NA is an empty cell; a text column left as other is left out with a note", async () => {
    const text = 'Time [s],Throttle [%],source,Note\n0,NA,"gps",1\n0.1,10,"obd",NA\n0.2,NA,"gps",2\n';
    const m = mappingFor(text);
    const p = await parseCsvText(Buffer.from(text), m);
    const th = p.channels.find((c) => c.role === "throttle")!;
    expect([...th.values].map((v) => (Number.isNaN(v) ? null : v))).toEqual([null, 10, null]);
    expect(p.channels.map((c) => c.name)).not.toContain("source");
    expect(p.notes?.join(" ")).toMatch(/'source' \(e\.g\. 'gps'\)/);
    expect(p.notes?.join(" ")).toMatch(/3 cells written NA were read as empty/);
  });
});
