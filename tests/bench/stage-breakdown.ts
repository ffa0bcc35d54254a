/**
 * Where the worker's time goes, stage by stage, with the same library calls it makes:
 * parseCsvStream (file read from disk), writeSessionSamples and analyseAndStore in one transaction
 * that is rolled back, on a scratch copy of a ready session (so its rows stay untouched).
 * analyseAndStore is split as the worker logs it: laps + findings (analyseS), then the Drive slip,
 * Suspension use, Gears and Rider brief results computed and stored (pagesS; pagesComputeS of it
 * is the computation alone, pagesKb and pageParts what was stored).
 * Run as its own process so the peak RSS after the parse is the parse's own.
 * Prints one JSON line: { parseS, writeS, analyseS, pagesS, pagesComputeS, pagesKb, pageParts, laps, findings, parsePeakRssMb, peakRssMb }.
 *
 *   LAPBENCH_DB_NAME=… node --import tsx tests/bench/stage-breakdown.ts <file.csv> <readySessionId>
 */
import fs from "node:fs";
import path from "node:path";
import { QueryTypes } from "sequelize";
import { getSequelize } from "../../models/db";
import { initModels, RideSession } from "../../models";
import { parseCsvStream } from "../../lib/ingest/parse-csv-stream";
import type { Mapping } from "../../lib/ingest/mapping";
import { writeSessionSamples } from "../../lib/data/samples";
import { analyseAndStore } from "../../workers/ingest/analyse-session";
import { procStatusMb } from "./proc-memory";
import { at } from "../fixtures/at";

async function main(): Promise<void> {
  const [file, readyId] = process.argv.slice(2);
  if (!file || !readyId) throw new Error("usage: stage-breakdown.ts <file.csv> <readySessionId>");
  const sequelize = getSequelize();
  initModels(sequelize);
  const ready = await RideSession.findByPk(Number(readyId));
  if (!ready?.mapping) throw new Error(`session ${readyId} has no mapping`);
  const scratch = await RideSession.create({
    teamId: ready.teamId, logFileId: ready.logFileId, importProfileId: ready.importProfileId, status: "parsing", title: "bench stage breakdown",
    createdBy: ready.createdBy, eventId: ready.eventId, bikeId: ready.bikeId, engineId: ready.engineId, riderId: ready.riderId, trackId: ready.trackId,
    startedAt: ready.startedAt, conditions: null, statusReason: null, mapping: ready.mapping, summary: ready.summary, durationS: null,
  });
  try {
    let t = performance.now();
    const parsed = await parseCsvStream(fs.createReadStream(file), ready.mapping as Mapping, undefined, undefined, { fileName: path.basename(file) });
    const parseS = (performance.now() - t) / 1000;
    const parsePeakRssMb = procStatusMb(process.pid, "VmHWM");

    const tx = await sequelize.transaction();
    let writeS = NaN;
    let analyseS = NaN;
    let pagesS = NaN;
    let pagesComputeS = NaN;
    let pagesKb = NaN;
    let pageParts = 0;
    let laps = 0;
    let findings = 0;
    try {
      t = performance.now();
      await writeSessionSamples(sequelize, tx, scratch.id, parsed);
      writeS = (performance.now() - t) / 1000;
      t = performance.now();
      const summary = await analyseAndStore(sequelize, tx, scratch, parsed);
      const totalS = (performance.now() - t) / 1000;
      if (!summary.pages) throw new Error("the page analyses were not stored (see the log line above)");
      pagesS = summary.pages.ms / 1000;
      pagesComputeS = summary.pages.computeMs / 1000;
      pagesKb = summary.pages.bytes / 1024;
      pageParts = summary.pages.parts;
      analyseS = totalS - pagesS;
      const count = async (table: "laps" | "findings") =>
        at((await sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM ${table} WHERE session_id = ?`, { replacements: [scratch.id], type: QueryTypes.SELECT, transaction: tx })), 0).n;
      laps = Number(await count("laps"));
      findings = Number(await count("findings"));
    } finally {
      await tx.rollback();
    }
    console.log(JSON.stringify({ parseS, writeS, analyseS, pagesS, pagesComputeS, pagesKb, pageParts, laps, findings, parsePeakRssMb, peakRssMb: procStatusMb(process.pid, "VmHWM") }));
  } finally {
    await scratch.destroy();
    await sequelize.close();
  }
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
