/**
 * Worker threads (node:worker_threads) that read ranges of a CSV's rows in parallel for the ingest
 * job (lib/ingest/parse-csv-chunk.ts). The pool is started once per process and reused by every
 * job; its threads do not keep the process alive.
 */
import os from "node:os";
import path from "node:path";
import { Worker } from "node:worker_threads";
import type { CsvChunkResult, CsvChunkRunner, CsvChunkTask } from "../../lib/ingest/parse-csv-chunk";

/** Files from this size on are read on threads; smaller ones on the job's own thread (a thread's start costs more than it saves). */
export const THREADS_MIN_BYTES = 8 * 1024 * 1024;

export interface CsvThreadPool extends CsvChunkRunner {
  close(): Promise<void>;
}

interface Slot {
  worker: Worker;
  busy: number;
}

export function createCsvThreadPool(threads = defaultThreads()): CsvThreadPool {
  const script = path.join(__dirname, "csv-chunk-thread.ts");
  const waiting = new Map<number, { resolve: (r: CsvChunkResult) => void; reject: (e: unknown) => void; slot: Slot }>();
  let nextId = 1;
  let closed = false;
  const slots: Slot[] = [];
  for (let i = 0; i < threads; i++) {
    // The thread loads its TypeScript through tsx's require hook, whatever started this process
    // (on Node 20 a thread's `--import tsx` comes too late for its own entry file).
    const worker = new Worker(`require("tsx/cjs"); require(${JSON.stringify(script)});`, { eval: true });
    worker.unref();
    const slot: Slot = { worker, busy: 0 };
    worker.on("message", (msg: { id: number; result: CsvChunkResult }) => {
      const w = waiting.get(msg.id);
      if (!w) return;
      waiting.delete(msg.id);
      if (--slot.busy === 0) worker.unref();
      w.resolve(msg.result);
    });
    const failAll = (e: unknown) => {
      console.error(`[csv threads] ${e instanceof Error ? e.message : String(e)}`);
      for (const [id, w] of waiting) {
        if (w.slot !== slot) continue;
        waiting.delete(id);
        w.reject(e);
      }
      slot.busy = Number.POSITIVE_INFINITY; // no more work for a thread that died
    };
    worker.on("error", failAll);
    worker.on("exit", (code) => {
      if (!closed) failAll(new Error(`a CSV reader thread stopped (exit code ${code})`));
    });
    slots.push(slot);
  }
  return {
    threads,
    run(task: CsvChunkTask): Promise<CsvChunkResult> {
      if (closed) return Promise.reject(new Error("the CSV thread pool is closed"));
      const slot = slots.reduce((a, b) => (b.busy < a.busy ? b : a));
      if (!Number.isFinite(slot.busy)) return Promise.reject(new Error("no CSV reader thread is running"));
      const id = nextId++;
      if (slot.busy++ === 0) slot.worker.ref(); // a job waiting on a thread keeps the process up

      return new Promise<CsvChunkResult>((resolve, reject) => {
        waiting.set(id, { resolve, reject, slot });
        slot.worker.postMessage({ id, task });
      });
    },
    async close() {
      closed = true;
      await Promise.all(slots.map((s) => s.worker.terminate()));
    },
  };
}

/** One thread per core, at most 4: the job's own thread merges and writes meanwhile. */
function defaultThreads(): number {
  return Math.max(1, Math.min(4, os.availableParallelism()));
}

let shared: CsvThreadPool | undefined;
/** The process's pool, started on first use. */
export function sharedCsvThreadPool(): CsvThreadPool {
  shared ??= createCsvThreadPool();
  return shared;
}
