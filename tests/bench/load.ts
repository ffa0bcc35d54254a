/**
 * `npm run bench:load` — Lapbench under concurrent use, with real processes: the production build
 * served by `next start`, two ingest workers, the local upload service, on a scratch database
 * `lapbench_bench_load_<pid>` of the project's MariaDB seeded with the invented demo team.
 *
 *   uploads: 20 × a 10 MB logger export (sample-log generator, 40 channels at 100 Hz) at once,
 *            each through the uploadthing SDK's client (presign → PUT to the upload service →
 *            signed callback → session), then read by the two workers. Upload latency is from the
 *            start to the session id; ready latency from the session id to status "ready".
 *   series:  50 Compare series requests at once (GET /api/series, 2 laps × 6 channels by distance).
 *   pages:   20 page loads at once per role (owner, engineer, rider, viewer), each a full
 *            server-rendered page of that role (landing page, Sessions, a session).
 *
 * Baseline of each: the same request alone, median of 5, measured in the same run. Prints
 * p50 / p95 / max, errors (non-2xx, failed uploads, failed sessions) and lost sessions (an upload
 * that returned a session id whose session did not reach "ready"). Target: 0 errors, 0 lost.
 * Options: --uploads 20 --mb 10 --series 50 --pages 20 --build (force `next build`).
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { QueryTypes } from "sequelize";
import { startMariadb, dropDatabase, ensureDatabase } from "../../workers/services/mariadb";
import { createSequelize } from "../../models/db";
import { migrateUp } from "../../models/migrate";
import { DEMO_PASSWORD, DEMO_USERS } from "../../workers/demo-accounts";
import { freePort, newSecret, procEnv, signInHttp, spawnProc, startService, startWeb, stopProc, uploadViaSdk, type Proc } from "../e2e/helpers/processes";
import { at } from "../fixtures/at";

const ROOT = path.resolve(__dirname, "../..");
const num = (name: string, d: number) => {
  const i = process.argv.indexOf(name);
  return i >= 0 ? Number(process.argv[i + 1]) || d : d;
};
const UPLOADS = num("--uploads", 20);
const MB = num("--mb", 10);
const SERIES = num("--series", 50);
const PAGES = num("--pages", 20);

const pct = (xs: number[], p: number) => {
  if (!xs.length) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)] ?? NaN;
};
const ms = (x: number) => (Number.isFinite(x) ? `${Math.round(x)}` : "—");

interface Row {
  what: string;
  n: number;
  alone: number;
  times: number[];
  errors: number;
  note?: string;
}

async function timed<T>(f: () => Promise<T>): Promise<{ ms: number; value?: T; error?: string }> {
  const t0 = performance.now();
  try {
    const value = await f();
    return { ms: performance.now() - t0, value };
  } catch (e) {
    return { ms: performance.now() - t0, error: e instanceof Error ? e.message : String(e) };
  }
}

async function getOk(url: string, cookie: string): Promise<number> {
  const r = await fetch(url, { headers: { cookie }, redirect: "manual" });
  const body = await r.arrayBuffer();
  if (r.status !== 200) throw new Error(`${url} answered ${r.status}`);
  return body.byteLength;
}

async function median5(f: () => Promise<unknown>): Promise<number> {
  const t: number[] = [];
  for (let i = 0; i < 5; i++) {
    const r = await timed(f);
    if (r.error) throw new Error(r.error);
    t.push(r.ms);
  }
  return pct(t, 50);
}

async function main() {
  const distDir = process.env.LAPBENCH_NEXT_DIST ?? ".next";
  if (process.argv.includes("--build") || !fs.existsSync(path.join(ROOT, distDir, "BUILD_ID"))) {
    console.log("[load] building the web app (next build)…");
    const r = spawnSync(process.execPath, [path.join(ROOT, "node_modules/next/dist/bin/next"), "build"], { cwd: ROOT, stdio: "inherit", env: { ...process.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1" } });
    if (r.status !== 0) throw new Error("next build failed");
  }
  await startMariadb();
  const dbName = `lapbench_bench_load_${process.pid}`;
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-load-"));
  dropDatabase(dbName);
  ensureDatabase(dbName);
  const s = createSequelize(dbName, { pool: 4 });
  await migrateUp(s, { quiet: true });
  const procs: Proc[] = [];
  try {
    const [appPort, uploadPort, mailPort] = [await freePort(), await freePort(), await freePort()];
    const env = procEnv({ dbName, appPort, uploadPort, mailPort, dataDir, secret: newSecret() });
    const appUrl = `http://localhost:${appPort}`;
    procs.push(await startService("upload-fake", env), await startService("mail-fake", env));
    console.log("[load] seeding the demo team (three sessions read through the ingest path)…");
    const seed = spawnSync(process.execPath, ["--import", "tsx", "workers/seed.ts"], { cwd: ROOT, env, encoding: "utf8" });
    if (seed.status !== 0) throw new Error(`seed failed:\n${seed.stdout}\n${seed.stderr}`);
    procs.push(await startWeb("web", env));
    const workers = [spawnProc("worker-1", "worker", env), spawnProc("worker-2", "worker", env)];
    procs.push(...workers);

    const cookies: Record<string, string> = {};
    for (const u of DEMO_USERS) cookies[u.role] = await signInHttp(appUrl, u.email, DEMO_PASSWORD);

    console.log(`[load] generating a ${MB} MB logger export…`);
    const big = path.join(dataDir, `load-${MB}MB.csv`);
    const g = spawnSync(process.execPath, ["--import", "tsx", "sample-logs/generate.ts", "--big", `${MB}MB`, "--file", big], { cwd: ROOT, encoding: "utf8" });
    if (g.status !== 0) throw new Error(`generator failed: ${g.stderr}`);
    const bytes = fs.readFileSync(big);
    const file = (name: string) => new File([bytes], name, { type: "text/csv" });

    const rows: Row[] = [];
    const waitReady = async (ids: number[], timeoutMs: number) => {
      const readyAt = new Map<number, number>();
      const failed = new Set<number>();
      const end = Date.now() + timeoutMs;
      while (Date.now() < end && readyAt.size + failed.size < ids.length) {
        const rs = await s.query<{ id: number; status: string }>(`SELECT id, status FROM ride_sessions WHERE id IN (${ids.join(",")})`, { type: QueryTypes.SELECT });
        for (const r of rs) {
          if (r.status === "ready" && !readyAt.has(r.id)) readyAt.set(r.id, performance.now());
          if (r.status === "failed") failed.add(r.id);
        }
        await new Promise((r) => setTimeout(r, 200));
      }
      return { readyAt, failed };
    };

    // --- uploads: the first file of this layout waits for its mapping; confirm it, then the rest queue at once.
    {
      const { confirmMapping } = await import("../../lib/data/imports");
      const { initModels, RideSession } = await import("../../models");
      initModels(s);
      const t0 = performance.now();
      const first = await uploadViaSdk(appUrl, at(cookies, "engineer"), file("load-first.csv"));
      const firstMs = performance.now() - t0;
      const fs0 = await RideSession.findByPk(first.sessionId);
      const teamId = fs0!.teamId;
      if (fs0!.status === "mapping") await confirmMapping(s, teamId, first.sessionId, fs0!.mapping as never, "Load bench profile");
      const firstStart = performance.now();
      const w0 = await waitReady([first.sessionId], 300_000);
      const aloneReady = (w0.readyAt.get(first.sessionId) ?? NaN) - firstStart;

      console.log(`[load] ${UPLOADS} uploads of ${MB} MB at once…`);
      const started = performance.now();
      const results = await Promise.all(
        Array.from({ length: UPLOADS }, async (_, i) => {
          const r = await timed(() => uploadViaSdk(appUrl, at(cookies, "engineer"), file(`load-${i}.csv`)));
          return { ...r, doneAt: performance.now() };
        }),
      );
      const ok = results.filter((r) => r.value?.sessionId);
      const ids = ok.map((r) => r.value!.sessionId);
      const { readyAt, failed } = await waitReady(ids, 900_000);
      const lost = ids.filter((id) => !readyAt.has(id) && !failed.has(id)).length;
      const jobs = await s.query<{ attempts: number; state: string }>(`SELECT attempts, state FROM jobs WHERE session_id IN (${ids.join(",") || 0})`, { type: QueryTypes.SELECT });
      const retried = jobs.filter((j) => j.attempts > 1).length;
      const allReadyS = (Math.max(...readyAt.values()) - started) / 1000;
      rows.push({ what: `upload ${MB} MB (SDK) → session id`, n: UPLOADS, alone: firstMs, times: results.map((r) => r.ms), errors: results.length - ok.length, note: results.find((r) => r.error)?.error });
      rows.push({
        what: "session id → ready (2 workers)",
        n: ids.length,
        alone: aloneReady,
        times: ok.map((r) => (readyAt.get(r.value!.sessionId) ?? NaN) - r.doneAt).filter(Number.isFinite),
        errors: failed.size,
        note: `lost sessions ${lost}; jobs retried ${retried}; all ${ids.length} ready ${allReadyS.toFixed(1)} s after the first upload started (${((UPLOADS * MB) / allReadyS).toFixed(1)} MB/s)`,
      });
      if (lost) console.log(`[load] LOST sessions: ${ids.filter((id) => !readyAt.has(id) && !failed.has(id)).join(", ")}`);
    }

    // --- Compare series.
    {
      const laps = await s.query<{ session_id: number; number: number }>(
        "SELECT l.session_id, l.number FROM laps l JOIN ride_sessions r ON r.id = l.session_id WHERE l.is_out_lap = 0 AND l.is_in_lap = 0 AND r.status = 'ready' ORDER BY l.lap_time_ms LIMIT 2",
        { type: QueryTypes.SELECT },
      );
      if (laps.length < 2) throw new Error("the seeded sessions have fewer than two timed laps");
      const url = `${appUrl}/api/series?laps=${laps.map((l) => `${l.session_id}:${l.number}`).join(",")}&roles=speed_front,throttle,brake_front,engine_rpm,gear,lean_angle&x=distance&width=1200`;
      const alone = await median5(() => getOk(url, at(cookies, "engineer")));
      console.log(`[load] ${SERIES} Compare series requests at once…`);
      const rs = await Promise.all(Array.from({ length: SERIES }, () => timed(() => getOk(url, at(cookies, "engineer")))));
      rows.push({ what: "Compare series (2 laps × 6 ch)", n: SERIES, alone, times: rs.map((r) => r.ms), errors: rs.filter((r) => r.error).length, note: rs.find((r) => r.error)?.error });
    }

    // --- pages per role.
    {
      const [visible] = await s.query<{ id: number }>("SELECT id FROM ride_sessions WHERE status = 'ready' AND shared_with_riders = 1 ORDER BY id LIMIT 1", { type: QueryTypes.SELECT });
      const sessionPage = visible ? [`/sessions/${visible.id}`] : [];
      for (const u of DEMO_USERS) {
        const pages = [u.role === "rider" ? "/brief" : "/home", "/sessions", ...sessionPage];
        const alone = await median5(() => getOk(`${appUrl}${at(pages, 0)}`, at(cookies, u.role)));
        console.log(`[load] ${PAGES} page loads at once as ${u.role}…`);
        const rs = await Promise.all(Array.from({ length: PAGES }, (_, i) => timed(() => getOk(`${appUrl}${at(pages, i % pages.length)}`, at(cookies, u.role)))));
        rows.push({ what: `pages as ${u.role} (${pages.join(", ")})`, n: PAGES, alone, times: rs.map((r) => r.ms), errors: rs.filter((r) => r.error).length, note: rs.find((r) => r.error)?.error });
      }
    }

    console.log(`\nLoad on ${os.cpus().length} cores (load average ${os.loadavg().map((x) => x.toFixed(1)).join(" ")}), times in ms:\n`);
    console.log(["what", "n", "alone (median of 5)", "p50", "p95", "max", "errors"].join(" | "));
    for (const r of rows) {
      console.log([r.what, r.n, ms(r.alone), ms(pct(r.times, 50)), ms(pct(r.times, 95)), ms(Math.max(...r.times)), r.errors].join(" | "));
      if (r.note) console.log(`    ${r.note}`);
    }
    const errors = rows.reduce((n, r) => n + r.errors, 0);
    console.log(`\ntotal errors: ${errors} (target 0)`);
  } finally {
    await Promise.all(procs.map((p) => stopProc(p)));
    await s.close().catch(() => {});
    dropDatabase(dbName);
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
