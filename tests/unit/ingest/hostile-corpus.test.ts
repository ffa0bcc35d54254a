import { readdirSync } from "node:fs";
import { join } from "node:path";
import { Readable } from "node:stream";
import { describe, expect, it } from "vitest";
import { LIMITS, parseCsvStream, parseCsvText, type Mapping } from "@/lib/ingest";
import { importFile, ingestErrorOf } from "./import-file";
import { CORPUS } from "../../fixtures/hostile-corpus";

const DIR = join(__dirname, "../../fixtures/hostile");

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
