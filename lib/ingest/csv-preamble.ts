/**
 * The preamble reader of a streamed CSV: the decoded text up to the header and the first sample
 * rows, the header read from it, and each mapped column's plan (role, SI unit, conversion).
 */
import { readCsvHeader, type CsvHeader } from "./csv-header";
import { IngestError, quoteForMessage } from "./ingest-error";
import type { IngestLimits } from "./limits";
import type { Mapping, MappedColumn } from "./mapping";
import { parseNumberCell } from "./parse-number-cell";
import type { ParsedChannel } from "./parsed-series";
import { normaliseName } from "./suggest-mapping";
import { unitConversion } from "./units";

/** Collect decoded text until the preamble (metadata, header, sample rows) is surely inside. */
const PREAMBLE_LINES = 240;
const PREAMBLE_MAX_CHARS = 4 * 1024 * 1024;

export interface ChannelPlan {
  column: MappedColumn;
  header: string;
  role: ParsedChannel["role"];
  unit: string;
  /** si = raw × factor + offset (calibration and unit conversion folded together). */
  factor: number;
  offset: number;
}

export interface ColumnPlan {
  timeColumn: MappedColumn;
  channels: ChannelPlan[];
  textColumns: { name: string; example: string }[];
}

export interface CsvPreamble {
  header: CsvHeader;
  plan: ColumnPlan;
  /** Decoded text after the header (the first data rows), not yet parsed. */
  rest: string;
}

/**
 * Read decoded text from `decoded` until the preamble is inside, then read the header and plan the
 * mapped columns. On any refusal the decoder is closed before the error is thrown.
 */
export async function readCsvPreamble(
  decoded: AsyncGenerator<string>,
  mapping: Mapping,
  limits: IngestLimits,
  fileName: string,
  bytesRead: () => number,
): Promise<CsvPreamble> {
  let preamble = "";
  let lfCount = 0;
  let ended = false;
  for (;;) {
    const next = await decoded.next();
    if (next.done) {
      ended = true;
      break;
    }
    preamble += next.value;
    lfCount += countLf(next.value);
    if (lfCount >= PREAMBLE_LINES || preamble.length >= PREAMBLE_MAX_CHARS) break;
  }
  if (ended && preamble.trim() === "") {
    await decoded.return(undefined);
    throw new IngestError("EMPTY_FILE", `"${fileName}" has no text${bytesRead() > 0 ? " (only blank lines or a byte-order mark)" : " (0 bytes)"}.`);
  }
  try {
    const header = readCsvHeader(preamble, ended, limits);
    const plan = planColumns(header, mapping);
    return { header, plan, rest: preamble.slice(header.dataStartOffset) };
  } catch (e) {
    await decoded.return(undefined);
    throw e;
  }
}

/** Check the mapping against this file's header and work out each column's conversion to SI. */
export function planColumns(header: CsvHeader, mapping: Mapping): ColumnPlan {
  const byIndex = new Map(header.columns.map((c) => [c.index, c]));
  for (const m of mapping.columns) {
    const col = byIndex.get(m.index);
    if (!col || normaliseName(col.name) !== normaliseName(m.name)) {
      const found = col ? `is ${quoteForMessage(col.name)}` : "does not exist";
      throw new IngestError(
        "MAPPING_MISMATCH",
        `The column mapping does not fit this file: column ${m.index + 1} ${found} here but ${quoteForMessage(m.name)} in the mapping. Map the columns of this file again.`,
        { column: m.name },
      );
    }
  }
  const times = mapping.columns.filter((c) => c.role === "time");
  if (times.length === 0) {
    throw new IngestError("NO_TIME_COLUMN", `No column is mapped to time; Lapbench needs a time column (seconds, milliseconds or ISO 8601). Columns: ${header.columns.map((c) => quoteForMessage(c.header)).join(", ")}.`);
  }
  if (times.length > 1) {
    throw new IngestError("MAPPING_MISMATCH", `More than one column is mapped to time: ${times.map((c) => quoteForMessage(c.name)).join(", ")}; choose one.`);
  }
  const seenRoles = new Map<string, string>();
  const channels: ChannelPlan[] = [];
  const textColumns: { name: string; example: string }[] = [];
  for (const m of mapping.columns) {
    if (m.role === "time" || m.role === "ignore") continue;
    if (m.role === "other") {
      // A column left as "other" whose first rows hold text (a source name, a local date-time)
      // is not a channel: it is left out, with a note, instead of refusing the file.
      const text = header.sampleRows.map((r) => (r[m.index] ?? "").trim()).find((c) => c !== "" && c !== "NA" && parseNumberCell(c, header.decimalComma) === undefined);
      if (text !== undefined) {
        textColumns.push({ name: m.name, example: text });
        continue;
      }
    }
    if (m.role !== "other") {
      const before = seenRoles.get(m.role);
      if (before !== undefined) {
        throw new IngestError("MAPPING_MISMATCH", `Columns ${quoteForMessage(before)} and ${quoteForMessage(m.name)} are both mapped to ${m.role.replace(/_/g, " ")}; a role can be used once.`);
      }
      seenRoles.set(m.role, m.name);
    }
    const col = byIndex.get(m.index)!;
    const conv = unitConversion(m.role, m.unit, col.header);
    const scale = Number.isFinite(m.scale) ? m.scale : 1;
    const off = Number.isFinite(m.offset) ? m.offset : 0;
    channels.push({ column: m, header: col.header, role: m.role, unit: conv.siUnit, factor: scale * conv.factor, offset: off * conv.factor + conv.offset });
  }
  if (channels.length === 0) {
    throw new IngestError("ONLY_TIME_COLUMN", `The file has only a time column (${quoteForMessage(times[0].name)}) and no data channels to import.`);
  }
  return { timeColumn: times[0], channels, textColumns };
}

export function countLf(s: string): number {
  let n = 0;
  for (let i = s.indexOf("\n"); i >= 0; i = s.indexOf("\n", i + 1)) n++;
  return n;
}
