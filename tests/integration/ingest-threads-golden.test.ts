/**
 * Ingest on worker threads stores exactly what the single-thread ingest stores. Each sample log
 * (sample-logs/files, invented data from our generator) goes through the real upload path once;
 * the stored file is then ingested twice into two sessions with the same mapping, track and bike:
 * by the single-thread path (the reference, computed in this run) and with the rows read in ranges
 * on worker threads. Every stored analysis must hash the same: laps with sector times and stats,
 * findings, channels (counts, min, max, rate) with every chunk's bytes, the stored page analyses
 * (slip, suspension, braking, gears, rider brief) and the session's duration and summary.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { QueryTypes } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getSequelize } from "@/models/db";
import { initModels, RideSession } from "@/models";
import { confirmMapping } from "@/lib/data/imports";
import type { Mapping } from "@/lib/ingest/mapping";
import type { CsvChunkRunner } from "@/lib/ingest/parse-csv-chunk";
import { createCsvThreadPool, type CsvThreadPool } from "@/workers/ingest/csv-thread-pool";
import { ingestNow } from "@/workers/ingest/ingest-now";
import { runIngestJob } from "@/workers/ingest/run-ingest-job";
import { createSampleTrackAndBike } from "./helpers/demo-track";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";

const DIR = path.resolve(__dirname, "../../sample-logs/files");
const FILES = ["three-laps-20hz.csv", "three-laps-10hz.csv", "demo-session-10min-rider-b.csv", "demo-session-20min.csv"];

let team: TestTeam;
let up: UploadHarness;
let pool: CsvThreadPool;
let link: { trackId: number; bikeId: number };
const sequelize = () => getSequelize();

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Threads golden team");
  up = await startUploadHarness();
  const { track, bike } = await createSampleTrackAndBike(team.teamId);
  link = { trackId: track.id, bikeId: bike.id };
  pool = createCsvThreadPool(2);
});
afterAll(async () => {
  await pool?.close();
  await up?.close();
});

const q = <T extends object>(sql: string, sessionId: number) => sequelize().query<T>(sql, { replacements: [sessionId], type: QueryTypes.SELECT });

/** One hash per stored analysis of a session, ids and timestamps left out. */
async function storedAnalyses(sessionId: number): Promise<Record<string, string>> {
  const h = (x: unknown) => createHash("sha256").update(typeof x === "string" ? x : JSON.stringify(x)).digest("hex");
  const laps = await q("SELECT number, start_time_s, end_time_s, lap_time_ms, distance_m, is_out_lap, is_in_lap, is_invalid, pit_pass, sector_times_ms, top_speed_mps, stats FROM laps WHERE session_id = ? ORDER BY number", sessionId);
  const findings = await q(
    "SELECT kind, lap_number, start_time_s, end_time_s, distance_m, lat, lon, severity, measured_value, threshold_value, unit, message FROM findings WHERE session_id = ? ORDER BY start_time_s, kind, id",
    sessionId,
  );
  const channels = await q("SELECT name, role, unit, source_column, sample_count, rate_hz, min_value, max_value, value_type, chunk_size FROM channels WHERE session_id = ? ORDER BY id", sessionId);
  const chunks = await q<{ data: Buffer }>("SELECT c.name, k.chunk_index, k.sample_count, k.data FROM channel_chunks k JOIN channels c ON c.id = k.channel_id WHERE c.session_id = ? ORDER BY c.id, k.chunk_index", sessionId);
  const chunkHash = createHash("sha256");
  for (const k of chunks) chunkHash.update(JSON.stringify({ ...k, data: undefined })).update(k.data);
  // The stored page analyses name their session (the rider brief): that id is left out too.
  const parts = (await q<{ part: string; basis: string; data: string }>("SELECT part, basis, data FROM session_analysis_parts WHERE session_id = ? ORDER BY part", sessionId)).map((p) => ({
    ...p,
    data: JSON.stringify(JSON.parse(p.data), (k, v: unknown) => (k === "sessionId" ? undefined : v)),
  }));
  // The summary without its wall-clock figures (when, and how many milliseconds the analysis took).
  const clock = new Set(["analysedAt", "analysisMs", "ms", "computeMs"]);
  const [session] = (await q<{ summary: unknown }>("SELECT status, duration_s, started_at, summary FROM ride_sessions WHERE id = ?", sessionId)).map((r) => ({
    ...r,
    summary: JSON.stringify(typeof r.summary === "string" ? JSON.parse(r.summary) : r.summary, (k, v: unknown) => (clock.has(k) ? undefined : v)),
  }));
  return {
    counts: `${laps.length} laps, ${findings.length} findings, ${channels.length} channels, ${chunks.length} chunks, ${parts.length} page analyses`,
    laps: h(laps),
    findings: h(findings),
    channels: h(channels),
    chunks: chunkHash.digest("hex"),
    pageAnalyses: h(parts),
    session: h(session),
  };
}

describe("ingest on worker threads = single-thread ingest, stored analysis for stored analysis", () => {
  it.each(FILES)("%s", async (file) => {
    const body = fs.readFileSync(path.join(DIR, file));
    const { sessionId } = await up.upload(new File([body], file, { type: "text/csv" }), team.members.engineer.cookie);
    const s = await RideSession.findByPk(sessionId);
    await s!.update(link);
    if (s!.status === "mapping") await confirmMapping(sequelize(), team.teamId, sessionId, s!.mapping as Mapping, `Profile ${sessionId}`);
    // A second session on the same stored file, mapping, track and bike.
    const { id: _id, createdAt: _c, updatedAt: _u, ...copy } = (await RideSession.findByPk(sessionId))!.get({ plain: true });
    const twin = await RideSession.create({ ...copy, status: "queued" });

    expect(await ingestNow(sequelize(), sessionId, `golden-${process.pid}`, { csvThreads: false })).toBe("ready");
    let ranges = 0;
    const counting: CsvChunkRunner = { threads: pool.threads, run: (task) => (ranges++, pool.run(task)) };
    // Ranges of ~200 kB: many range boundaries even in the smallest file.
    expect(await runIngestJob(sequelize(), twin.id, { csvThreads: { runner: counting, chunkChars: 200_000 } })).toBe("ready");
    // A range closes at the first line feed after 200 000 characters of decoded text: under 400 kB each.
    expect(ranges).toBeGreaterThanOrEqual(Math.floor(body.length / 400_000));

    const reference = await storedAnalyses(sessionId);
    expect(reference.counts).toMatch(/^[1-9]\d* laps, \d+ findings, [1-9]\d* channels, [1-9]\d* chunks, [1-9]\d* page analyses$/);
    expect(await storedAnalyses(twin.id)).toEqual(reference);
  }, 180_000);
});
