import { FLOAT64_ROLES, sampleArrayFor, type SampleArray } from "@/lib/channels/roles";
import { Readable } from "node:stream";
import Papa from "papaparse";
import { readCsvHeader, type CsvHeader } from "./csv-header";
import { decodeTextStream, type DecodeProgress } from "./decode-text-stream";
import { ISO_8601_DATE_TIME } from "./detect-time-format";
import { IngestError, quoteForMessage } from "./ingest-error";
import { LIMITS, type IngestLimits } from "./limits";
import type { Mapping, MappedColumn, TimeFormat } from "./mapping";
import { describeBadCell, FLOAT32_MAX, parseNumberCell } from "./parse-number-cell";
import type { IngestProgress, ParsedChannel, ParsedSeries } from "./parsed-series";
import { normaliseName } from "./suggest-mapping";
import { unitConversion } from "./units";

/** Collect decoded text until the preamble (metadata, header, sample rows) is surely inside. */
const PREAMBLE_LINES = 240;
const PREAMBLE_MAX_CHARS = 4 * 1024 * 1024;
/**
 * Rows per storage block. Samples go into fixed blocks, joined once at the end channel by channel,
 * instead of doubling arrays and trimming them, which held up to ~2× the output at once (parse of a
 * 200 MB log: 440 → 387 MiB peak RSS). Blocks of 256 kB and more are mmap'ed by malloc and go back
 * to the system once freed; with 64 kB blocks the peak stayed at 440 MiB.
 */
const BLOCK_ROWS = 65_536;
/**
 * Module-local bindings, read once: tsx (esbuild) compiles an imported name to a property getter,
 * and reading it per cell measured ~13% of the parse time in `node --cpu-prof`.
 */
const parseNumber = parseNumberCell;
const F32_MAX = FLOAT32_MAX;
/** 10^k exact as a double for k ≤ 22. */
const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

export interface ParseCsvOptions {
  /** For messages; default "upload.csv". */
  fileName?: string;
  /**
   * Receives every block of rows as soon as it is complete, while the rest of the file is still
   * being parsed (the worker writes them to the database meanwhile, so parse and write overlap).
   */
  sink?: SampleSink;
  /**
   * Which channels the returned series keeps in memory (default: all). The others come back with
   * empty `values` (their counts, min and max are still set): their samples went to the sink only,
   * so memory no longer grows with them. Only useful with a sink.
   */
  keep?: (role: ParsedChannel["role"]) => boolean;
  /**
   * The file's size in bytes, when known. With a sink, the kept channels are then sized once from
   * it (rows of the first block × bytes to come) instead of growing; the returned arrays are views
   * of exactly `rows` samples.
   */
  expectedBytes?: number;
}

/** A channel as the sink learns of it before the first row: same order as ParsedSeries.channels. */
export interface SinkChannel {
  name: string;
  role: ParsedChannel["role"];
  unit: string;
  valueType: "f32" | "f64";
}

/** Where parseCsvStream sends complete blocks of rows as it goes. */
export interface SampleSink {
  /**
   * Rows per block (each block but the last is exactly this long): a sink that stores fixed-size
   * chunks gives its chunk size, or a multiple of it.
   */
  readonly blockRows: number;
  /** Called once, after the header and mapping were checked and before any block. */
  start(channels: SinkChannel[]): void;
  /**
   * Rows [startRow, startRow + rows) of the time and every channel (values in SinkChannel order),
   * in SI units, NaN for no sample: views of exactly `rows` elements, valid during the call only
   * (the parser refills the blocks of channels it does not keep), so a sink that writes later
   * copies them first.
   */
  block(startRow: number, rows: number, timeS: Float64Array, values: readonly SampleArray[]): void;
  /** Resolves when the sink can take more (the parser waits before reading on); rejects when it failed. */
  ready(): Promise<void>;
}

interface ChannelPlan {
  column: MappedColumn;
  header: string;
  role: ParsedChannel["role"];
  unit: string;
  /** si = raw × factor + offset (calibration and unit conversion folded together). */
  factor: number;
  offset: number;
}

/**
 * Parse a CSV channel export as a stream with papaparse (`chunk` mode), filling typed arrays
 * (Float64 time, Float32 per channel, NaN for empty cells) in SI units, validating every
 * cell as it goes. Throws IngestError naming the line and column on the first problem; returns
 * nothing partial. Memory: samples fill fixed blocks (BLOCK_ROWS), joined into one array per
 * channel at the end, freeing the blocks as it goes: the peak is the output plus the blocks the
 * collector has not freed yet, not the up-to-twice-the-output of doubling arrays. With a sink
 * (options.sink) every `sink.blockRows` rows go to the sink as soon as they are complete; the
 * channels the caller keeps (options.keep) fill one array each, sized from options.expectedBytes,
 * and the others refill one block each, so memory follows the kept channels only.
 */
export async function parseCsvStream(
  readable: NodeJS.ReadableStream | AsyncIterable<Buffer | string>,
  mapping: Mapping,
  limits: IngestLimits = LIMITS,
  onProgress?: (p: IngestProgress) => void,
  options: ParseCsvOptions = {},
): Promise<ParsedSeries> {
  const fileName = options.fileName ?? "upload.csv";
  const progress: DecodeProgress = { bytesRead: 0, lines: 0 };
  const decoded = decodeTextStream(readable as AsyncIterable<Buffer>, {
    limits,
    fileName,
    progress,
    onFormat: (s) => {
      if (s.format !== "csv") {
        throw new IngestError("UNSUPPORTED_TEXT", `"${fileName}" is ${s.format === "gpx" ? "a GPX" : "an NMEA 0183"} file, not CSV; import it as ${s.format.toUpperCase()}.`);
      }
    },
  });

  // 1. Preamble.
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
    throw new IngestError("EMPTY_FILE", `"${fileName}" has no text${progress.bytesRead > 0 ? " (only blank lines or a byte-order mark)" : " (0 bytes)"}.`);
  }
  let header: CsvHeader;
  try {
    header = readCsvHeader(preamble, ended, limits);
  } catch (e) {
    await decoded.return(undefined);
    throw e;
  }
  let plan: ReturnType<typeof planColumns>;
  try {
    plan = planColumns(header, mapping);
  } catch (e) {
    await decoded.return(undefined);
    throw e;
  }
  const { timeColumn, channels, textColumns } = plan;
  const rest = preamble.slice(header.dataStartOffset);
  preamble = "";
  const sink = options.sink;
  const keep = channels.map((c) => !sink || !options.keep || options.keep(c.role));
  sink?.start(channels.map((c) => ({ name: c.column.name, role: c.role, unit: c.unit, valueType: FLOAT64_ROLES.has(c.role) ? "f64" : "f32" })));

  async function* textForPapa(): AsyncGenerator<string> {
    if (rest) yield rest;
    for (;;) {
      // Backpressure: no more text while the sink is behind, so blocks waiting for the database
      // stay few instead of piling up in memory.
      if (sink) await sink.ready();
      const next = await decoded.next();
      if (next.done) return;
      yield next.value;
    }
  }

  // 2. Rows.
  const nch = channels.length;
  const colIdx = channels.map((c) => c.column.index);
  const factor = channels.map((c) => c.factor);
  const offset = channels.map((c) => c.offset);
  const timeIdx = timeColumn.index;
  const timeHeader = header.columns.find((c) => c.index === timeIdx)?.header ?? timeColumn.name;
  const timeFormat: TimeFormat = mapping.timeFormat;
  /** readTime returns seconds, or milliseconds for "milliseconds" and "iso8601". */
  const timeDivisor = timeFormat === "seconds" ? 1 : 1000;
  const fieldCount = header.fieldCount;
  const decimalComma = header.decimalComma;
  const sinkRows = sink ? sink.blockRows : 0;
  if (sink && !(Number.isInteger(sinkRows) && sinkRows > 0)) throw new Error(`sink.blockRows must be a positive integer, got ${sinkRows}`);
  // Storage blocks hold whole sink blocks, so each sink block is a view of one storage block.
  const blockRows = sink ? Math.ceil(BLOCK_ROWS / sinkRows) * sinkRows : BLOCK_ROWS;
  /** Rows in the current storage block when full (always blockRows without a sink). */
  let curRows = blockRows;
  /** Rows of the current storage block already handed to the sink. */
  let sent = 0;
  // Without a sink: full blocks so far, joined at the end.
  const timeBlocks: Float64Array[] = [];
  const valueBlocks: SampleArray[][] = channels.map(() => []);
  // With a sink: time and the kept channels live in one array each, sized from the file's size
  // (options.expectedBytes) once the first block shows the bytes per row, and the block being
  // filled is a view of it — no join at the end, whose blocks-plus-result held twice the kept
  // samples (200 MB log: ~140 MB of arrays instead of ~70). Other channels refill one block each,
  // so they allocate nothing after the first block.
  let keptTime: Float64Array | null = sink ? new Float64Array(blockRows) : null;
  const keptValues: (SampleArray | null)[] = channels.map((c, k) => (sink && keep[k] ? sampleArrayFor(c.role, blockRows) : null));
  // The block being filled (`pos` rows in it).
  let timeS = keptTime ?? new Float64Array(blockRows);
  let values: SampleArray[] = channels.map((c, k) => keptValues[k] ?? sampleArrayFor(c.role, blockRows));
  let pos = 0;
  const counts = new Array<number>(nch).fill(0);
  const mins = new Array<number>(nch).fill(Infinity);
  const maxs = new Array<number>(nch).fill(-Infinity);
  let rows = 0;
  let line = header.dataStartLine;
  let t0 = NaN;
  let prevRaw = NaN;
  let prevCell = "";
  let prevLine = 0;
  let firstTimeCell = "";
  let pendingShort: { line: number; found: number } | undefined;
  let missingMarkers = 0;
  const keepFirstOfDuplicates = mapping.duplicateTimes === "keepFirst";
  let duplicateRows = 0;
  let firstDuplicate: { line: number; prevLine: number; cell: string } | undefined;
  const isOther = channels.map((c) => c.role === "other");
  const textCells = new Array<number>(channels.length).fill(0);
  const textExample = new Array<string>(channels.length).fill("");

  /** Hand rows [sent, pos) of the current storage block to the sink. */
  function send(): void {
    const from = sent;
    const to = pos;
    sent = pos;
    sink!.block(rows - (pos - from), to - from, timeS.subarray(from, to), values.map((v) => v.subarray(from, to)));
  }

  function nextBlock(): void {
    sent = 0;
    pos = 0;
    if (!keptTime) {
      timeBlocks.push(timeS);
      timeS = new Float64Array(blockRows);
      for (let k = 0; k < nch; k++) valueBlocks[k].push(values[k]);
      values = channels.map((c) => sampleArrayFor(c.role, blockRows));
      return;
    }
    // `rows` is where the new block starts.
    if (keptTime.length < rows + sinkRows) growKept();
    curRows = Math.min(blockRows, keptTime.length - rows);
    timeS = keptTime.subarray(rows, rows + curRows);
    // Channels not kept refill the same block: the sink copied what it was handed.
    values = values.map((v, k) => keptValues[k]?.subarray(rows, rows + curRows) ?? v);
  }

  /** Room for the rest of the file: rows so far scaled by the bytes still to come, +5% for longer lines later on. */
  function growKept(): void {
    const expectedBytes = options.expectedBytes ?? 0;
    const estimate = expectedBytes > progress.bytesRead && progress.bytesRead > 0 ? Math.ceil(((rows * expectedBytes) / progress.bytesRead) * 1.05) : 2 * rows;
    const cap = Math.ceil(Math.max(rows + blockRows, estimate) / sinkRows) * sinkRows;
    const t = new Float64Array(cap);
    t.set(keptTime!.subarray(0, rows));
    keptTime = t;
    for (let k = 0; k < nch; k++) {
      const old = keptValues[k];
      if (!old) continue;
      const a = sampleArrayFor(channels[k].role, cap);
      a.set(old.subarray(0, rows));
      keptValues[k] = a;
    }
  }

  function fieldCountError(at: { line: number; found: number }, last: boolean): IngestError {
    if (last && at.found < fieldCount) {
      return new IngestError("TRUNCATED_LINE", `Line ${at.line} (the last line) has ${at.found} of ${fieldCount} fields: the file looks cut off. Upload the complete file.`, { line: at.line });
    }
    return new IngestError("FIELD_COUNT", `Line ${at.line} has ${at.found} fields; the header has ${fieldCount}. Every line needs one field per column (empty for no sample).`, { line: at.line });
  }

  function readTime(cell: string, lineNo: number): number {
    // Plain decimals (nearly every time cell of a logger) take the exact fast path below.
    if (timeFormat !== "iso8601") {
      const fast = plainDecimal(cell);
      if (fast === fast) return fast;
    }
    if (cell.trim() === "") {
      throw new IngestError("BAD_TIME", `Line ${lineNo}, column ${quoteForMessage(timeHeader)}: the time is empty; every line needs a time.`, { line: lineNo, column: timeHeader });
    }
    if (timeFormat === "iso8601") {
      const ms = parseIsoMs(cell.trim());
      if (ms === undefined) {
        throw new IngestError("BAD_TIME", `Line ${lineNo}, column ${quoteForMessage(timeHeader)}: expected an ISO 8601 date and time (e.g. 2024-05-01T10:00:00.125Z), found ${quoteForMessage(cell)}.`, {
          line: lineNo,
          column: timeHeader,
        });
      }
      return ms;
    }
    const v = parseNumber(cell, decimalComma);
    if (v === undefined || v !== v) {
      const err = describeBadCell(cell, lineNo, timeHeader, decimalComma);
      throw new IngestError(err.code === "NOT_A_NUMBER" ? "BAD_TIME" : err.code, err.message.replace("expected a number", `expected a time in ${timeFormat}`), { line: lineNo, column: timeHeader });
    }
    return v;
  }

  function processRows(data: string[][]): void {
    for (let r = 0; r < data.length; r++, line++) {
      const row = data[r];
      if (row.length === 1 && row[0].trim() === "") continue;
      if (pendingShort) throw fieldCountError(pendingShort, false);
      if (row.length !== fieldCount) {
        if (row.length > fieldCount) throw fieldCountError({ line, found: row.length }, false);
        pendingShort = { line, found: row.length };
        continue;
      }
      if (rows >= limits.maxRows) {
        throw new IngestError("TOO_MANY_ROWS", `Line ${line}: more than ${limits.maxRows.toLocaleString("en-GB")} rows of samples; split the log into shorter files.`, { line });
      }
      const tCell = row[timeIdx];
      const t = readTime(tCell, line);
      if (rows === 0) {
        t0 = t;
        firstTimeCell = tCell.trim();
      } else if (!(t > prevRaw)) {
        if (t === prevRaw) {
          // Refused or not, every repeat is counted (the refusal says how many rows keeping the
          // first of each stamp would drop); the first one is named in the refusal.
          duplicateRows++;
          if (!keepFirstOfDuplicates && !firstDuplicate) firstDuplicate = { line, prevLine, cell: tCell.trim() };
          continue;
        }
        throw new IngestError(
          "TIME_BACKWARDS",
          `Line ${line}, column ${quoteForMessage(timeHeader)}: time goes backwards, ${quoteForMessage(tCell.trim())} after ${quoteForMessage(prevCell.trim())} on line ${prevLine}; times must increase.`,
          { line, column: timeHeader },
        );
      }
      prevRaw = t;
      prevCell = tCell; // trimmed only for a message
      prevLine = line;
      if (pos === curRows) nextBlock();
      // Subtract in the file's own unit first: epoch milliseconds keep sub-ms steps exact enough.
      timeS[pos] = (t - t0) / timeDivisor;
      for (let k = 0; k < nch; k++) {
        const cell = row[colIdx[k]];
        if (cell.length === 0) {
          values[k][pos] = NaN; // no sample, as parseNumberCell says for an empty cell
          continue;
        }
        let raw: number | undefined = plainDecimal(cell);
        if (raw !== raw) raw = parseNumber(cell, decimalComma);
        if (raw === undefined) {
          // R and many statistics tools write NA for a missing value: no sample, like an empty cell.
          if (cell === "NA" || cell === "\"NA\"") {
            values[k][pos] = NaN;
            missingMarkers++;
            continue;
          }
          if (isOther[k]) {
            // Text later on in a column left as "other": that cell is left out and counted.
            values[k][pos] = NaN;
            if (textCells[k]++ === 0) textExample[k] = cell;
            continue;
          }
          throw describeBadCell(cell, line, channels[k].header, decimalComma);
        }
        if (raw !== raw) {
          values[k][pos] = NaN;
          continue;
        }
        const si = raw * factor[k] + offset[k];
        if (si > F32_MAX || si < -F32_MAX) {
          throw new IngestError("NUMBER_OUT_OF_RANGE", `Line ${line}, column ${quoteForMessage(channels[k].header)}: ${quoteForMessage(cell)} is out of range for a stored sample.`, {
            line,
            column: channels[k].header,
          });
        }
        values[k][pos] = si;
        counts[k]++;
        if (si < mins[k]) mins[k] = si;
        if (si > maxs[k]) maxs[k] = si;
      }
      pos++;
      rows++;
      if (sinkRows && pos - sent === sinkRows) send();
    }
  }

  const source = Readable.from(textForPapa());
  await new Promise<void>((resolve, reject) => {
    let failure: unknown;
    let settled = false;
    const finish = () => {
      if (settled) return;
      settled = true;
      if (failure !== undefined) reject(failure);
      else resolve();
    };
    const fail = (e: unknown) => {
      if (failure === undefined) failure = e;
      source.destroy();
      finish();
    };
    Papa.parse<string[], NodeJS.ReadableStream>(source, {
      delimiter: header.delimiter,
      newline: "\n",
      quoteChar: '"',
      header: false,
      skipEmptyLines: false,
      chunk: (results, parser) => {
        if (failure !== undefined) return;
        try {
          const quoteError = results.errors.find((e) => e.type === "Quotes");
          if (quoteError) {
            const at = line + (quoteError.row ?? 0);
            throw new IngestError("UNCLOSED_QUOTE", `Line ${at}: a quoted field is not closed properly (${quoteError.message}).`, { line: at });
          }
          processRows(results.data);
          onProgress?.({ bytesRead: progress.bytesRead, rows });
        } catch (e) {
          // Record the failure first: abort() calls `complete` synchronously.
          failure = e;
          parser.abort();
          fail(e);
        }
      },
      complete: () => finish(),
      error: (e: Error) => fail(e),
    });
  });

  if (pendingShort) throw fieldCountError(pendingShort, true);
  if (rows === 0) {
    throw new IngestError("HEADER_ONLY", `The file has a header (line ${header.headerLine}) but no data lines.`, { line: header.headerLine });
  }

  if (firstDuplicate) {
    const d = firstDuplicate;
    throw new IngestError(
      "DUPLICATE_TIME",
      `Line ${d.line}, column ${quoteForMessage(timeHeader)}: the time ${quoteForMessage(d.cell)} repeats the one on line ${d.prevLine}; time stamps must be unique. ` +
        `${duplicateRows.toLocaleString("en-GB")} ${duplicateRows === 1 ? "row repeats" : "rows repeat"} the time stamp of the row before. ` +
        "If the export rounded the times, import it keeping the first row of each time stamp.",
      { line: d.line, column: timeHeader, duplicateRows },
    );
  }
  const out: ParsedChannel[] = [];
  const stats = (k: number) => ({ sampleCount: counts[k], min: counts[k] > 0 ? mins[k] : NaN, max: counts[k] > 0 ? maxs[k] : NaN });
  let joinedTime: Float64Array;
  if (keptTime) {
    if (pos > sent) send();
    joinedTime = keptTime.subarray(0, rows);
    for (let k = 0; k < nch; k++) {
      const c = channels[k];
      out.push({ name: c.column.name, role: c.role, unit: c.unit, values: keptValues[k]?.subarray(0, rows) ?? sampleArrayFor(c.role, 0), ...stats(k) });
    }
  } else {
    // 3. Join the blocks, one channel at a time, dropping each channel's blocks once copied. The
    // yield between channels lets V8's collector run its tasks and free the dropped blocks; joined
    // synchronously, they outlived the join (200 MB log: 414 MiB peak without the yield, 387 with).
    const yieldToLoop = () => new Promise<void>((r) => setImmediate(r));
    timeBlocks.push(timeS.subarray(0, pos));
    joinedTime = joinBlocks(timeBlocks, new Float64Array(rows));
    timeBlocks.length = 0;
    for (let k = 0; k < nch; k++) {
      const c = channels[k];
      valueBlocks[k].push(values[k].subarray(0, pos));
      const joined = joinBlocks(valueBlocks[k], sampleArrayFor(c.role, rows));
      valueBlocks[k] = [];
      values[k] = joined; // the current block is no longer referenced either
      out.push({ name: c.column.name, role: c.role, unit: c.unit, values: joined, ...stats(k) });
      await yieldToLoop();
    }
  }
  values = [];
  const metadata: Record<string, string> = { ...header.metadata, source_format: "csv", time_format: timeFormat, first_time_value: firstTimeCell };
  if (timeFormat === "iso8601") {
    metadata.start_time_iso = new Date(t0).toISOString();
    // A zone-less date-time is wall-clock time: the track's zone decides the instant at ingest.
    if (!/(Z|[+-]\d{2}:?\d{2})$/.test(firstTimeCell)) metadata.time_zone_in_file = "no";
  }
  const notes: string[] = [];
  if (textColumns.length) {
    notes.push(`${textColumns.length === 1 ? "1 column holds" : `${textColumns.length} columns hold`} text, not numbers, and ${textColumns.length === 1 ? "was" : "were"} left out: ${textColumns.map((c) => `${quoteForMessage(c.name)} (e.g. ${quoteForMessage(c.example)})`).join(", ")}.`);
  }
  for (let k = 0; k < nch; k++) {
    if (textCells[k]) notes.push(`Column ${quoteForMessage(channels[k].header)} (other): ${textCells[k].toLocaleString("en-GB")} cells of text (e.g. ${quoteForMessage(textExample[k])}) left out.`);
  }
  if (duplicateRows) notes.push(`${duplicateRows.toLocaleString("en-GB")} rows repeating the time stamp of the row before were dropped (the first row of each time stamp kept).`);
  if (missingMarkers) notes.push(`${missingMarkers.toLocaleString("en-GB")} cells written NA were read as empty (no sample).`);
  const runs = separateRuns(joinedTime);
  if (runs.count > 1) {
    notes.push(`The file holds ${runs.count} separate runs: the time jumps ${runs.count - 1} times by more than ${formatGap(runs.gapS)} (longest gap ${formatGap(runs.longestGapS)}). Upload each run as its own file to get a session per run.`);
    metadata.separate_runs = String(runs.count);
  }
  onProgress?.({ bytesRead: progress.bytesRead, rows });
  return { timeS: joinedTime, channels: out, metadata, rows, ...(notes.length ? { notes } : {}) };
}

function joinBlocks<T extends SampleArray>(blocks: SampleArray[], into: T): T {
  let at = 0;
  for (const b of blocks) {
    into.set(b, at);
    at += b.length;
  }
  return into;
}

/**
 * The value of a plain decimal cell (-?digits[.digits], at most 15 digits), or NaN for anything
 * else, which then goes through parseNumberCell. With at most 15 digits the integer mantissa and
 * 10^k are exact doubles, so one correctly rounded division gives exactly what Number() gives
 * (Clinger's fast path, "How to read floating point numbers accurately", PLDI 1990) — and it
 * measured ~1.4× faster than Number() on logger cells.
 */
function plainDecimal(s: string): number {
  const n = s.length;
  let i = 0;
  let neg = false;
  if (s.charCodeAt(0) === 45) {
    neg = true;
    i = 1;
  }
  let mantissa = 0;
  let digits = 0;
  let point = -1;
  for (; i < n; i++) {
    const c = s.charCodeAt(i);
    if (c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
    } else if (c === 46 && point < 0) {
      point = i;
    } else {
      return NaN;
    }
  }
  if (digits === 0 || digits > 15) return NaN;
  const v = point < 0 ? mantissa : mantissa / POW10[n - 1 - point];
  return neg ? -v : v;
}

/** Check the mapping against this file's header and work out each column's conversion to SI. */
function planColumns(header: CsvHeader, mapping: Mapping): { timeColumn: MappedColumn; channels: ChannelPlan[]; textColumns: { name: string; example: string }[] } {
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

/** Milliseconds since the epoch of an ISO 8601 date-time (no zone = UTC), keeping sub-ms digits. */
function parseIsoMs(text: string): number | undefined {
  if (!ISO_8601_DATE_TIME.test(text)) return undefined;
  let s = text.replace(" ", "T");
  let fraction = 0;
  const frac = /\.(\d+)/.exec(s);
  if (frac) {
    fraction = Number("0." + frac[1]) * 1000;
    s = s.replace(frac[0], "");
  }
  if (!/(Z|[+-]\d{2}:?\d{2})$/.test(s)) s += "Z";
  const ms = Date.parse(s);
  return Number.isNaN(ms) ? undefined : ms + fraction;
}

function countLf(s: string): number {
  let n = 0;
  for (let i = s.indexOf("\n"); i >= 0; i = s.indexOf("\n", i + 1)) n++;
  return n;
}

/**
 * Stretches of a log separated by long pauses: a step longer than 2 minutes and 100 × the median
 * step (Lapbench default) starts a new run — a logger left on between outings, or several drives
 * exported into one file.
 */
export function separateRuns(timeS: Float64Array): { count: number; gapS: number; longestGapS: number } {
  const n = timeS.length;
  if (n < 3) return { count: 1, gapS: 120, longestGapS: 0 };
  const stride = Math.max(1, Math.floor((n - 1) / 100000));
  const steps: number[] = [];
  for (let i = 0; i + 1 < n; i += stride) steps.push(timeS[i + 1] - timeS[i]);
  steps.sort((a, b) => a - b);
  const median = steps[steps.length >> 1];
  const gapS = Math.max(120, 100 * median);
  let count = 1;
  let longest = 0;
  for (let i = 0; i + 1 < n; i++) {
    const step = timeS[i + 1] - timeS[i];
    if (step > gapS) count++;
    if (step > longest) longest = step;
  }
  return { count, gapS, longestGapS: longest };
}

function formatGap(s: number): string {
  if (s >= 86400) return `${(s / 86400).toFixed(1)} days`;
  if (s >= 3600) return `${(s / 3600).toFixed(1)} h`;
  if (s >= 60) return `${Math.round(s / 60)} min`;
  return `${s.toFixed(1)} s`;
}
