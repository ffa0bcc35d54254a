/**
 * Past one machine, in miniature: two web app processes and two ingest workers on one MariaDB
 * database against the same upload service, sharing only the database, the upload service and the
 * signing secret. A sign-in on one app is a sign-in on the other (sessions live in MariaDB), uploads
 * through either app reach the same queue, and SELECT … FOR UPDATE SKIP LOCKED hands each job to
 * exactly one worker.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { QueryTypes, type Sequelize } from "sequelize";
import { setSequelizeForProcess } from "../../models/db";
import { dropDatabase } from "../../workers/services/mariadb";
import { initModels, RideSession } from "../../models";
import { confirmMapping } from "../../lib/data/imports";
import type { Mapping } from "../../lib/ingest/mapping";
import {
  createMigratedDatabase,
  createTeam,
  exportCsv,
  freePort,
  newSecret,
  procEnv,
  signInHttp,
  spawnProc,
  startService,
  startWeb,
  stopProc,
  uploadViaSdk,
  waitFor,
  ROOT,
  type Proc,
} from "./helpers/processes";
import path from "node:path";
import fs from "node:fs";
import { at } from "../fixtures/at";

const dbName = `lapbench_scale_${process.pid}`;
const dataDir = path.join(ROOT, ".data", `scale-${process.pid}`);
let s: Sequelize;
const apps: { url: string; proc: Proc }[] = [];
let workers: Proc[] = [];
let services: Proc[] = [];
let team: Awaited<ReturnType<typeof createTeam>>;

beforeAll(async () => {
  s = await createMigratedDatabase(dbName);
  setSequelizeForProcess(s);
  initModels(s);
  team = await createTeam(s, "Scale team");
  const [uploadPort, mailPort, portA, portB] = [await freePort(), await freePort(), await freePort(), await freePort()];
  const secret = newSecret();
  const env = (appPort: number) => procEnv({ dbName, appPort, uploadPort, mailPort, dataDir, secret });
  services = await Promise.all([startService("upload-fake", env(portA)), startService("mail-fake", env(portA))]);
  // One after the other: two `next start` booting at once on two shared cores only slows both.
  for (const [name, port] of [["web-a", portA], ["web-b", portB]] as const) apps.push({ url: `http://localhost:${port}`, proc: await startWeb(name, env(port)) });
  workers = [spawnProc("worker-1", "worker", env(portA)), spawnProc("worker-2", "worker", env(portB))];
});

afterAll(async () => {
  await Promise.all([...workers, ...apps.map((a) => a.proc), ...services].map((p) => stopProc(p)));
  await s?.close().catch(() => {});
  dropDatabase(dbName);
  fs.rmSync(dataDir, { recursive: true, force: true });
});

async function get(url: string, cookie: string): Promise<Response> {
  return fetch(url, { headers: { cookie }, redirect: "manual" });
}

describe("two web apps and two workers on one database", () => {
  it("a sign-in on either app is valid on the other", async () => {
    const a = at(apps, 0), b = at(apps, 1);
    const onA = await signInHttp(a.url, team.members.engineer.email);
    const onB = await signInHttp(b.url, team.members.viewer.email);
    for (const [cookie, who] of [[onA, team.members.engineer], [onB, team.members.viewer]] as const) {
      for (const app of apps) {
        const r = await get(`${app.url}/api/auth/get-session`, cookie);
        expect(r.status).toBe(200);
        expect(((await r.json()) as { user?: { email: string } }).user?.email).toBe(who.email);
        const page = await get(`${app.url}/home`, cookie);
        expect(page.status).toBe(200);
      }
    }
    // Signed out on B: the session row is gone for A too. (disableCookieCache: the signed cookie
    // cache would answer from the cookie itself for up to its max age, on any app server.)
    const out = await fetch(`${b.url}/api/auth/sign-out`, { method: "POST", headers: { cookie: onB, origin: b.url, "content-type": "application/json" }, body: "{}" });
    expect(out.status).toBe(200);
    const after = await get(`${a.url}/api/auth/get-session?disableCookieCache=true`, onB);
    expect(await after.json()).toBeNull();
  });

  it("uploads through both apps at once: every job runs exactly once, every session is visible from both apps", async () => {
    const a = at(apps, 0), b = at(apps, 1);
    const cookie = await signInHttp(a.url, team.members.engineer.email);
    // The first file of this layout waits for its column mapping; the rest reuse the saved profile.
    const first = await uploadViaSdk(a.url, cookie, new File([exportCsv(2000)], "layout.csv", { type: "text/csv" }));
    const firstSession = await RideSession.findByPk(first.sessionId);
    await confirmMapping(s, team.teamId, first.sessionId, firstSession!.mapping as Mapping, "Scale profile");

    const uploads = await Promise.all(
      Array.from({ length: 8 }, (_, i) => uploadViaSdk(i % 2 ? b.url : a.url, cookie, new File([exportCsv(3000, i)], `run-${i}.csv`, { type: "text/csv" }))),
    );
    const ids = [first.sessionId, ...uploads.map((u) => u.sessionId)];
    expect(new Set(ids).size).toBe(ids.length);
    await waitFor(async () => (await RideSession.count({ where: { id: ids, status: "ready" } })) === ids.length, 180_000, `${ids.length} sessions ready`);
    // A worker marks its job done just after the session's transaction commits: wait for that too.
    await waitFor(
      async () => (await s.query<{ n: number }>(`SELECT COUNT(*) AS n FROM jobs WHERE state = 'done' AND session_id IN (${ids.join(",")})`, { type: QueryTypes.SELECT }))[0]!.n == ids.length,
      60_000,
      `${ids.length} jobs done`,
    );

    const jobs = await s.query<{ session_id: number; attempts: number; state: string }>(`SELECT session_id, attempts, state FROM jobs WHERE session_id IN (${ids.join(",")})`, { type: QueryTypes.SELECT });
    expect(jobs).toHaveLength(ids.length);
    for (const j of jobs) expect(j).toMatchObject({ attempts: 1, state: "done" });
    // Each session's job was started once across both workers' logs.
    const started = workers.flatMap((w) => [...w.output.join("").matchAll(/job \d+ \(session (\d+),/g)].map((m) => Number(m[1])));
    expect([...started].sort((x, y) => x - y)).toEqual([...ids].sort((x, y) => x - y));
    console.log(`[scale-out] jobs per worker: ${workers.map((w) => `${w.name} ${[...w.output.join("").matchAll(/job \d+ \(session/g)].length}`).join(", ")}`);

    for (const app of apps) {
      const r = await get(`${app.url}/api/sessions?limit=100`, cookie);
      expect(r.status).toBe(200);
      const listed = ((await r.json()) as { sessions: { id: number; status: string }[] }).sessions;
      for (const id of ids) expect(listed.find((x) => x.id === id)?.status).toBe("ready");
      const page = await get(`${app.url}/sessions/${ids[ids.length - 1]}`, cookie);
      expect(page.status).toBe(200);
    }
  });
});
