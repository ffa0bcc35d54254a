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
import type { ParsedSeries } from "@/lib/ingest/parsed-series";

export const CHUNK_SAMPLES = 10_000;
/** Rows per batch() call: 40 channels × 40 kB stays far below max_allowed_packet. */
const ROWS_PER_BATCH = 64;

if (os.endianness() !== "LE") throw new Error("Lapbench stores samples little-endian; this machine is big-endian");

interface RawConnection {
  batch(sql: string, values: unknown[][]): Promise<unknown>;
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

function rateHz(sampleCount: number, durationS: number): number | null {
  return durationS > 0 && sampleCount > 1 ? (sampleCount - 1) / durationS : null;
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
  // Delete by primary key, and only when there is something to delete: a DELETE that matches no
  // row still gap-locks the end of the session_id index, and two workers ingesting new sessions
  // at once would then deadlock on each other's channel inserts.
  const old = await sequelize.query<{ id: number }>("SELECT id FROM channels WHERE session_id = ?", { replacements: [sessionId], transaction: t, type: QueryTypes.SELECT });
  if (old.length) {
    await sequelize.query(`DELETE FROM channels WHERE id IN (${old.map(() => "?").join(",")})`, { replacements: old.map((r) => r.id), transaction: t, type: QueryTypes.DELETE });
  }
  const durationS = series.rows > 1 ? series.timeS[series.rows - 1] - series.timeS[0] : 0;
  const defs = [
    { name: "Time", role: "time", unit: "s", values: series.timeS as Float64Array | Float32Array, sampleCount: series.rows, min: series.timeS[0] ?? NaN, max: series.timeS[series.rows - 1] ?? NaN, valueType: "f64" },
    ...series.channels.map((c) => ({ name: c.name, role: c.role, unit: c.unit, values: c.values, sampleCount: c.sampleCount, min: c.min, max: c.max, valueType: c.values instanceof Float64Array ? "f64" : "f32" })),
  ];
  const stored: StoredChannel[] = [];
  const conn = rawConnection(t);
  let done = 0;
  for (const d of defs) {
    const [id] = await sequelize.query(
      `INSERT INTO channels (session_id, name, role, unit, source_column, sample_count, rate_hz, min_value, max_value, value_type, chunk_size)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      {
        replacements: [sessionId, d.name, d.role, d.unit, d.name, d.sampleCount, rateHz(d.sampleCount, durationS), Number.isFinite(d.min) ? d.min : null, Number.isFinite(d.max) ? d.max : null, d.valueType, CHUNK_SAMPLES],
        transaction: t,
        type: QueryTypes.INSERT,
      },
    );
    const channelId = Number(id);
    stored.push({ id: channelId, name: d.name, role: d.role, unit: d.unit });
    const n = series.rows;
    let batch: unknown[][] = [];
    for (let start = 0, idx = 0; start < n; start += CHUNK_SAMPLES, idx++) {
      const end = Math.min(n, start + CHUNK_SAMPLES);
      const view = d.values.subarray(start, end);
      batch.push([channelId, idx, end - start, Buffer.from(view.buffer, view.byteOffset, view.byteLength)]);
      if (batch.length >= ROWS_PER_BATCH) {
        await conn.batch("INSERT INTO channel_chunks (channel_id, chunk_index, sample_count, data) VALUES (?, ?, ?, ?)", batch);
        batch = [];
      }
    }
    if (batch.length) await conn.batch("INSERT INTO channel_chunks (channel_id, chunk_index, sample_count, data) VALUES (?, ?, ?, ?)", batch);
    done++;
    onProgress?.(done / defs.length);
  }
  return stored;
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
