import { createReadStream, readFileSync } from "node:fs";
import { basename } from "node:path";
import {
  IngestError,
  LIMITS,
  parseCsvStream,
  parseGpx,
  parseNmea,
  readCsvHeader,
  sniffFormat,
  SNIFF_BYTES,
  suggestMapping,
  type IngestLimits,
  type ParsedSeries,
} from "@/lib/ingest";

/**
 * The import path a worker takes, for tests: sniff the first bytes, then for CSV read the header,
 * take the suggested mapping and stream the file; GPX and NMEA go to their parsers.
 */
export async function importFile(path: string, limits: IngestLimits = LIMITS): Promise<ParsedSeries> {
  const bytes = readFileSync(path);
  const name = basename(path);
  const first = bytes.subarray(0, SNIFF_BYTES);
  const sniff = sniffFormat(first, name, bytes.length <= SNIFF_BYTES);
  if (sniff.format === "rejected") throw new IngestError(sniff.code, sniff.reason, { byteOffset: sniff.byteOffset, line: sniff.line });
  if (sniff.format === "gpx") return parseGpx(bytes, { fileName: name, limits });
  if (sniff.format === "nmea") return parseNmea(createReadStream(path), { fileName: name, limits });
  const header = readCsvHeader(first.toString("utf8"), bytes.length <= SNIFF_BYTES, limits);
  const mapping = suggestMapping(header.columns, header.sampleRows);
  return parseCsvStream(createReadStream(path, { highWaterMark: 16 * 1024 }), mapping, limits, undefined, { fileName: name });
}

/** The IngestError a promise rejects with (fails the test if it resolves or throws something else). */
export async function ingestErrorOf(p: Promise<unknown> | (() => unknown)): Promise<IngestError> {
  try {
    await (typeof p === "function" ? p() : p);
  } catch (e) {
    if (e instanceof IngestError) return e;
    throw new Error(`expected an IngestError, got ${String(e)}`);
  }
  throw new Error("expected an IngestError, but the import succeeded");
}
