/**
 * One ingest job: stream the stored file through the parser chosen at import (CSV with the
 * session's mapping, GPX, NMEA 0183), derive the analysis, and write everything in one
 * transaction — so a failure or a killed worker leaves no partial data visible. Bad input marks
 * the session failed with the parser's specific message; the stored file stays for a re-import.
 */
import { Readable } from "node:stream";
import type { ReadableStream as WebReadableStream } from "node:stream/web";
import type { Sequelize, Transaction } from "sequelize";
import { initModels, LogFile, RideSession, Track } from "../../models";
import { parseCsvStream } from "../../lib/ingest/parse-csv-stream";
import type { CsvChunkRunner } from "../../lib/ingest/parse-csv-chunk";
import { sharedCsvThreadPool, THREADS_MIN_BYTES } from "./csv-thread-pool";
import { parseGpx } from "../../lib/ingest/parse-gpx";
import { GPX_MAX_BYTES } from "../../lib/ingest/limits";
import { parseNmea } from "../../lib/ingest/parse-nmea";
import { sessionStartTime } from "../../lib/ingest/session-start-time";
import { IngestError } from "../../lib/ingest/ingest-error";
import { LIMITS, type IngestLimits } from "../../lib/ingest/limits";
import type { Mapping } from "../../lib/ingest/mapping";
import type { ParsedSeries } from "../../lib/ingest/parsed-series";
import type { ImportPreview } from "../../lib/data/imports";
import { openSampleWriter, writeSessionSamples } from "../../lib/data/samples";
import { ANALYSED_ROLES, analyseAndStore } from "./analyse-session";
import { notifySessionReady } from "../../lib/mail/session-ready";

export class RetryableError extends Error {}

/** Milliseconds per stage of one job, for the worker's log and the benchmark. */
export interface IngestTimings {
  /** Session and file rows read, the stored file opened. */
  openMs?: number;
  /** Parse, and for CSV the chunk writes that overlap it (GPX and NMEA write after parsing). */
  parseWriteMs?: number;
  /** From the end of the parse to the last chunk written and the channel rows updated. */
  writeTailMs?: number;
  /** Laps, findings and the session marked ready (the page analyses are not in it). */
  analysisMs?: number;
  /** Drive slip, Suspension use, Gears and Rider brief computed and stored (lib/data/session-analysis.ts). */
  pagesMs?: number;
  commitMs?: number;
}

export interface IngestJobOptions {
  limits?: IngestLimits;
  /** Test hook: called after parsing (inside the write transaction for CSV, before it otherwise). */
  afterParse?: () => Promise<void>;
  /** Filled in with the stage times. */
  timings?: IngestTimings;
  /**
   * Where a CSV's rows are read: on worker threads (the process's pool from THREADS_MIN_BYTES on,
   * by default), or `false` for the job's own thread. Same results either way.
   */
  csvThreads?: { runner: CsvChunkRunner; chunkChars?: number } | false;
}

/**
 * Progress updates of the session row, at most one every 400 ms, one at a time and in order:
 * `settle()` waits for the last, so none can land after the write transaction's lock on the row
 * (it would wait for the commit and then set an old percentage over "ready"). A failed update is
 * only logged: progress is a hint, not worth failing the job or crashing the worker for.
 */
function progressUpdater(sequelize: Sequelize, sessionId: number) {
  let last = 0;
  let lastPct = -1;
  let chain: Promise<void> = Promise.resolve();
  const set = (pct: number, force = false): Promise<void> => {
    const now = Date.now();
    const p = Math.max(0, Math.min(99, Math.round(pct)));
    if (!force && (now - last < 400 || p === lastPct)) return chain;
    last = now;
    lastPct = p;
    chain = chain.then(() =>
      RideSession.update({ progress: p }, { where: { id: sessionId } }).then(
        () => undefined,
        (e: unknown) => console.log(`[ingest] session ${sessionId}: progress update failed: ${e instanceof Error ? e.message : String(e)}`),
      ),
    );
    return chain;
  };
  return Object.assign(set, { settle: () => chain });
}

async function openStored(url: string): Promise<Readable> {
  let res: Response;
  try {
    res = await fetch(url);
  } catch (e) {
    throw new RetryableError(`the file store did not answer: ${(e as Error).message}`);
  }
  if (res.status === 404) throw new IngestError("EMPTY_FILE", "The uploaded file is no longer in storage; upload it again.");
  if (!res.ok || !res.body) throw new RetryableError(`the file store answered ${res.status}`);
  return Readable.fromWeb(res.body as unknown as WebReadableStream<Uint8Array>);
}

export async function runIngestJob(sequelize: Sequelize, sessionId: number, opts: IngestJobOptions = {}): Promise<"ready" | "failed"> {
  const timings = opts.timings ?? {};
  let t0 = performance.now();
  initModels(sequelize);
  const session = await RideSession.findByPk(sessionId);
  if (!session) return "failed";
  const log = session.logFileId ? await LogFile.findByPk(session.logFileId) : null;
  if (!log?.url) {
    await session.update({ status: "failed", statusReason: "The uploaded file is missing from storage; upload it again." });
    return "failed";
  }
  const preview = (session.summary as { preview?: ImportPreview } | null)?.preview;
  const format = preview?.format ?? "csv";
  const limits = opts.limits ?? LIMITS;
  await session.update({ status: "parsing", statusReason: null, progress: 1 });
  const setProgress = progressUpdater(sequelize, sessionId);
  const totalBytes = Math.max(1, Number(log.bytes));

  /** The end of every format's transaction: the test pause, the analysis, the session marked ready. */
  async function analyseAndFinish(t: Transaction, parsed: ParsedSeries): Promise<void> {
    // Tests kill the worker here, mid-transaction, to prove nothing partial becomes visible.
    const pauseMs = Number(process.env.LAPBENCH_TEST_PAUSE_BEFORE_COMMIT_MS ?? 0);
    if (pauseMs > 0) {
      console.log(`[worker] session ${sessionId}: samples written, pausing ${pauseMs} ms before commit`);
      await new Promise((r) => setTimeout(r, pauseMs));
    }
    const ta = performance.now();
    const summary = await analyseAndStore(sequelize, t, session!, parsed);
    // The track (chosen at import or found by the analysis) gives the zone of zone-less times.
    const trackId = (await RideSession.findByPk(sessionId, { attributes: ["trackId"], transaction: t }))?.trackId;
    const zone = trackId ? (await Track.findByPk(trackId, { attributes: ["timeZone"], transaction: t }))?.timeZone : null;
    const startedAt = sessionStartTime(parsed.metadata, zone);
    const durationS = parsed.rows > 1 ? parsed.timeS[parsed.rows - 1] - parsed.timeS[0] : 0;
    await RideSession.update(
      {
        status: "ready",
        progress: 100,
        statusReason: null,
        durationS,
        ...(startedAt && !session!.startedAt ? { startedAt } : {}),
      },
      { where: { id: sessionId }, transaction: t },
    );
    if (parsed.notes?.length) {
      // What the reader skipped or corrected, shown on the session page.
      const row = await RideSession.findByPk(sessionId, { attributes: ["summary"], transaction: t });
      await RideSession.update({ summary: { ...((row?.summary as object | null) ?? {}), importNotes: parsed.notes } }, { where: { id: sessionId }, transaction: t });
    }
    const pagesMs = summary.pages?.ms ?? 0;
    timings.analysisMs = performance.now() - ta - pagesMs;
    timings.pagesMs = pagesMs;
  }

  try {
    const stream = await openStored(log.url);
    timings.openMs = performance.now() - t0;
    t0 = performance.now();
    const onProgress = (p: { bytesRead: number }) => void setProgress((p.bytesRead / totalBytes) * 80);
    let tCallbackEnd = 0;
    if (format === "csv") {
      if (!session.mapping) throw new IngestError("MAPPING_MISMATCH", "This CSV has no column mapping yet; open the session and map its columns.");
      const mapping = session.mapping as Mapping;
      // One transaction from the first parsed block to the analysis: chunks are written while the
      // rest of the file is parsed (the database works on the other core), and only the channels
      // the analysis reads stay in memory. Bad input found late rolls every chunk back.
      await sequelize.transaction(async (t) => {
        const writer = openSampleWriter(sequelize, t, sessionId);
        let parsed: ParsedSeries;
        try {
          const pool = opts.csvThreads === undefined && Number(log.bytes) >= THREADS_MIN_BYTES ? sharedCsvThreadPool() : null;
          const threads = opts.csvThreads ?? (pool ? { runner: pool } : false);
          parsed = await parseCsvStream(stream, mapping, limits, onProgress, {
            fileName: log.name,
            sink: writer,
            keep: (role) => ANALYSED_ROLES.has(role),
            expectedBytes: Number(log.bytes),
            ...(threads ? { threads: threads.runner, chunkChars: threads.chunkChars } : {}),
          });
          timings.parseWriteMs = performance.now() - t0;
          t0 = performance.now();
          // Before finish(): it share-locks the session row, which an update from outside would wait on.
          await setProgress(85, true);
          await setProgress.settle();
          await opts.afterParse?.();
          await writer.finish(parsed.channels.map((c) => ({ sampleCount: c.sampleCount, min: c.min, max: c.max })));
          timings.writeTailMs = performance.now() - t0;
        } catch (e) {
          // The rollback must follow the writes still in flight on this connection.
          await writer.settle();
          throw e;
        }
        await analyseAndFinish(t, parsed);
        tCallbackEnd = performance.now();
      });
    } else {
      let parsed: ParsedSeries;
      if (format === "nmea") {
        parsed = await parseNmea(stream, { fileName: log.name, limits, onProgress });
      } else {
        // GPX is parsed whole: stop reading past its own limit, parseGpx words the refusal.
        const gpxMax = Math.min(limits.maxBytes, limits.maxGpxBytes ?? GPX_MAX_BYTES);
        const parts: Buffer[] = [];
        let size = 0;
        for await (const chunk of stream) {
          size += (chunk as Buffer).length;
          parts.push(chunk as Buffer);
          if (size > gpxMax) break;
        }
        parsed = parseGpx(Buffer.concat(parts), { fileName: log.name, limits });
      }
      await setProgress(85, true);
      await setProgress.settle();
      await opts.afterParse?.();
      await sequelize.transaction(async (t) => {
        // No progress updates in here: the session row is locked (foreign keys of the new rows)
        // until the commit, so an update from another connection would wait for it.
        await writeSessionSamples(sequelize, t, sessionId, parsed);
        timings.parseWriteMs = performance.now() - t0;
        await analyseAndFinish(t, parsed);
        tCallbackEnd = performance.now();
      });
    }
    timings.commitMs = performance.now() - tCallbackEnd;
    await notifySessionReady(sequelize, sessionId); // "session ready" mail; never throws
    return "ready";
  } catch (e) {
    await setProgress.settle();
    if (e instanceof IngestError) {
      // The refusal's code (and, for repeated time stamps, the count) lets the session page offer the way out.
      const row = await RideSession.findByPk(sessionId, { attributes: ["summary"] });
      const failure = { code: e.code, ...(e.duplicateRows ? { duplicateRows: e.duplicateRows } : {}) };
      await RideSession.update({ status: "failed", statusReason: e.message, progress: 0, summary: { ...((row?.summary as object | null) ?? {}), failure } }, { where: { id: sessionId } });
      return "failed";
    }
    throw e;
  }
}
