/**
 * Worker threads (node:worker_threads) that read ranges of a CSV's rows in parallel for the ingest
 * job (lib/ingest/parse-csv-chunk.ts). The pool is started once per process and reused by every
 * job; its threads do not keep the process alive.
 */
import path from "node:path";
import { Worker } from "node:worker_threads";
import type { CsvChunkResult, CsvChunkRunner, CsvChunkTask } from "../../lib/ingest/parse-csv-chunk";

/** With threads set (LAPBENCH_CSV_THREADS), files from this size on are read on them; smaller ones on the job's own thread. */
export const THREADS_MIN_BYTES = 8 * 1024 * 1024;
/** A range's rows die young: a young generation that holds them spares the collector promoting them. */
const YOUNG_GENERATION_MB = Number(process.env.LAPBENCH_CSV_YOUNG_MB ?? 64);

export interface CsvThreadPool extends CsvChunkRunner {
  /** Resolves once every thread has loaded its code (a tiny range read on each). */
  warm(): Promise<void>;
  close(): Promise<void>;
}

interface Slot {
  worker: Worker;
  busy: number;
}

export function createCsvThreadPool(threads = Math.max(1, defaultThreads())): CsvThreadPool {
  const script = path.join(__dirname, "csv-chunk-thread.ts");
  const waiting = new Map<number, { resolve: (r: CsvChunkResult) => void; reject: (e: unknown) => void; slot: Slot }>();
  let nextId = 1;
  let closed = false;
  const slots: Slot[] = [];
  for (let i = 0; i < threads; i++) {
    // The thread loads its TypeScript through tsx's require hook, whatever started this process
    // (on Node 20 a thread's `--import tsx` comes too late for its own entry file).
    const worker = new Worker(`require("tsx/cjs"); require(${JSON.stringify(script)});`, { eval: true, resourceLimits: { maxYoungGenerationSizeMb: YOUNG_GENERATION_MB } });
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
    async warm() {
      const cfg = { delimiter: ",", fieldCount: 2, decimalComma: false, timeIndex: 0, timeHeader: "t", timeFormat: "seconds" as const, keepFirstOfDuplicates: false, maxRows: 10, channels: [{ index: 1, header: "v", factor: 1, offset: 0, isOther: false }] };
      await Promise.all(slots.map(() => this.run({ cfg, roles: ["other"], text: "0,1\n1,2", t0: 0 })));
    },
    async close() {
      closed = true;
      await Promise.all(slots.map((s) => s.worker.terminate()));
    },
  };
}

/**
 * Threads in the pool: LAPBENCH_CSV_THREADS, else none. On the 2-core machine of `npm run
 * bench:ingest` the threads made ingest slower (50 MB log, worker's parse + write: 1.14 s on the
 * job's own thread, 1.77 s with 1 thread, 1.85 s with 2) and added 150–260 MiB of peak RSS: the
 * job's thread still decodes, merges and writes, and MariaDB needs a core too. Set it on machines
 * with cores to spare, and measure there first.
 */
export function defaultThreads(): number {
  const set = process.env.LAPBENCH_CSV_THREADS;
  return set ? Math.max(0, Math.min(16, Math.floor(Number(set)) || 0)) : 0;
}

let shared: CsvThreadPool | undefined;
/** The process's pool, started on first use; null when it would have no threads. */
export function sharedCsvThreadPool(): CsvThreadPool | null {
  if (defaultThreads() === 0) return null;
  shared ??= createCsvThreadPool();
  return shared;
}
