/**
 * The sample-block store of the CSV reader: where parsed rows (Float64 time, one Float32 or Float64
 * array per channel) go, block by block.
 *
 * Without a sink, samples fill fixed blocks (BLOCK_ROWS), joined into one array per channel at the
 * end, freeing the blocks as it goes: the peak is the output plus the blocks the collector has not
 * freed yet, not the up-to-twice-the-output of doubling arrays. With a sink, every `sink.blockRows`
 * rows go to the sink as soon as they are complete; the channels the caller keeps fill one array
 * each, sized from the file's expected size, and the others refill one block each, so memory
 * follows the kept channels only.
 */
import { sampleArrayFor, type SampleArray } from "@/lib/channels/roles";
import type { ParsedChannel } from "./parsed-series";

/**
 * Rows per storage block. Samples go into fixed blocks, joined once at the end channel by channel,
 * instead of doubling arrays and trimming them, which held up to ~2× the output at once (parse of a
 * 200 MB log: 440 → 387 MiB peak RSS). Blocks of 256 kB and more are mmap'ed by malloc and go back
 * to the system once freed; with 64 kB blocks the peak stayed at 440 MiB.
 */
export const BLOCK_ROWS = 65_536;

/** A channel as the sink learns of it before the first row: same order as ParsedSeries.channels. */
export interface SinkChannel {
  name: string;
  role: ParsedChannel["role"];
  unit: string;
  valueType: "f32" | "f64";
}

/** Where the CSV reader sends complete blocks of rows as it goes. */
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

export interface SampleBlockStoreOptions {
  sink?: SampleSink;
  /** Per channel: keep its samples in memory (with a sink; without one every channel is kept). */
  keep: boolean[];
  /** The file's size in bytes, when known: kept arrays are sized from it once. */
  expectedBytes?: number;
  /** Bytes of the file behind the rows stored so far (for that estimate). */
  bytesDone: () => number;
  /** Rows per block without a sink (default BLOCK_ROWS): a range of known length takes one block of its size. */
  blockRows?: number;
}

export class SampleBlockStore {
  /** The block being filled: rows [0, pos) hold samples. Read by the row reader per row. */
  timeS: Float64Array;
  values: SampleArray[];
  pos = 0;
  /** Rows in the current block when full (always blockRows without a sink). */
  curRows: number;
  /** Rows stored in all. */
  rows = 0;
  private readonly roles: ParsedChannel["role"][];
  private readonly sink?: SampleSink;
  private readonly sinkRows: number;
  private readonly blockRows: number;
  private readonly expectedBytes: number;
  private readonly bytesDone: () => number;
  /** Rows of the current block already handed to the sink. */
  private sent = 0;
  // Without a sink: full blocks so far, joined at the end.
  private timeBlocks: Float64Array[] = [];
  private valueBlocks: SampleArray[][];
  // With a sink: time and the kept channels live in one array each, sized from the file's size
  // once the first block shows the bytes per row, and the block being filled is a view of it — no
  // join at the end, whose blocks-plus-result held twice the kept samples (200 MB log: ~140 MB of
  // arrays instead of ~70). Other channels refill one block each, so they allocate nothing after
  // the first block.
  private keptTime: Float64Array | null;
  private readonly keptValues: (SampleArray | null)[];

  constructor(roles: ParsedChannel["role"][], options: SampleBlockStoreOptions) {
    this.roles = roles;
    this.sink = options.sink;
    this.expectedBytes = options.expectedBytes ?? 0;
    this.bytesDone = options.bytesDone;
    const sinkRows = this.sink ? this.sink.blockRows : 0;
    if (this.sink && !(Number.isInteger(sinkRows) && sinkRows > 0)) throw new Error(`sink.blockRows must be a positive integer, got ${sinkRows}`);
    this.sinkRows = sinkRows;
    // Storage blocks hold whole sink blocks, so each sink block is a view of one storage block.
    this.blockRows = this.sink ? Math.ceil(BLOCK_ROWS / sinkRows) * sinkRows : Math.max(1, options.blockRows ?? BLOCK_ROWS);
    this.curRows = this.blockRows;
    this.valueBlocks = roles.map(() => []);
    this.keptTime = this.sink ? new Float64Array(this.blockRows) : null;
    this.keptValues = roles.map((role, k) => (this.sink && options.keep[k] ? sampleArrayFor(role, this.blockRows) : null));
    this.timeS = this.keptTime ?? new Float64Array(this.blockRows);
    this.values = roles.map((role, k) => this.keptValues[k] ?? sampleArrayFor(role, this.blockRows));
  }

  /** Make room for one more row in the current block (call before writing timeS[pos], values[k][pos]). */
  room(): void {
    if (this.pos === this.curRows) this.nextBlock();
  }

  /** The row at `pos` is written. */
  commitRow(): void {
    this.pos++;
    this.rows++;
    if (this.sinkRows && this.pos - this.sent === this.sinkRows) this.send();
  }

  /** Append `n` rows given as whole arrays (rows parsed elsewhere), block by block. */
  append(timeS: Float64Array, values: readonly SampleArray[], n: number): void {
    const nch = this.values.length;
    let at = 0;
    while (at < n) {
      this.room();
      let take = Math.min(this.curRows - this.pos, n - at);
      if (this.sinkRows) take = Math.min(take, this.sinkRows - (this.pos - this.sent));
      this.timeS.set(timeS.subarray(at, at + take), this.pos);
      for (let k = 0; k < nch; k++) this.values[k].set(values[k].subarray(at, at + take), this.pos);
      this.pos += take;
      this.rows += take;
      at += take;
      if (this.sinkRows && this.pos - this.sent === this.sinkRows) this.send();
    }
  }

  /** Hand rows [sent, pos) of the current block to the sink. */
  private send(): void {
    const from = this.sent;
    const to = this.pos;
    this.sent = this.pos;
    this.sink!.block(
      this.rows - (to - from),
      to - from,
      this.timeS.subarray(from, to),
      this.values.map((v) => v.subarray(from, to)),
    );
  }

  private nextBlock(): void {
    this.sent = 0;
    this.pos = 0;
    const keptTime = this.keptTime;
    if (!keptTime) {
      this.timeBlocks.push(this.timeS);
      this.timeS = new Float64Array(this.blockRows);
      for (let k = 0; k < this.values.length; k++) this.valueBlocks[k].push(this.values[k]);
      this.values = this.roles.map((role) => sampleArrayFor(role, this.blockRows));
      return;
    }
    // `rows` is where the new block starts.
    if (keptTime.length < this.rows + this.sinkRows) this.growKept();
    const rows = this.rows;
    this.curRows = Math.min(this.blockRows, this.keptTime!.length - rows);
    this.timeS = this.keptTime!.subarray(rows, rows + this.curRows);
    // Channels not kept refill the same block: the sink copied what it was handed.
    this.values = this.values.map((v, k) => this.keptValues[k]?.subarray(rows, rows + this.curRows) ?? v);
  }

  /** Room for the rest of the file: rows so far scaled by the bytes still to come, +5% for longer lines later on. */
  private growKept(): void {
    const rows = this.rows;
    const done = this.bytesDone();
    const estimate = this.expectedBytes > done && done > 0 ? Math.ceil(((rows * this.expectedBytes) / done) * 1.05) : 2 * rows;
    const cap = Math.ceil(Math.max(rows + this.blockRows, estimate) / this.sinkRows) * this.sinkRows;
    const t = new Float64Array(cap);
    t.set(this.keptTime!.subarray(0, rows));
    this.keptTime = t;
    for (let k = 0; k < this.keptValues.length; k++) {
      const old = this.keptValues[k];
      if (!old) continue;
      const a = sampleArrayFor(this.roles[k], cap);
      a.set(old.subarray(0, rows));
      this.keptValues[k] = a;
    }
  }

  /**
   * The stored rows: with a sink, the last partial block is sent and the kept channels come back
   * as views (the others empty); without one, the blocks are joined one channel at a time.
   */
  async finish(): Promise<{ timeS: Float64Array; values: SampleArray[] }> {
    const rows = this.rows;
    if (this.keptTime) {
      if (this.pos > this.sent) this.send();
      const out = { timeS: this.keptTime.subarray(0, rows), values: this.roles.map((role, k) => this.keptValues[k]?.subarray(0, rows) ?? sampleArrayFor(role, 0)) };
      this.values = [];
      return out;
    }
    // Join the blocks, one channel at a time, dropping each channel's blocks once copied. The
    // yield between channels lets V8's collector run its tasks and free the dropped blocks; joined
    // synchronously, they outlived the join (200 MB log: 414 MiB peak without the yield, 387 with).
    const yieldToLoop = () => new Promise<void>((r) => setImmediate(r));
    const pos = this.pos;
    this.timeBlocks.push(this.timeS.subarray(0, pos));
    const timeS = joinBlocks(this.timeBlocks, new Float64Array(rows));
    this.timeBlocks = [];
    const values: SampleArray[] = [];
    for (let k = 0; k < this.roles.length; k++) {
      this.valueBlocks[k].push(this.values[k].subarray(0, pos));
      const joined = joinBlocks(this.valueBlocks[k], sampleArrayFor(this.roles[k], rows));
      this.valueBlocks[k] = [];
      this.values[k] = joined; // the current block is no longer referenced either
      values.push(joined);
      await yieldToLoop();
    }
    this.values = [];
    return { timeS, values };
  }

  /** Like finish() without a sink, with no yields (a worker thread's chunk; its blocks are few). */
  joinNow(): { timeS: Float64Array; values: SampleArray[] } {
    const rows = this.rows;
    if (this.timeBlocks.length === 0) return { timeS: this.timeS.subarray(0, rows), values: this.values.map((v) => v.subarray(0, rows)) };
    this.timeBlocks.push(this.timeS.subarray(0, this.pos));
    const timeS = joinBlocks(this.timeBlocks, new Float64Array(rows));
    const values = this.roles.map((role, k) => {
      this.valueBlocks[k].push(this.values[k].subarray(0, this.pos));
      return joinBlocks(this.valueBlocks[k], sampleArrayFor(role, rows));
    });
    this.timeBlocks = [];
    this.valueBlocks = this.roles.map(() => []);
    return { timeS, values };
  }
}

function joinBlocks<T extends SampleArray>(blocks: SampleArray[], into: T): T {
  let at = 0;
  for (const b of blocks) {
    into.set(b, at);
    at += b.length;
  }
  return into;
}
