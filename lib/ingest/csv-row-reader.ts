/**
 * The row reader of the CSV parser: checks each row papaparse split (field count, time, cells) and
 * writes its samples, in SI units, into a SampleBlockStore. It keeps what the file's rows so far
 * decide (line number, last time, a short row waiting for the next one, counts, min and max), so
 * rows can be fed in any number of calls — or, on a worker thread, a range of the file read on its
 * own (given the file's first time) and merged later.
 */
import Papa from "papaparse";
import { ISO_8601_DATE_TIME } from "./detect-time-format";
import { IngestError, quoteForMessage } from "./ingest-error";
import type { TimeFormat } from "./mapping";
import { describeBadCell, FLOAT32_MAX, parseNumberCell } from "./parse-number-cell";
import type { SampleBlockStore } from "./sample-block-store";

/**
 * Module-local bindings, read once: tsx (esbuild) compiles an imported name to a property getter,
 * and reading it per cell measured ~13% of the parse time in `node --cpu-prof`.
 */
const parseNumber = parseNumberCell;
const F32_MAX = FLOAT32_MAX;
/** 10^k exact as a double for k ≤ 22. */
const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/** Characters papaparse splits at once in processText. */
const TEXT_CHUNK_CHARS = 64 * 1024;

/** What the row reader needs of the header and the column plan; plain data (it crosses to worker threads). */
export interface RowReaderConfig {
  delimiter: string;
  fieldCount: number;
  decimalComma: boolean;
  timeIndex: number;
  timeHeader: string;
  timeFormat: TimeFormat;
  keepFirstOfDuplicates: boolean;
  maxRows: number;
  channels: { index: number; header: string; factor: number; offset: number; isOther: boolean }[];
}

export interface PendingShort {
  line: number;
  found: number;
}

export interface FirstDuplicate {
  line: number;
  prevLine: number;
  cell: string;
}

export class CsvRowReader {
  /** Line number of the next row. */
  line: number;
  /** The first row's time as read (seconds, or ms for "milliseconds" and "iso8601"). */
  t0 = NaN;
  firstTimeCell = "";
  prevRaw = NaN;
  prevCell = "";
  prevLine = 0;
  /** A row with too few fields: an error unless it is the last. */
  pendingShort: PendingShort | undefined;
  missingMarkers = 0;
  duplicateRows = 0;
  firstDuplicate: FirstDuplicate | undefined;
  readonly counts: number[];
  readonly mins: number[];
  readonly maxs: number[];
  readonly textCells: number[];
  readonly textExample: string[];
  private readonly cfg: RowReaderConfig;
  private readonly store: SampleBlockStore;

  /** Time of the first row this reader stored (the file's first time unless t0 was given). */
  firstRaw = NaN;
  private readonly t0Given: boolean;

  /**
   * `t0`: the file's first time, when the reader starts after it (a range on a worker thread);
   * its first row is then not compared with a row before.
   */
  constructor(cfg: RowReaderConfig, store: SampleBlockStore, firstLine: number, t0?: number) {
    this.cfg = cfg;
    this.store = store;
    this.line = firstLine;
    this.t0Given = t0 !== undefined;
    if (t0 !== undefined) this.t0 = t0;
    const n = cfg.channels.length;
    this.counts = new Array<number>(n).fill(0);
    this.mins = new Array<number>(n).fill(Infinity);
    this.maxs = new Array<number>(n).fill(-Infinity);
    this.textCells = new Array<number>(n).fill(0);
    this.textExample = new Array<string>(n).fill("");
  }

  fieldCountError(at: PendingShort, last: boolean): IngestError {
    const fieldCount = this.cfg.fieldCount;
    if (last && at.found < fieldCount) {
      return new IngestError("TRUNCATED_LINE", `Line ${at.line} (the last line) has ${at.found} of ${fieldCount} fields: the file looks cut off. Upload the complete file.`, { line: at.line });
    }
    return new IngestError("FIELD_COUNT", `Line ${at.line} has ${at.found} fields; the header has ${fieldCount}. Every line needs one field per column (empty for no sample).`, { line: at.line });
  }

  /** papaparse's result for rows starting at `this.line`: refuse an unclosed quote, else read the rows. */
  processResult(results: Papa.ParseResult<string[]>): void {
    const quoteError = results.errors.find((e) => e.type === "Quotes");
    if (quoteError) {
      const at = this.line + (quoteError.row ?? 0);
      throw new IngestError("UNCLOSED_QUOTE", `Line ${at}: a quoted field is not closed properly (${quoteError.message}).`, { line: at });
    }
    this.processRows(results.data);
  }

  /**
   * Split `text` (whole rows, no trailing line feed) with papaparse and read its rows, 64 kB at a
   * time: the rows of a whole 2 MB range at once outlived the young generation, and the collector
   * then took more time than the parse (`node --cpu-prof`: 2.2 s of GC for 1.0 s of work, 50 MB log).
   */
  processText(text: string): void {
    let failure: unknown;
    Papa.parse<string[]>(text, {
      delimiter: this.cfg.delimiter,
      newline: "\n",
      quoteChar: '"',
      header: false,
      skipEmptyLines: false,
      chunkSize: TEXT_CHUNK_CHARS,
      // A string is split synchronously: every chunk has been read when Papa.parse returns.
      complete: () => undefined,
      chunk: (results: Papa.ParseResult<string[]>, parser: Papa.Parser) => {
        if (failure !== undefined) return;
        try {
          this.processResult(results);
        } catch (e) {
          failure = e;
          parser.abort();
        }
      },
    });
    if (failure !== undefined) throw failure;
  }

  private readTime(cell: string, lineNo: number): number {
    const { timeFormat, timeHeader, decimalComma } = this.cfg;
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

  processRows(data: string[][]): void {
    const cfg = this.cfg;
    const store = this.store;
    const fieldCount = cfg.fieldCount;
    const timeIdx = cfg.timeIndex;
    const decimalComma = cfg.decimalComma;
    const maxRows = cfg.maxRows;
    const keepFirst = cfg.keepFirstOfDuplicates;
    const timeDivisor = cfg.timeFormat === "seconds" ? 1 : 1000;
    const chans = cfg.channels;
    const nch = chans.length;
    const counts = this.counts;
    const mins = this.mins;
    const maxs = this.maxs;
    let line = this.line;
    let prevRaw = this.prevRaw;
    let prevCell = this.prevCell;
    let prevLine = this.prevLine;
    for (let r = 0; r < data.length; r++, line++) {
      const row = data[r];
      if (row.length === 1 && row[0].trim() === "") continue;
      if (this.pendingShort) throw this.fieldCountError(this.pendingShort, false);
      if (row.length !== fieldCount) {
        if (row.length > fieldCount) throw this.fieldCountError({ line, found: row.length }, false);
        this.pendingShort = { line, found: row.length };
        continue;
      }
      if (store.rows >= maxRows) {
        throw new IngestError("TOO_MANY_ROWS", `Line ${line}: more than ${maxRows.toLocaleString("en-GB")} rows of samples; split the log into shorter files.`, { line });
      }
      const tCell = row[timeIdx];
      const t = this.readTime(tCell, line);
      if (store.rows === 0) {
        this.firstRaw = t;
        if (!this.t0Given) {
          this.t0 = t;
          this.firstTimeCell = tCell.trim();
        }
      } else if (!(t > prevRaw)) {
        if (t === prevRaw) {
          // Refused or not, every repeat is counted (the refusal says how many rows keeping the
          // first of each stamp would drop); the first one is named in the refusal.
          this.duplicateRows++;
          if (!keepFirst && !this.firstDuplicate) this.firstDuplicate = { line, prevLine, cell: tCell.trim() };
          continue;
        }
        throw new IngestError(
          "TIME_BACKWARDS",
          `Line ${line}, column ${quoteForMessage(cfg.timeHeader)}: time goes backwards, ${quoteForMessage(tCell.trim())} after ${quoteForMessage(prevCell.trim())} on line ${prevLine}; times must increase.`,
          { line, column: cfg.timeHeader },
        );
      }
      prevRaw = t;
      prevCell = tCell; // trimmed only for a message
      prevLine = line;
      store.room();
      const pos = store.pos;
      const values = store.values;
      // Subtract in the file's own unit first: epoch milliseconds keep sub-ms steps exact enough.
      store.timeS[pos] = (t - this.t0) / timeDivisor;
      for (let k = 0; k < nch; k++) {
        const ch = chans[k];
        const cell = row[ch.index];
        if (cell.length === 0) {
          values[k][pos] = NaN; // no sample, as parseNumberCell says for an empty cell
          continue;
        }
        let raw: number | undefined = plainDecimal(cell);
        if (raw !== raw) raw = parseNumber(cell, decimalComma);
        if (raw === undefined) {
          // R and many statistics tools write NA for a missing value: no sample, like an empty cell.
          if (cell === "NA" || cell === '"NA"') {
            values[k][pos] = NaN;
            this.missingMarkers++;
            continue;
          }
          if (ch.isOther) {
            // Text later on in a column left as "other": that cell is left out and counted.
            values[k][pos] = NaN;
            if (this.textCells[k]++ === 0) this.textExample[k] = cell;
            continue;
          }
          throw describeBadCell(cell, line, ch.header, decimalComma);
        }
        if (raw !== raw) {
          values[k][pos] = NaN;
          continue;
        }
        const si = raw * ch.factor + ch.offset;
        if (si > F32_MAX || si < -F32_MAX) {
          throw new IngestError("NUMBER_OUT_OF_RANGE", `Line ${line}, column ${quoteForMessage(ch.header)}: ${quoteForMessage(cell)} is out of range for a stored sample.`, {
            line,
            column: ch.header,
          });
        }
        values[k][pos] = si;
        counts[k]++;
        if (si < mins[k]) mins[k] = si;
        if (si > maxs[k]) maxs[k] = si;
      }
      store.commitRow();
    }
    this.line = line;
    this.prevRaw = prevRaw;
    this.prevCell = prevCell;
    this.prevLine = prevLine;
  }

  /** After the last row: a short last line, no rows at all, refused repeats of a time stamp. */
  finishChecks(headerLine: number): void {
    if (this.pendingShort) throw this.fieldCountError(this.pendingShort, true);
    if (this.store.rows === 0) {
      throw new IngestError("HEADER_ONLY", `The file has a header (line ${headerLine}) but no data lines.`, { line: headerLine });
    }
    if (this.firstDuplicate) {
      const d = this.firstDuplicate;
      const n = this.duplicateRows;
      throw new IngestError(
        "DUPLICATE_TIME",
        `Line ${d.line}, column ${quoteForMessage(this.cfg.timeHeader)}: the time ${quoteForMessage(d.cell)} repeats the one on line ${d.prevLine}; time stamps must be unique. ` +
          `${n.toLocaleString("en-GB")} ${n === 1 ? "row repeats" : "rows repeat"} the time stamp of the row before. ` +
          "If the export rounded the times, import it keeping the first row of each time stamp.",
        { line: d.line, column: this.cfg.timeHeader, duplicateRows: n },
      );
    }
  }
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
