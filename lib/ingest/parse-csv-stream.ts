import { FLOAT64_ROLES } from "@/lib/channels/roles";
import { Readable } from "node:stream";
import Papa from "papaparse";
import { readCsvPreamble } from "./csv-preamble";
import { CsvRowReader, type RowReaderConfig } from "./csv-row-reader";
import { decodeTextStream, type DecodeProgress } from "./decode-text-stream";
import { IngestError, quoteForMessage } from "./ingest-error";
import { LIMITS, type IngestLimits } from "./limits";
import type { Mapping } from "./mapping";
import { mergeChunk, type CsvChunkRunner } from "./parse-csv-chunk";
import type { IngestProgress, ParsedChannel, ParsedSeries } from "./parsed-series";
import { SampleBlockStore, type SampleSink } from "./sample-block-store";

export type { SampleSink, SinkChannel } from "./sample-block-store";

/** Characters of text per range read on a worker thread (about 2 MB of a logger export). */
export const THREAD_CHUNK_CHARS = 2 * 1024 * 1024;

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
  /**
   * Worker threads to read ranges of rows on (see parse-csv-chunk.ts); without, every row is read
   * on this thread. The result is the same either way.
   */
  threads?: CsvChunkRunner;
  /** Characters per range for the threads; default THREAD_CHUNK_CHARS. */
  chunkChars?: number;
}

/**
 * Parse a CSV channel export as a stream: the preamble reader (csv-preamble.ts) reads the header
 * and plans the mapped columns; papaparse splits the rows — on this thread (`chunk` mode) or, with
 * options.threads, in ranges on worker threads (parse-csv-chunk.ts); the row reader
 * (csv-row-reader.ts) checks every cell and converts it to SI units; the sample-block store
 * (sample-block-store.ts) holds the samples (Float64 time, Float32 per channel, Float64 for
 * latitude and longitude, NaN for empty cells) and feeds options.sink. Throws IngestError naming
 * the line and column on the first problem; returns nothing partial.
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
  const { header, plan, rest } = await readCsvPreamble(decoded, mapping, limits, fileName, () => progress.bytesRead);
  const { channels, textColumns } = plan;
  const timeIdx = plan.timeColumn.index;
  const timeHeader = header.columns.find((c) => c.index === timeIdx)?.header ?? plan.timeColumn.name;
  const timeFormat = mapping.timeFormat;
  const sink = options.sink;
  const keep = channels.map((c) => !sink || !options.keep || options.keep(c.role));
  sink?.start(channels.map((c) => ({ name: c.column.name, role: c.role, unit: c.unit, valueType: FLOAT64_ROLES.has(c.role) ? "f64" : "f32" })));

  // 2. Rows.
  const roles = channels.map((c) => c.role);
  /** Share of the decoded text behind the stored rows (the rest is in flight on the threads). */
  let storedShare = 1;
  const store = new SampleBlockStore(roles, { sink, keep, expectedBytes: options.expectedBytes, bytesDone: () => progress.bytesRead * storedShare });
  const cfg: RowReaderConfig = {
    delimiter: header.delimiter,
    fieldCount: header.fieldCount,
    decimalComma: header.decimalComma,
    timeIndex: timeIdx,
    timeHeader,
    timeFormat,
    keepFirstOfDuplicates: mapping.duplicateTimes === "keepFirst",
    maxRows: limits.maxRows,
    channels: channels.map((c) => ({ index: c.column.index, header: c.header, factor: c.factor, offset: c.offset, isOther: c.role === "other" })),
  };
  const reader = new CsvRowReader(cfg, store, header.dataStartLine);

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

  let text: AsyncIterable<string> | null = textForPapa();
  if (options.threads && options.threads.threads > 0) {
    const share = { decoded: 0, stored: 0 };
    text = await readOnThreads(text, reader, store, cfg, roles, options.threads, options.chunkChars ?? THREAD_CHUNK_CHARS, share, () => {
      storedShare = share.decoded > 0 ? share.stored / share.decoded : 1;
      onProgress?.({ bytesRead: progress.bytesRead, rows: store.rows });
    });
    storedShare = 1;
  }
  if (text) await readOnThisThread(text, reader, header.delimiter, () => onProgress?.({ bytesRead: progress.bytesRead, rows: store.rows }));

  reader.finishChecks(header.headerLine);
  const rows = store.rows;
  const joined = await store.finish();
  const out: ParsedChannel[] = channels.map((c, k) => ({
    name: c.column.name,
    role: c.role,
    unit: c.unit,
    values: joined.values[k],
    sampleCount: reader.counts[k],
    min: reader.counts[k] > 0 ? reader.mins[k] : NaN,
    max: reader.counts[k] > 0 ? reader.maxs[k] : NaN,
  }));
  const joinedTime = joined.timeS;
  const firstTimeCell = reader.firstTimeCell;
  const metadata: Record<string, string> = { ...header.metadata, source_format: "csv", time_format: timeFormat, first_time_value: firstTimeCell };
  if (timeFormat === "iso8601") {
    metadata.start_time_iso = new Date(reader.t0).toISOString();
    // A zone-less date-time is wall-clock time: the track's zone decides the instant at ingest.
    if (!/(Z|[+-]\d{2}:?\d{2})$/.test(firstTimeCell)) metadata.time_zone_in_file = "no";
  }
  const notes: string[] = [];
  if (textColumns.length) {
    notes.push(`${textColumns.length === 1 ? "1 column holds" : `${textColumns.length} columns hold`} text, not numbers, and ${textColumns.length === 1 ? "was" : "were"} left out: ${textColumns.map((c) => `${quoteForMessage(c.name)} (e.g. ${quoteForMessage(c.example)})`).join(", ")}.`);
  }
  for (let k = 0; k < channels.length; k++) {
    if (reader.textCells[k]) notes.push(`Column ${quoteForMessage(channels[k].header)} (other): ${reader.textCells[k].toLocaleString("en-GB")} cells of text (e.g. ${quoteForMessage(reader.textExample[k])}) left out.`);
  }
  const { duplicateRows, missingMarkers } = reader;
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

/** Feed text to papaparse (`chunk` mode) on this thread, every chunk of rows to the row reader. */
async function readOnThisThread(text: AsyncIterable<string>, reader: CsvRowReader, delimiter: string, progressed: () => void): Promise<void> {
  const source = Readable.from(text);
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
      delimiter,
      newline: "\n",
      quoteChar: '"',
      header: false,
      skipEmptyLines: false,
      chunk: (results, parser) => {
        if (failure !== undefined) return;
        try {
          reader.processResult(results);
          progressed();
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
}

/**
 * Send ranges of whole rows to the threads and merge their results in order. Returns the text
 * still to read on this thread — from the line of the first quote character on (a quoted cell may
 * hold a line feed, so ranges could not be cut there) — or null when everything was read.
 */
async function readOnThreads(
  text: AsyncIterable<string>,
  reader: CsvRowReader,
  store: SampleBlockStore,
  cfg: RowReaderConfig,
  roles: ParsedChannel["role"][],
  threads: CsvChunkRunner,
  chunkChars: number,
  share: { decoded: number; stored: number },
  progressed: () => void,
): Promise<AsyncIterable<string> | null> {
  const it = text[Symbol.asyncIterator]();
  const inFlight: { text: string; result: Promise<Awaited<ReturnType<CsvChunkRunner["run"]>>> }[] = [];
  const maxInFlight = threads.threads * 2;
  let pending = "";

  const dispatch = (chunk: string) => {
    if (store.rows === 0) {
      // Until a row is stored (and with it the file's first time), ranges are read here.
      reader.processText(chunk);
      share.stored += chunk.length + 1;
      return;
    }
    const result = threads.run({ cfg, roles, text: chunk, t0: reader.t0 });
    // Settled here too, so a refusal of an earlier range leaves no unhandled rejection behind.
    result.catch(() => undefined);
    inFlight.push({ text: chunk, result });
  };
  const mergeOldest = async () => {
    const c = inFlight.shift()!;
    mergeChunk(reader, store, cfg, await c.result, c.text);
    share.stored += c.text.length + 1;
    progressed();
  };
  const drain = async () => {
    while (inFlight.length) await mergeOldest();
  };

  try {
    for (;;) {
      let next: IteratorResult<string>;
      try {
        next = await it.next();
      } catch (e) {
        // What comes before the unreadable bytes is read first, as on one thread: a refusal there comes first.
        await drain();
        const cut = pending.lastIndexOf("\n");
        if (cut > 0) reader.processText(pending.slice(0, cut));
        throw e;
      }
      if (next.done) break;
      const piece = next.value;
      share.decoded += piece.length;
      const q = piece.indexOf('"');
      if (q >= 0) {
        const all = pending + piece;
        const cut = all.lastIndexOf("\n", pending.length + q);
        if (cut > 0) dispatch(all.slice(0, cut));
        await drain();
        const tail = cut >= 0 ? all.slice(cut + 1) : all;
        return (async function* () {
          yield tail;
          for (;;) {
            const n = await it.next();
            if (n.done) return;
            yield n.value;
          }
        })();
      }
      pending += piece;
      if (pending.length >= chunkChars) {
        const cut = pending.lastIndexOf("\n");
        if (cut > 0) {
          dispatch(pending.slice(0, cut));
          pending = pending.slice(cut + 1);
        }
      }
      while (inFlight.length >= maxInFlight) await mergeOldest();
    }
    if (pending) dispatch(pending);
    await drain();
    return null;
  } catch (e) {
    await it.return?.(undefined);
    throw e;
  }
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
