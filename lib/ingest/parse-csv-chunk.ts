/**
 * Reading a CSV in ranges of whole rows on worker threads, merged in file order.
 *
 * The main thread splits the decoded text after the header at line feeds into ranges (no quote
 * characters in them: a line feed inside a quoted cell is not a row boundary, so text with quotes
 * is read on the main thread). A worker thread reads one range with the same row reader as the
 * single-thread path, given the file's first time (the main thread reads the first rows itself),
 * counting lines from 0. The main thread then merges the ranges in order, adding the line number
 * where each range starts, and carries on its counts, min and max. Whenever a range's result could depend on the rows before it
 * — a refusal inside the range, a short row before it, its first time not after the last one, the
 * row limit — the main thread reads that range again itself, in order, with the state of the rows
 * before: so the outcome (samples, notes, or the first refusal and its message) is the same as the
 * single-thread path's.
 */
import type { SampleArray } from "@/lib/channels/roles";
import { CsvRowReader, type FirstDuplicate, type PendingShort, type RowReaderConfig } from "./csv-row-reader";
import type { ParsedChannel } from "./parsed-series";
import { countLf } from "./csv-preamble";
import { SampleBlockStore } from "./sample-block-store";

export interface CsvChunkTask {
  cfg: RowReaderConfig;
  roles: ParsedChannel["role"][];
  /** Whole rows, no trailing line feed, no quote character. */
  text: string;
  /** The file's first time as read (the main thread reads the first rows itself). */
  t0: number;
}

/** A range's rows and what the rows after it need to know; line numbers count from 0 at the range's first line. */
export type CsvChunkResult =
  | { ok: false }
  | {
      ok: true;
      rows: number;
      /** Seconds from the file's first time, as the single-thread path computes them. */
      timeS: Float64Array;
      values: SampleArray[];
      /** First and last stored row's time as read. */
      firstRaw: number;
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
  // One block of the range's line count: no join, and no more memory than its rows need.
  const store = new SampleBlockStore(task.roles, { keep: task.roles.map(() => true), bytesDone: () => 0, blockRows: countLf(task.text) + 1 });
  const reader = new CsvRowReader(task.cfg, store, 0, task.t0);
  try {
    reader.processText(task.text);
  } catch {
    return { ok: false };
  }
  const { timeS, values } = store.joinNow();
  return {
    ok: true,
    rows: store.rows,
    timeS,
    values,
    firstRaw: reader.firstRaw,
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

/**
 * The main thread's part: add one range's result after the rows before it, or read its text again
 * here. Only after the first rows were read here (reader.t0 is the file's first time).
 */
export function mergeChunk(reader: CsvRowReader, store: SampleBlockStore, cfg: RowReaderConfig, res: CsvChunkResult, text: string): void {
  if (!res.ok || reader.pendingShort !== undefined || store.rows === 0 || store.rows + res.rows > cfg.maxRows || (res.rows > 0 && !(res.firstRaw > reader.prevRaw))) {
    reader.processText(text);
    return;
  }
  const base = reader.line;
  if (res.rows > 0) {
    store.append(res.timeS, res.values, res.rows);
    reader.prevRaw = res.prevRaw;
    reader.prevCell = res.prevCell;
    reader.prevLine = base + res.prevLine;
  }
  reader.line = base + res.endLine;
  reader.pendingShort = res.pendingShort && { line: base + res.pendingShort.line, found: res.pendingShort.found };
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
  if (!reader.firstDuplicate && res.firstDuplicate) {
    const d = res.firstDuplicate;
    reader.firstDuplicate = { ...d, line: base + d.line, prevLine: base + d.prevLine };
  }
}
