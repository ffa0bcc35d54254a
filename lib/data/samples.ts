/**
 * Sample storage: each channel's values as little-endian Float32 (time, latitude, longitude:
 * Float64) blobs in chunks
 * of CHUNK_SAMPLES rows — never one row per sample (a 30-minute, 40-channel, 100 Hz session is
 * 7.2 million values; blobs are ~100× faster to write than narrow rows, shared/notes/mariadb.md).
 * Writes go through the mariadb driver's batch() on the transaction's own connection (binary
 * protocol: no hex-escaping of blobs).
 */
import os from "node:os";
import { QueryTypes, type Sequelize, type Transaction } from "sequelize";
import type { SampleArray } from "@/lib/channels/roles";
import type { ParsedSeries } from "@/lib/ingest/parsed-series";
import type { SampleSink, SinkChannel } from "@/lib/ingest/parse-csv-stream";

export const CHUNK_SAMPLES = 10_000;
/** Rows per batch() call: 64 chunks of at most 80 kB stay far below max_allowed_packet. */
const ROWS_PER_BATCH = 64;
/**
 * Bytes handed to the writer but not yet acknowledged by the server beyond which the parser waits
 * (sink.ready()): ~5 blocks of 10,000 rows of a 40-channel log — slack for the server's hiccups,
 * and a bound on memory whatever the file size.
 */
const MAX_QUEUED_BYTES = 8 * 1024 * 1024;
/** Copy buffers kept for reuse: as many as the queue can hold, plus the one being filled. */
const MAX_SPARE = 8;
const INSERT_CHUNK = "INSERT INTO channel_chunks (channel_id, chunk_index, sample_count, data) VALUES (?, ?, ?, ?)";

if (os.endianness() !== "LE") throw new Error("Lapbench stores samples little-endian; this machine is big-endian");

interface RawConnection {
  batch(sql: string, values: unknown[][]): Promise<unknown>;
  query(sql: string, values?: unknown[]): Promise<unknown>;
}

function rawConnection(t: Transaction): RawConnection {
  const c = (t as unknown as { connection?: RawConnection }).connection;
  if (!c || typeof c.batch !== "function") throw new Error("transaction has no mariadb connection");
  return c;
}

export interface StoredChannel {
  id: number;
  name: string;
  role: string;
  unit: string;
}

/** What the writer cannot see in the blocks alone: per channel (SinkChannel order), the finite samples and their range. */
export interface ChannelStats {
  sampleCount: number;
  /** NaN when sampleCount is 0. */
  min: number;
  max: number;
}

function rateHz(sampleCount: number, durationS: number): number | null {
  return durationS > 0 && sampleCount > 1 ? (sampleCount - 1) / durationS : null;
}

const finiteOrNull = (x: number) => (Number.isFinite(x) ? x : null);

/**
 * Writes a session's samples inside the caller's transaction as blocks of rows arrive (a
 * SampleSink for parseCsvStream), so the database stores one block while the parser fills the
 * next. Nothing is visible before the caller commits; after a failure, call settle() and roll back.
 */
export interface SampleWriter extends SampleSink {
  /** Waits for every write, sets each channel's sample count, rate and range, and returns the channels (time first). */
  finish(stats: ChannelStats[]): Promise<StoredChannel[]>;
  /** Waits until no write of this writer is in flight (errors swallowed): call before rolling back after a failure. */
  settle(): Promise<void>;
}

export function openSampleWriter(sequelize: Sequelize, t: Transaction, sessionId: number): SampleWriter {
  const conn = rawConnection(t);
  let tail: Promise<void> = Promise.resolve();
  let failure: unknown;
  let queuedBytes = 0;
  let waiting: (() => void)[] = [];
  let defs: SinkChannel[] | null = null;
  const ids: number[] = [];
  /** Copy buffers of written blocks, for the next blocks of the usual size (spareBytes). */
  const spare: Buffer[] = [];
  let spareBytes = -1;
  let rows = 0;
  let firstTimeS = NaN;
  let lastTimeS = NaN;

  const wake = () => {
    const w = waiting;
    waiting = [];
    for (const r of w) r();
  };
  /** Run `work` after everything queued before it, once; a failure skips the rest and is reported by ready()/finish(). */
  function enqueue(bytes: number, work: () => Promise<void>): void {
    queuedBytes += bytes;
    tail = tail
      .then(() => (failure === undefined ? work() : undefined))
      .catch((e: unknown) => {
        if (failure === undefined) failure = e;
      })
      .finally(() => {
        queuedBytes -= bytes;
        wake();
      });
  }

  return {
    // One chunk per channel per block: rows reach the server as soon as a chunk is complete, so the
    // write left over when the parse ends is one chunk per channel.
    blockRows: CHUNK_SAMPLES,

    start(channels: SinkChannel[]): void {
      if (defs) throw new Error("the sample writer was started twice");
      defs = [{ name: "Time", role: "time" as SinkChannel["role"], unit: "s", valueType: "f64" }, ...channels];
      const all = defs;
      enqueue(0, async () => {
        // Delete by primary key, and only when there is something to delete: a DELETE that matches no
        // row still gap-locks the end of the session_id index, and two workers ingesting new sessions
        // at once would then deadlock on each other's channel inserts.
        const old = await sequelize.query<{ id: number }>("SELECT id FROM channels WHERE session_id = ?", { replacements: [sessionId], transaction: t, type: QueryTypes.SELECT });
        if (old.length) {
          await sequelize.query(`DELETE FROM channels WHERE id IN (${old.map(() => "?").join(",")})`, { replacements: old.map((r) => r.id), transaction: t, type: QueryTypes.DELETE });
        }
        // The foreign-key check of a channel row share-locks its session row until commit, and the
        // transaction now stays open for the whole parse: the parse's progress updates (another
        // connection) would wait on it and land after "ready". So the channel inserts skip the check
        // (only on this connection, only for these inserts), and finish() takes that lock instead.
        await conn.query("SET SESSION foreign_key_checks = 0");
        try {
          for (const d of all) {
            const [id] = await sequelize.query(
              `INSERT INTO channels (session_id, name, role, unit, source_column, sample_count, value_type, chunk_size) VALUES (?, ?, ?, ?, ?, 0, ?, ?)`,
              { replacements: [sessionId, d.name, d.role, d.unit, d.name, d.valueType, CHUNK_SAMPLES], transaction: t, type: QueryTypes.INSERT },
            );
            ids.push(Number(id));
          }
        } finally {
          await conn.query("SET SESSION foreign_key_checks = 1");
        }
      });
    },

    block(startRow: number, n: number, timeS: Float64Array, values: readonly SampleArray[]): void {
      if (!defs) throw new Error("the sample writer got rows before start()");
      if (startRow !== rows || startRow % CHUNK_SAMPLES !== 0) throw new Error(`rows must arrive in whole chunks, in order: got ${startRow}, expected ${rows}`);
      if (values.length !== defs.length - 1) throw new Error(`expected ${defs.length - 1} channels, got ${values.length}`);
      if (n === 0) return;
      if (rows === 0) firstTimeS = timeS[0];
      lastTimeS = timeS[n - 1];
      rows += n;
      // The views are valid during this call only: copy them into one buffer, reused once written
      // (a steady ~1.7 MB per block of a 40-channel log instead of fresh garbage for the collector).
      const arrays: SampleArray[] = [timeS, ...values];
      let bytes = 0;
      for (const a of arrays) bytes += n * a.BYTES_PER_ELEMENT;
      const buf = (bytes === spareBytes && spare.pop()) || Buffer.allocUnsafe(bytes);
      if (n === CHUNK_SAMPLES) spareBytes = bytes;
      const pieces: { k: number; at: number; data: Buffer }[] = [];
      let off = 0;
      for (let k = 0; k < arrays.length; k++) {
        const a = arrays[k];
        buf.set(new Uint8Array(a.buffer, a.byteOffset, n * a.BYTES_PER_ELEMENT), off);
        const width = a.BYTES_PER_ELEMENT;
        for (let at = 0; at < n; at += CHUNK_SAMPLES) {
          const len = Math.min(n, at + CHUNK_SAMPLES) - at;
          pieces.push({ k, at, data: buf.subarray(off + at * width, off + (at + len) * width) });
        }
        off += n * width;
      }
      enqueue(bytes, async () => {
        try {
          for (let i = 0; i < pieces.length; i += ROWS_PER_BATCH) {
            await conn.batch(
              INSERT_CHUNK,
              pieces.slice(i, i + ROWS_PER_BATCH).map((p) => [ids[p.k], (startRow + p.at) / CHUNK_SAMPLES, p.data.byteLength / arrays[p.k].BYTES_PER_ELEMENT, p.data]),
            );
          }
        } finally {
          // batch() has sent the bytes (the driver copies parameters into its packets).
          if (bytes === spareBytes && spare.length < MAX_SPARE) spare.push(buf);
        }
      });
    },

    async ready(): Promise<void> {
      while (failure === undefined && queuedBytes > MAX_QUEUED_BYTES) await new Promise<void>((r) => waiting.push(r));
      if (failure !== undefined) throw failure;
    },

    async finish(stats: ChannelStats[]): Promise<StoredChannel[]> {
      if (!defs) throw new Error("the sample writer was never started");
      if (stats.length !== defs.length - 1) throw new Error(`expected stats of ${defs.length - 1} channels, got ${stats.length}`);
      await tail;
      if (failure !== undefined) throw failure;
      spare.length = 0; // no more blocks: let the copy buffers go before the analysis
      // What the skipped foreign-key checks would have proved, taken now that the parse is over: the
      // session row exists, share-locked so it cannot go away before the commit.
      const session = await sequelize.query<{ id: number }>("SELECT id FROM ride_sessions WHERE id = ? LOCK IN SHARE MODE", { replacements: [sessionId], transaction: t, type: QueryTypes.SELECT });
      if (session.length === 0) throw new Error(`session ${sessionId} was deleted while its samples were written`);
      const durationS = rows > 1 ? lastTimeS - firstTimeS : 0;
      const all: ChannelStats[] = [{ sampleCount: rows, min: rows ? firstTimeS : NaN, max: rows ? lastTimeS : NaN }, ...stats];
      await conn.batch(
        "UPDATE channels SET sample_count = ?, rate_hz = ?, min_value = ?, max_value = ? WHERE id = ?",
        all.map((st, k) => [st.sampleCount, rateHz(st.sampleCount, durationS), finiteOrNull(st.min), finiteOrNull(st.max), ids[k]]),
      );
      return defs.map((d, k) => ({ id: ids[k], name: d.name, role: d.role, unit: d.unit }));
    },

    async settle(): Promise<void> {
      await tail;
    },
  };
}

/**
 * Replace a session's channels with the parsed series, inside the caller's transaction (so a
 * killed worker leaves nothing half-written). Returns the channels created.
 */
export async function writeSessionSamples(
  sequelize: Sequelize,
  t: Transaction,
  sessionId: number,
  series: ParsedSeries,
  onProgress?: (fraction: number) => void,
): Promise<StoredChannel[]> {
  const writer = openSampleWriter(sequelize, t, sessionId);
  writer.start(series.channels.map((c) => ({ name: c.name, role: c.role, unit: c.unit, valueType: c.values instanceof Float64Array ? "f64" : "f32" })));
  const n = series.rows;
  try {
    for (let start = 0; start < n; start += writer.blockRows) {
      const end = Math.min(n, start + writer.blockRows);
      writer.block(start, end - start, series.timeS.subarray(start, end), series.channels.map((c) => c.values.subarray(start, end)));
      await writer.ready();
      onProgress?.(end / n);
    }
    return await writer.finish(series.channels.map((c) => ({ sampleCount: c.sampleCount, min: c.min, max: c.max })));
  } catch (e) {
    await writer.settle();
    throw e;
  }
}

export interface ChannelInfo {
  id: number;
  name: string;
  role: string;
  unit: string;
  sampleCount: number;
  rateHz: number | null;
  minValue: number | null;
  maxValue: number | null;
  valueType: "f32" | "f64";
}

export async function listChannels(sequelize: Sequelize, sessionId: number): Promise<ChannelInfo[]> {
  const rows = await sequelize.query<{ id: number; name: string; role: string; unit: string; sample_count: number; rate_hz: number | null; min_value: number | null; max_value: number | null; value_type: "f32" | "f64" }>(
    "SELECT id, name, role, unit, sample_count, rate_hz, min_value, max_value, value_type FROM channels WHERE session_id = ? ORDER BY id",
    { replacements: [sessionId], type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ id: r.id, name: r.name, role: r.role, unit: r.unit, sampleCount: r.sample_count, rateHz: r.rate_hz, minValue: r.min_value, maxValue: r.max_value, valueType: r.value_type }));
}

/** Read whole channels back as typed arrays (Float64Array for time, Float32Array otherwise). */
export async function readChannels(sequelize: Sequelize, channels: ChannelInfo[]): Promise<Map<number, Float32Array | Float64Array>> {
  const out = new Map<number, Float32Array | Float64Array>();
  if (channels.length === 0) return out;
  const rows = await sequelize.query<{ channel_id: number; chunk_index: number; data: Buffer }>(
    `SELECT channel_id, chunk_index, data FROM channel_chunks WHERE channel_id IN (${channels.map(() => "?").join(",")}) ORDER BY channel_id, chunk_index`,
    { replacements: channels.map((c) => c.id), type: QueryTypes.SELECT },
  );
  const byId = new Map(channels.map((c) => [c.id, c]));
  const offsets = new Map<number, number>();
  for (const c of channels) out.set(c.id, c.valueType === "f64" ? new Float64Array(0) : new Float32Array(0));
  // Size each array from its chunks' bytes, then copy the chunks in.
  const totals = new Map<number, number>();
  for (const r of rows) totals.set(r.channel_id, (totals.get(r.channel_id) ?? 0) + r.data.byteLength);
  for (const [id, bytes] of totals) {
    const c = byId.get(id)!;
    out.set(id, c.valueType === "f64" ? new Float64Array(bytes / 8) : new Float32Array(bytes / 4));
    offsets.set(id, 0);
  }
  for (const r of rows) {
    const arr = out.get(r.channel_id)!;
    const width = arr.BYTES_PER_ELEMENT;
    const off = offsets.get(r.channel_id)!;
    // Copy through a byte view: blob buffers need not be aligned to the element size.
    new Uint8Array(arr.buffer, off * width, r.data.byteLength).set(r.data);
    offsets.set(r.channel_id, off + r.data.byteLength / width);
  }
  return out;
}

/**
 * Read samples [startIndex, endIndex) of each channel, fetching only the chunks that cover them
 * (chunk_index BETWEEN first AND last — a range of the primary key, so a lap of a long session
 * reads a few blobs, not the whole channel). The range is cut at the end of the stored samples
 * (a channel's sample_count counts finite samples only, so the chunks themselves say where rows end).
 */
export async function readChannelRange(
  sequelize: Sequelize,
  channels: ChannelInfo[],
  startIndex: number,
  endIndex: number,
): Promise<Map<number, Float32Array | Float64Array>> {
  const out = new Map<number, Float32Array | Float64Array>();
  const start = Math.max(0, Math.floor(startIndex));
  const end = Math.max(start, Math.ceil(endIndex));
  const empty = (c: ChannelInfo) => (c.valueType === "f64" ? new Float64Array(0) : new Float32Array(0));
  for (const c of channels) out.set(c.id, empty(c));
  if (channels.length === 0 || end <= start) return out;
  const rows = await sequelize.query<{ channel_id: number; chunk_index: number; data: Buffer }>(
    `SELECT channel_id, chunk_index, data FROM channel_chunks
      WHERE channel_id IN (${channels.map(() => "?").join(",")}) AND chunk_index BETWEEN ? AND ?`,
    { replacements: [...channels.map((c) => c.id), Math.floor(start / CHUNK_SAMPLES), Math.floor((end - 1) / CHUNK_SAMPLES)], type: QueryTypes.SELECT },
  );
  const byId = new Map(channels.map((c) => [c.id, c]));
  const width = (id: number) => (byId.get(id)!.valueType === "f64" ? 8 : 4);
  // Rows stored per channel within the range decide each array's length.
  const stored = new Map<number, number>();
  for (const r of rows) {
    const rowsEnd = Math.min(end, r.chunk_index * CHUNK_SAMPLES + r.data.byteLength / width(r.channel_id));
    stored.set(r.channel_id, Math.max(stored.get(r.channel_id) ?? start, rowsEnd));
  }
  for (const [id, rowsEnd] of stored) {
    const c = byId.get(id)!;
    out.set(id, c.valueType === "f64" ? new Float64Array(rowsEnd - start) : new Float32Array(rowsEnd - start));
  }
  for (const r of rows) {
    const arr = out.get(r.channel_id)!;
    const w = arr.BYTES_PER_ELEMENT;
    const chunkStart = r.chunk_index * CHUNK_SAMPLES;
    const from = Math.max(start, chunkStart);
    const to = Math.min(start + arr.length, chunkStart + r.data.byteLength / w);
    if (to <= from) continue;
    // Copy through a byte view: blob buffers need not be aligned to the element size.
    new Uint8Array(arr.buffer, (from - start) * w, (to - from) * w).set(r.data.subarray((from - chunkStart) * w, (to - chunkStart) * w));
  }
  return out;
}
