/**
 * `npm run bench:compare` — Compare's two costs beside their raw baselines, measured in one run:
 *
 *   server: GET /api/series for 2 laps × 8 channels (route handler with a real signed-in cookie:
 *           guard, lap lookup, chunk reads, distance, resampling, gap, decimation, binary encode)
 *           vs the raw MariaDB read of the same chunks (one SELECT per lap of the chunk_index
 *           ranges the request reads, blobs only). Target ratio ≤ 2.
 *   browser: headless Chromium, from "the response bytes are in the page" to "every pane has
 *           drawn": our ChartPane components (decode, unit conversion, React, uPlot created once per
 *           pane) vs bare uPlot drawing the same decoded arrays. x = time at 100 Hz with the
 *           width set so nothing is decimated (every 100 Hz sample is drawn). Target ratio ≤ 1.3.
 *
 * The session: 30 minutes at 100 Hz from the sample-log generator (40 channels, extended set),
 * written through lib/data/samples (the ingest storage path) and analysed for laps into a scratch
 * database lapbench_bench_compare_<pid>, dropped at the end. Medians of --runs (default 9).
 * `--server-only` skips the browser half (for profiling the server path with node --cpu-prof).
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { build } from "esbuild";
import { chromium } from "playwright-core";
import Module, { createRequire } from "node:module";
import { startMariadb, ensureDatabase, dropDatabase } from "../../workers/services/mariadb";

// The route and lib/data modules are marked server-only (they throw outside a React server
// build); this program is server code, so the marker resolves to an empty module here, as in tests.
{
  const require = createRequire(__filename);
  const file = require.resolve("server-only");
  const stub = new Module(file);
  stub.loaded = true;
  stub.exports = {};
  require.cache[file] = stub;
}

const ROOT = path.resolve(__dirname, "../..");
const runs = Number(process.argv[process.argv.indexOf("--runs") + 1] || 9) || 9;
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const ROLES = ["speed_front", "speed_rear", "throttle", "brake_front", "engine_rpm", "gear", "lean_angle", "fork_travel"];

async function main() {
  await startMariadb();
  const dbName = `lapbench_bench_compare_${process.pid}`;
  dropDatabase(dbName);
  ensureDatabase(dbName);
  process.env.LAPBENCH_DB_NAME = dbName;
  // lib/config read the name when workers/services/mariadb was imported above: point it at the
  // scratch database too, or the run would write into the app's own database.
  const { config } = await import("../../lib/config");
  config.db.name = dbName;
  try {
    await bench(dbName);
  } finally {
    const { getSequelize } = await import("../../models/db");
    await getSequelize().close().catch(() => {});
    dropDatabase(dbName);
  }
}

async function bench(dbName: string) {
  const { getSequelize } = await import("../../models/db");
  const { migrateUp } = await import("../../models/migrate");
  const { initModels, RideSession, Lap } = await import("../../models");
  const { writeSessionSamples, listChannels, CHUNK_SAMPLES } = await import("../../lib/data/samples");
  const { analyseSessionInTransaction } = await import("../../lib/data/session-analysis");
  const { ensureTrack } = await import("../../lib/data/tracks");
  const { demoTrackInput } = await import("../../workers/demo-track");
  const { generateSession } = await import("../../sample-logs/generate-session");
  const { createTeamWithRoles, req, params } = await import("../integration/helpers/teams");
  const seriesRoute = await import("../../app/api/series/route");
  const { QueryTypes } = await import("sequelize");

  const sequelize = getSequelize();
  await migrateUp(sequelize, { quiet: true });
  initModels(sequelize);
  const team = await createTeamWithRoles("Bench team");
  await ensureTrack(sequelize, team.teamId, demoTrackInput());

  // 30 minutes: out-lap ≈ 128 s, in-lap ≈ 110 s, flying laps ≈ 83 s.
  const t0 = performance.now();
  const gen = generateSession({ seed: 5, flyingLaps: 19, extendedChannels: true, sampleRateHz: 100, gpsRateHz: 20, brakeOnStraightLaps: [3], revCeilingLap: null, pitOverspeed: null });
  const rows = gen.timeS.length;
  const channels = gen.channels.filter((c) => c.role !== "time").map((c) => {
    let n = 0, min = Infinity, max = -Infinity;
    for (const v of c.data) if (Number.isFinite(v)) { n++; if (v < min) min = v; if (v > max) max = v; }
    return { name: c.name, role: c.role as Exclude<typeof c.role, "time">, unit: c.siUnit, values: c.data, sampleCount: n, min, max };
  });
  const session = await RideSession.create({ teamId: team.teamId, title: "Bench 30 min", status: "parsing", eventId: null, bikeId: null, engineId: null, riderId: null, trackId: null, logFileId: null, importProfileId: null, startedAt: new Date(gen.metadata.startedAt), conditions: null, statusReason: null, mapping: null, summary: null, durationS: null, createdBy: null });
  await sequelize.transaction(async (t) => {
    await writeSessionSamples(sequelize, t, session.id, { timeS: gen.timeS, channels, metadata: {}, rows });
    const byRole: Record<string, Float32Array | Float64Array> = {};
    for (const c of channels) if (c.role !== "other" && !(c.role in byRole)) byRole[c.role] = c.values;
    await analyseSessionInTransaction(sequelize, t, session.id, { timeS: gen.timeS, channels: byRole });
  });
  await RideSession.update({ status: "ready" }, { where: { id: session.id } });
  const laps = await Lap.findAll({ where: { sessionId: session.id }, order: [["number", "ASC"]] });
  const flying = laps.filter((l) => !l.isOutLap && !l.isInLap);
  console.log(`session: ${(gen.timeS[rows - 1] / 60).toFixed(1)} min, ${rows} rows × ${channels.length + 1} channels at 100 Hz, ${laps.length} laps stored (${((performance.now() - t0) / 1000).toFixed(1)} s to generate and store) in ${dbName}`);
  if (flying.length < 2) throw new Error("the analysis found fewer than two flying laps");
  // Two laps from the middle of the session: chunks far from the start.
  const pair = [flying[Math.floor(flying.length / 2)], flying[Math.floor(flying.length / 2) + 1]];

  const ask = async (x: "distance" | "time", width: number) => {
    const url = `/api/series?laps=${pair.map((l) => `${session.id}:${l.number}`).join(",")}&roles=${ROLES.join(",")}&x=${x}&width=${width}`;
    const s = performance.now();
    const res = await seriesRoute.GET(req(url, team.members.engineer.cookie), params({}));
    const buf = await res.arrayBuffer();
    if (res.status !== 200) throw new Error(`series answered ${res.status}: ${new TextDecoder().decode(buf)}`);
    return { ms: performance.now() - s, buf };
  };

  // The raw read: the same chunk ranges (time, the 8 channels, wheel speed and GPS for distance).
  const all = await listChannels(sequelize, session.id);
  const readIds = all.filter((c) => c.role === "time" || ROLES.includes(c.role) || ["speed_front", "gps_lat", "gps_lon"].includes(c.role)).map((c) => c.id);
  const time = all.find((c) => c.role === "time")!;
  const rate = time.rateHz!;
  const raw = async () => {
    const s = performance.now();
    let bytes = 0;
    for (const l of pair) {
      const from = Math.max(0, Math.floor((l.startTimeS - time.minValue!) * rate) - Math.ceil(rate) - 2);
      const to = Math.ceil((l.endTimeS - time.minValue!) * rate) + Math.ceil(rate) + 2;
      const r = await sequelize.query<{ data: Buffer }>(
        `SELECT channel_id, chunk_index, data FROM channel_chunks WHERE channel_id IN (${readIds.map(() => "?").join(",")}) AND chunk_index BETWEEN ? AND ?`,
        { replacements: [...readIds, Math.floor(from / CHUNK_SAMPLES), Math.floor((to - 1) / CHUNK_SAMPLES)], type: QueryTypes.SELECT },
      );
      for (const x of r) bytes += x.data.byteLength;
    }
    return { ms: performance.now() - s, bytes };
  };

  const { requireTeam } = await import("../../lib/auth/guard");
  const { loadLapSeries, clearLapSeriesCaches } = await import("../../lib/data/lap-series");
  const { encodeSeries } = await import("../../lib/series/binary");
  const headers = new Headers({ cookie: team.members.engineer.cookie });
  /** The same request through its parts, each timed: guard, lap lookup, chunk reads, computation, encode. */
  const parts = async () => {
    const stages: Record<string, number> = {};
    let s = performance.now();
    const ctx = await requireTeam(headers);
    stages.guard = performance.now() - s;
    const r = await loadLapSeries(ctx, { laps: pair.map((l) => ({ sessionId: session.id, lap: l.number })), roles: ROLES as never, x: "distance", width: 1200, stages });
    s = performance.now();
    encodeSeries(r.meta, r.arrays);
    stages.encode = performance.now() - s;
    return stages;
  };

  // Warm both paths (connections, JIT), then interleave so machine noise hits them alike.
  await ask("distance", 1200);
  await raw();
  await parts();
  const serverMs: number[] = [];
  const rawMs: number[] = [];
  const partMs: Record<string, number>[] = [];
  let rawBytes = 0;
  for (let i = 0; i < runs; i++) {
    serverMs.push((await ask("distance", 1200)).ms);
    const r = await raw();
    rawMs.push(r.ms);
    rawBytes = r.bytes;
    partMs.push(await parts());
  }
  // Cold: the per-lap caches emptied before each request (as after a fresh start; the process'
  // JIT and connection pool stay warm, so this is the cache's share, not Node's start-up).
  const coldMs: number[] = [];
  const coldRawMs: number[] = [];
  for (let i = 0; i < runs; i++) {
    clearLapSeriesCaches();
    coldMs.push((await ask("distance", 1200)).ms);
    coldRawMs.push((await raw()).ms);
  }
  const sMed = median(serverMs);
  const rMed = median(rawMs);
  const ratios = serverMs.map((v, i) => v / rawMs[i]);
  const timeAnswer = await ask("time", 2400);
  const distAnswer = await ask("distance", 1200);
  console.log(`\nserver, 2 laps × 8 channels, x=distance, 1200 px (median of ${runs}; load average ${os.loadavg().map((v) => v.toFixed(2)).join(" ")}):`);
  console.log(`  GET /api/series        ${sMed.toFixed(1)} ms  (${(distAnswer.buf.byteLength / 1024).toFixed(0)} kB answered)  warm caches`);
  console.log(`  raw chunk read         ${rMed.toFixed(1)} ms  (${(rawBytes / 1024).toFixed(0)} kB of blobs)`);
  const sRatio = sMed / rMed;
  console.log(`  ratio                  ${sRatio.toFixed(2)}  target ≤ 2 → ${sRatio <= 2 ? "PASS" : "MISS"}; ${sRatio <= 1.2 ? "within" : `${(sRatio - 1.2).toFixed(2)} above`} the 1.2 stretch`);
  console.log(`  per-run ratios         ${ratios.map((v) => v.toFixed(2)).join(" ")}  (median ${median(ratios).toFixed(2)})`);
  const cMed = median(coldMs);
  const crMed = median(coldRawMs);
  console.log(`  cold (caches emptied)  ${cMed.toFixed(1)} ms vs raw ${crMed.toFixed(1)} ms → ratio ${(cMed / crMed).toFixed(2)} (reads wheel speed and GPS too, integrates distance)`);
  const stage = (k: string) => median(partMs.map((p) => p[k] ?? 0)).toFixed(1);
  const partsTotal = median(partMs.map((p) => Object.values(p).reduce((a, b) => a + b, 0)));
  console.log(`  of which (same runs): guard (session, team, role) ${stage("guard")} ms · lap lookup and channel lists ${stage("lookup")} ms · chunk reads ${stage("reads")} ms · computation ${stage("compute")} ms · binary encode ${stage("encode")} ms = ${partsTotal.toFixed(1)} ms; the rest of GET (Request, Response, body) ${(sMed - partsTotal).toFixed(1)} ms`);

  // ---- browser ---------------------------------------------------------------------------
  if (process.argv.includes("--server-only")) return;
  const bundle = await build({
    entryPoints: [path.join(__dirname, "compare-harness.tsx")],
    bundle: true,
    write: false,
    format: "iife",
    minify: true,
    jsx: "automatic",
    loader: { ".css": "empty" },
    define: { "process.env.NODE_ENV": '"production"' },
    tsconfig: path.join(ROOT, "tsconfig.json"),
    logLevel: "error",
  });
  const css = fs.readFileSync(path.join(ROOT, "node_modules/uplot/dist/uPlot.min.css"), "utf8");
  const html = `<!doctype html><html><head><style>${css} body{margin:0;background:#0d1014;color:#e4e8ed;font:12px sans-serif}</style></head><body><div id="root"></div><script>${bundle.outputFiles[0].text}</script></body></html>`;
  const browser = await chromium.launch({ executablePath: "/usr/bin/chromium", headless: true, args: ["--no-sandbox", "--disable-gpu", "--disable-dev-shm-usage"] });
  const payload = Buffer.from(timeAnswer.buf).toString("base64");
  const oursMs: number[] = [];
  const bareMs: number[] = [];
  try {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1800 } });
    await page.setContent(html);
    await page.evaluate((b64) => {
      (window as unknown as { payload: Uint8Array }).payload = Uint8Array.from(atob(b64), (c) => c.charCodeAt(0));
    }, payload);
    const once = (fn: "runOurs" | "runBare") =>
      page.evaluate(async (name) => {
        const w = window as unknown as Record<string, (b: ArrayBuffer) => Promise<number>> & { payload: Uint8Array };
        // A fresh copy each run: "data arrival" is a new ArrayBuffer, as from fetch.
        const copy = w.payload.slice().buffer;
        return w[name](copy);
      }, fn);
    await once("runOurs");
    await once("runBare");
    for (let i = 0; i < runs; i++) {
      oursMs.push(await once("runOurs"));
      bareMs.push(await once("runBare"));
    }
    await page.evaluate(() => document.fonts.ready);
    fs.mkdirSync(path.join(ROOT, "test-output/screenshots"), { recursive: true });
    await once("runOurs");
    await page.screenshot({ path: path.join(ROOT, "test-output/screenshots/bench-compare-ours.png"), fullPage: true });
  } finally {
    await browser.close();
  }
  const { decodeSeries } = await import("../../lib/series/binary");
  const meta = decodeSeries<{ gridPoints: number; panes: { decimated: boolean }[] }>(timeAnswer.buf).meta;
  const oMed = median(oursMs);
  const bMed = median(bareMs);
  console.log(`\nbrowser, 2 laps × 8 channels + Running gap, x=time at 100 Hz (${meta.gridPoints} points per series, decimated: ${meta.panes.some((p) => p.decimated)}), median of ${runs}:`);
  console.log(`  our ChartPanes (decode, units, React, uPlot)   ${oMed.toFixed(1)} ms`);
  console.log(`  bare uPlot on the same decoded arrays          ${bMed.toFixed(1)} ms`);
  const bRatio = oMed / bMed;
  console.log(`  per-run ratios                                 ${oursMs.map((v, i) => (v / bareMs[i]).toFixed(2)).join(" ")}`);
  console.log(`  ratio                                          ${bRatio.toFixed(2)}  target ≤ 1.3 → ${bRatio <= 1.3 ? "PASS" : "MISS"}`);
  console.log(`\n(times from the bytes being in the page to every pane's first draw hook; not the network or the app shell)`);
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
