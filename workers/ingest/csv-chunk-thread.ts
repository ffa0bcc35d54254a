/**
 * A worker thread of the CSV thread pool: reads the ranges of rows it is sent (parseCsvChunk) and
 * hands the samples back without copying them (their buffers are transferred).
 */
import { parentPort } from "node:worker_threads";
import { parseCsvChunk, type CsvChunkTask } from "../../lib/ingest/parse-csv-chunk";

const port = parentPort;
if (!port) throw new Error("csv-chunk-thread.ts runs as a worker thread only");
port.on("message", (msg: { id: number; task: CsvChunkTask }) => {
  let result;
  try {
    result = parseCsvChunk(msg.task);
  } catch {
    result = { ok: false as const };
  }
  const transfer = result.ok ? [result.timeS.buffer as ArrayBuffer, ...result.values.map((v) => v.buffer as ArrayBuffer)] : [];
  port.postMessage({ id: msg.id, result }, transfer);
});
