/**
 * Faults survived by a running Lapbench, with real processes: a MariaDB server of this test's own
 * (own port and data folder) killed with SIGKILL and restarted while a worker is in the middle of a
 * job and while the web app serves pages — the job is retried to ready, nothing partial is ever
 * visible, and the same web app process answers again without a restart; and the upload service
 * going down under the upload screen — it says so, and "Try again" works once it is back.
 * (A worker killed mid-job is covered in tests/integration/ingest-flow.test.ts.)
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { QueryTypes, type Sequelize } from "sequelize";
import type { Browser } from "playwright-core";
import { setSequelizeForProcess } from "../../models/db";
import { initModels, RideSession } from "../../models";
import { confirmMapping } from "../../lib/data/imports";
import { listChannels, readChannels } from "../../lib/data/samples";
import type { Mapping } from "../../lib/ingest/mapping";
import { launch, shot } from "./browser";
import {
  createMigratedDatabase,
  createTeam,
  exportCsv,
  freePort,
  newSecret,
  PASSWORD,
  procEnv,
  signInHttp,
  spawnProc,
  startOwnMariadb,
  startService,
  startWeb,
  stopProc,
  uploadViaSdk,
  waitFor,
  type OwnMariadb,
  type Proc,
} from "./helpers/processes";

let db: OwnMariadb;
let s: Sequelize;
let env: NodeJS.ProcessEnv;
let appUrl: string;
let web: Proc;
let upload: Proc;
let mail: Proc;
let team: Awaited<ReturnType<typeof createTeam>>;
let cookie: string;
const dbName = `lapbench_fault_${process.pid}`;

beforeAll(async () => {
  db = await startOwnMariadb("fault");
  s = await createMigratedDatabase(dbName, db);
  setSequelizeForProcess(s);
  initModels(s);
  const [appPort, uploadPort, mailPort] = [await freePort(), await freePort(), await freePort()];
  env = procEnv({ dbName, dbPort: db.port, appPort, uploadPort, mailPort, dataDir: db.dataRoot, secret: newSecret() });
  appUrl = `http://localhost:${appPort}`;
  [upload, mail] = await Promise.all([startService("upload-fake", env), startService("mail-fake", env)]);
  team = await createTeam(s, "Fault team");
  web = await startWeb("web", env);
  cookie = await signInHttp(appUrl, team.members.engineer.email);
});

afterAll(async () => {
  await Promise.all([stopProc(web), stopProc(upload), stopProc(mail)]);
  await s?.close().catch(() => {});
  await db?.close();
});

/**
 * What the page marker says each page shows when it rendered (a streamed page answers 200 before its
 * data is read, so the status alone does not tell a rendered page from the error boundary).
 */
const MARKERS: Record<string, string> = { "/home": "Recent sessions", "/sessions": ">Sessions</h1>" };

/** Load a page as the engineer: "ok" when it rendered its content, else the status (0: no connection). */
async function load(pathname: string): Promise<"ok" | number> {
  try {
    const r = await fetch(`${appUrl}${pathname}`, { headers: { cookie }, redirect: "manual" });
    const body = await r.text();
    return r.status === 200 && body.includes(MARKERS[pathname] ?? "") ? "ok" : r.status;
  } catch {
    return 0;
  }
}

describe("MariaDB killed (SIGKILL) and restarted", () => {
  it("mid-job and mid-page-load: the job is retried to ready, nothing partial shows, the same app process recovers", async () => {
    const rows = 6000;
    const { sessionId } = await uploadViaSdk(appUrl, cookie, new File([exportCsv(rows)], "fault.csv", { type: "text/csv" }));
    const session = await RideSession.findByPk(sessionId);
    expect(session?.status).toBe("mapping");
    await confirmMapping(s, team.teamId, sessionId, session!.mapping as Mapping, "Fault profile");

    // Pages are requested all through: before the job, through the outage, after it.
    expect(await load("/home")).toBe("ok");
    expect(await load("/sessions")).toBe("ok");
    const statuses: ("ok" | number)[] = [];
    let serving = true;
    const pageLoads = (async () => {
      while (serving) {
        statuses.push(await load("/sessions"));
        await new Promise((r) => setTimeout(r, 150));
      }
    })();

    // The worker pauses with every chunk written inside its open transaction: the kill lands there.
    const worker = spawnProc("worker", "worker", { ...env, LAPBENCH_TEST_PAUSE_BEFORE_COMMIT_MS: "8000", LAPBENCH_WORKER_STALE_S: "5" });
    try {
      await waitFor(() => worker.output.join("").includes(`session ${sessionId}: samples written`), 60_000, "the worker to be mid-job");
      await db.kill9();
      const killedAt = statuses.length;
      await waitFor(() => statuses.length >= killedAt + 3, 30_000, "page loads during the outage");
      const duringOutage = statuses.slice(killedAt + 1); // the first may have been answered before the kill
      // Keep the server down until the worker has met the outage (its pause ends, its next write fails).
      await waitFor(() => /job \d+ error/.test(worker.output.join("")) || worker.exitCode !== null, 60_000, "the worker to meet the outage");
      await new Promise((r) => setTimeout(r, 1000));
      await db.restart();

      // InnoDB crash recovery rolled the half-written job back: no channels, not ready.
      const afterRestart = await RideSession.findByPk(sessionId);
      expect(afterRestart?.status).not.toBe("ready");
      expect(await listChannels(s, sessionId)).toEqual([]);

      // The same web app process answers again, with no restart.
      await waitFor(async () => (await load("/sessions")) === "ok", 30_000, "the web app to answer again");
      expect(web.exitCode).toBeNull();
      expect(duringOutage.filter((x) => x === "ok")).toEqual([]);
      for (let i = 0; i < 5; i++) expect(await load("/home")).toBe("ok");

      await waitFor(async () => (await RideSession.findByPk(sessionId))?.status === "ready", 90_000, "the retried job to reach ready");
      expect(worker.exitCode).toBeNull(); // the worker lived through the outage
    } finally {
      serving = false;
      await pageLoads;
      await stopProc(worker);
    }

    const [job] = await s.query<{ attempts: number; state: string }>("SELECT attempts, state FROM jobs WHERE session_id = ?", { replacements: [sessionId], type: QueryTypes.SELECT });
    expect(job).toEqual({ attempts: 2, state: "done" });
    const channels = await listChannels(s, sessionId);
    expect(channels.length).toBeGreaterThanOrEqual(3);
    for (const c of channels) expect(c.sampleCount).toBe(rows);
    // Every sample was written once, by the retry: values read back are the generator's.
    const speed = channels.find((c) => /wheel speed/i.test(c.name))!;
    const values = (await readChannels(s, [speed])).get(speed.id)!;
    expect(values.length).toBe(rows);
    expect(values[1234]).toBeCloseTo(((100 + 50 * Math.sin(12.34)) * 1000) / 3600, 3);

    const api = await fetch(`${appUrl}/api/sessions/${sessionId}`, { headers: { cookie } });
    expect(api.status).toBe(200);
    expect(((await api.json()) as { session: { status: string } }).session.status).toBe("ready");
  });
});

describe("upload service down", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("the upload screen says the file store is not answering; Try again works once it is back", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 860 } });
    await page.goto(`${appUrl}/sign-in`);
    await page.getByLabel("E-mail").fill(team.members.engineer.email);
    await page.getByLabel("Password").fill(PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(/\/home$/, { timeout: 30_000 });
    await page.goto(`${appUrl}/upload`);
    await page.locator('[data-testid="dropzone"][data-ready="true"]').waitFor({ timeout: 30_000 });

    await stopProc(upload);
    await page.getByTestId("dropzone-input").setInputFiles({ name: "while-down.csv", mimeType: "text/csv", buffer: Buffer.from(exportCsv(500, 1)) });
    const item = page.getByTestId("upload-item").first();
    await item.locator('[data-state="error"], [role="alert"]').first().waitFor({ timeout: 60_000 });
    await expect(item.getAttribute("data-state")).resolves.toBe("error");
    const message = await item.getByRole("alert").textContent();
    expect(message).toMatch(/upload service is not answering/i);
    expect(message).toMatch(/nothing was stored/i);
    await shot(page, "upload-service-down");

    upload = await startService("upload-fake", env);
    await item.getByRole("button", { name: /try again/i }).click();
    await page.waitForURL(/\/sessions\/\d+(\/import)?$/, { timeout: 60_000 });
    const sessionId = Number(/\/sessions\/(\d+)/.exec(page.url())![1]);
    const session = await RideSession.findByPk(sessionId);
    expect(session?.teamId).toBe(team.teamId);
    await page.close();
  });
});
