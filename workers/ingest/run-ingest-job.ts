/**
 * One ingest job: stream the stored file through the parser chosen at import (CSV with the
 * session's mapping, GPX, NMEA 0183), derive the analysis, and write everything in one
 * transaction — so a failure or a killed worker leaves no partial data visible. Bad input marks
 * the session failed with the parser's specific message; the stored file stays for a re-import.
 */
import { Readable } from "node:stream";
import type { ReadableStream as WebReadableStream } from "node:stream/web";
import type { Sequelize } from "sequelize";
import { initModels, LogFile, RideSession } from "../../models";
import { parseCsvStream } from "../../lib/ingest/parse-csv-stream";
import { parseGpx } from "../../lib/ingest/parse-gpx";
import { parseNmea } from "../../lib/ingest/parse-nmea";
import { IngestError } from "../../lib/ingest/ingest-error";
import { LIMITS, type IngestLimits } from "../../lib/ingest/limits";
import type { Mapping } from "../../lib/ingest/mapping";
import type { ParsedSeries } from "../../lib/ingest/parsed-series";
import type { ImportPreview } from "../../lib/data/imports";
import { writeSessionSamples } from "../../lib/data/samples";
import { analyseAndStore } from "./analyse-session";

export class RetryableError extends Error {}

export interface IngestJobOptions {
  limits?: IngestLimits;
  /** Test hook: called after parsing, before the write transaction. */
  afterParse?: () => Promise<void>;
}

function progressUpdater(sequelize: Sequelize, sessionId: number) {
  let last = 0;
  let lastPct = -1;
  return async (pct: number, force = false) => {
    const now = Date.now();
    const p = Math.max(0, Math.min(99, Math.round(pct)));
    if (!force && (now - last < 400 || p === lastPct)) return;
    last = now;
    lastPct = p;
    await RideSession.update({ progress: p }, { where: { id: sessionId } });
  };
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

  try {
    const stream = await openStored(log.url);
    const onProgress = (p: { bytesRead: number }) => void setProgress((p.bytesRead / totalBytes) * 80);
    let parsed: ParsedSeries;
    if (format === "csv") {
      if (!session.mapping) throw new IngestError("MAPPING_MISMATCH", "This CSV has no column mapping yet; open the session and map its columns.");
      parsed = await parseCsvStream(stream, session.mapping as Mapping, limits, onProgress, { fileName: log.name });
    } else if (format === "nmea") {
      parsed = await parseNmea(stream, { fileName: log.name, limits, onProgress });
    } else {
      const parts: Buffer[] = [];
      let size = 0;
      for await (const chunk of stream) {
        size += (chunk as Buffer).length;
        if (size > limits.maxBytes) throw new IngestError("FILE_TOO_LARGE", `"${log.name}" is larger than the ${Math.round(limits.maxBytes / 1048576)} MB limit.`);
        parts.push(chunk as Buffer);
      }
      parsed = parseGpx(Buffer.concat(parts), { fileName: log.name, limits });
    }
    await setProgress(85, true);
    await opts.afterParse?.();

    await sequelize.transaction(async (t) => {
      // No progress updates in here: the new channel rows hold a lock on the session row (foreign
      // key), so an update from another connection would wait for this transaction.
      await writeSessionSamples(sequelize, t, sessionId, parsed);
      // Tests kill the worker here, mid-transaction, to prove nothing partial becomes visible.
      const pauseMs = Number(process.env.LAPBENCH_TEST_PAUSE_BEFORE_COMMIT_MS ?? 0);
      if (pauseMs > 0) {
        console.log(`[worker] session ${sessionId}: samples written, pausing ${pauseMs} ms before commit`);
        await new Promise((r) => setTimeout(r, pauseMs));
      }
      await analyseAndStore(sequelize, t, session, parsed);
      const startIso = parsed.metadata.start_time_iso;
      const durationS = parsed.rows > 1 ? parsed.timeS[parsed.rows - 1] - parsed.timeS[0] : 0;
      await RideSession.update(
        {
          status: "ready",
          progress: 100,
          statusReason: null,
          durationS,
          ...(startIso && !session.startedAt && !Number.isNaN(Date.parse(startIso)) ? { startedAt: new Date(startIso) } : {}),
        },
        { where: { id: sessionId }, transaction: t },
      );
    });
    return "ready";
  } catch (e) {
    if (e instanceof IngestError) {
      await RideSession.update({ status: "failed", statusReason: e.message, progress: 0 }, { where: { id: sessionId } });
      return "failed";
    }
    throw e;
  }
}
