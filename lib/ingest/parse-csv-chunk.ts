/**
 * Reading a CSV in ranges of whole rows on worker threads, merged in file order.
 *
 * The main thread splits the decoded text after the header at line feeds into ranges (no quote
 * characters in them: a line feed inside a quoted cell is not a row boundary, so text with quotes
 * is read on the main thread). A worker thread reads one range with the same row reader as the
 * single-thread path, from a fresh state, keeping times as read. The main thread then merges the
 * ranges in order: it subtracts the file's first time exactly as the single-thread path does, and
 * carries on its counts, min and max. Whenever a range's result could depend on the rows before it
 * — a refusal inside the range, a short row before it, its first time not after the last one, the
 * row limit — the main thread reads that range again itself, in order, with the state of the rows
 * before: so the outcome (samples, notes, or the first refusal and its message) is the same as the
 * single-thread path's.
 */
import type { SampleArray } from "@/lib/channels/roles";
import { CsvRowReader, type FirstDuplicate, type PendingShort, type RowReaderConfig } from "./csv-row-reader";
import type { ParsedChannel } from "./parsed-series";
import { SampleBlockStore } from "./sample-block-store";

export interface CsvChunkTask {
  cfg: RowReaderConfig;
  roles: ParsedChannel["role"][];
  /** Whole rows, no trailing line feed, no quote character. */
  text: string;
  /** Line number of the first row of `text`. */
  firstLine: number;
}

export type CsvChunkResult =
  | { ok: false }
  | {
      ok: true;
      rows: number;
      /** Times as read (not yet relative to the file's first time). */
      timeRaw: Float64Array;
      values: SampleArray[];
      t0: number;
      firstTimeCell: string;
      prevRaw: number;
      prevCell: string;
      prevLine: number;
      endLine: number;
      pendingShort: PendingShort | undefined;
      counts: number[];
      mins: number[];
      maxs: number[];
      textCells: number[];
      textExample: string[];
      missingMarkers: number;
      duplicateRows: number;
      firstDuplicate: FirstDuplicate | undefined;
    };

/** Runs chunk tasks somewhere else (worker threads); results come back in any order, merged in order. */
export interface CsvChunkRunner {
  readonly threads: number;
  run(task: CsvChunkTask): Promise<CsvChunkResult>;
}

/** A worker thread's part: read one range from a fresh state. Any refusal → { ok: false } (the main thread reads it again). */
export function parseCsvChunk(task: CsvChunkTask): CsvChunkResult {
  const store = new SampleBlockStore(task.roles, { keep: task.roles.map(() => true), bytesDone: () => 0 });
  const reader = new CsvRowReader(task.cfg, store, task.firstLine, true);
  try {
    reader.processText(task.text);
  } catch {
    return { ok: false };
  }
  const { timeS, values } = store.joinNow();
  return {
    ok: true,
    rows: store.rows,
    timeRaw: timeS,
    values,
    t0: reader.t0,
    firstTimeCell: reader.firstTimeCell,
    prevRaw: reader.prevRaw,
    prevCell: reader.prevCell,
    prevLine: reader.prevLine,
    endLine: reader.line,
    pendingShort: reader.pendingShort,
    counts: reader.counts,
    mins: reader.mins,
    maxs: reader.maxs,
    textCells: reader.textCells,
    textExample: reader.textExample,
    missingMarkers: reader.missingMarkers,
    duplicateRows: reader.duplicateRows,
    firstDuplicate: reader.firstDuplicate,
  };
}

/** The main thread's part: add one range's result after the rows before it (or read its text again here). */
export function mergeChunk(reader: CsvRowReader, store: SampleBlockStore, cfg: RowReaderConfig, res: CsvChunkResult, text: string): void {
  if (
    !res.ok ||
    reader.pendingShort !== undefined ||
    store.rows + res.rows > cfg.maxRows ||
    (store.rows > 0 && res.rows > 0 && !(res.t0 > reader.prevRaw))
  ) {
    reader.processText(text);
    return;
  }
  if (res.rows > 0) {
    if (store.rows === 0) {
      reader.t0 = res.t0;
      reader.firstTimeCell = res.firstTimeCell;
    }
    // The same operation as the single-thread path, so the same bits.
    const t0 = reader.t0;
    const timeDivisor = cfg.timeFormat === "seconds" ? 1 : 1000;
    const t = res.timeRaw;
    for (let i = 0; i < res.rows; i++) t[i] = (t[i] - t0) / timeDivisor;
    store.append(t, res.values, res.rows);
    reader.prevRaw = res.prevRaw;
    reader.prevCell = res.prevCell;
    reader.prevLine = res.prevLine;
  }
  reader.line = res.endLine;
  reader.pendingShort = res.pendingShort;
  for (let k = 0; k < res.counts.length; k++) {
    reader.counts[k] += res.counts[k];
    if (res.mins[k] < reader.mins[k]) reader.mins[k] = res.mins[k];
    if (res.maxs[k] > reader.maxs[k]) reader.maxs[k] = res.maxs[k];
    if (res.textCells[k] > 0) {
      if (reader.textCells[k] === 0) reader.textExample[k] = res.textExample[k];
      reader.textCells[k] += res.textCells[k];
    }
  }
  reader.missingMarkers += res.missingMarkers;
  reader.duplicateRows += res.duplicateRows;
  if (!reader.firstDuplicate && res.firstDuplicate) reader.firstDuplicate = res.firstDuplicate;
}
