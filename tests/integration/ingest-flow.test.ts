/**
 * Upload → job → ready through the real upload route (SDK + local upload fake + our guard),
 * the MariaDB queue and the ingest runner; values read back from the chunks; Import profile reuse;
 * refusals; bad input; two workers at once; a worker killed mid-write and the retry.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import { initModels, RideSession, LogFile, ImportProfile } from "@/models";
import { claimJob, finishJob, failJob } from "@/lib/data/jobs";
import { confirmMapping } from "@/lib/data/imports";
import { listChannels, readChannels } from "@/lib/data/samples";
import { runIngestJob } from "@/workers/ingest/run-ingest-job";
import type { Mapping } from "@/lib/ingest/mapping";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";
import { KMH_TO_MPS, BAR_TO_PA } from "@/lib/ingest/units";
import { at } from "../fixtures/at";

let team: TestTeam;
let up: UploadHarness;
const sequelize = () => getSequelize();

/** A small export: 100 Hz, speed as a known function of time, brake pressure in bar, GPS every 5th row. */
function exportCsv(rows: number, opts: { badCellAtRow?: number; extraHeader?: string; run?: number } = {}): string {
  // `run` makes otherwise equal exports differ by a metadata line: the same bytes twice are held back as a duplicate.
  const lines = ["# logger: bench unit 3", "# rider: test rider", ...(opts.run !== undefined ? [`# run: ${opts.run}`] : []), `Time [s],Front wheel speed [km/h],Front brake [bar],GPS speed [km/h]${opts.extraHeader ?? ""}`];
  for (let i = 0; i < rows; i++) {
    const t = i / 100;
    const v = 100 + 50 * Math.sin(t);
    const brake = i % 300 < 40 ? 8.5 : 0;
    const gps = i % 5 === 0 ? v.toFixed(2) : "";
    const cell = opts.badCellAtRow === i ? "n/a" : v.toFixed(3);
    lines.push(`${t.toFixed(2)},${cell},${brake.toFixed(1)},${gps}${opts.extraHeader ? ",1" : ""}`);
  }
  return lines.join("\n") + "\n";
}

/** Run one session's job as the worker would (its own job: other files may have left jobs queued). */
async function runOneJob(sessionId: number): Promise<"ready" | "failed" | null> {
  const job = await claimJob(sequelize(), "test-runner", { sessionId });
  if (!job) return null;
  const r = await runIngestJob(sequelize(), sessionId);
  if (r === "ready") await finishJob(sequelize(), job.id);
  else await failJob(sequelize(), job.id, "bad input");
  return r;
}

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Ingest team");
  up = await startUploadHarness();
});
afterAll(async () => {
  await up?.close();
});

describe("upload → mapping → job → ready", () => {
  let firstSession: number;

  it("an engineer uploads a CSV; it waits for a mapping with a suggestion from names and units", async () => {
    const { sessionId } = await up.upload(new File([exportCsv(2000)], "fp1-bike27.csv", { type: "text/csv" }), team.members.engineer.cookie);
    firstSession = sessionId;
    const s = await RideSession.findByPk(sessionId);
    expect(s?.teamId).toBe(team.teamId);
    expect(s?.status).toBe("mapping");
    const m = s?.mapping as Mapping;
    expect(m.columns.map((c) => c.role)).toEqual(["time", "speed_front", "brake_front", "gps_speed"]);
    const log = await LogFile.findByPk(s!.logFileId!);
    expect(log?.name).toBe("fp1-bike27.csv");
    expect(log?.bytes).toBe(Buffer.byteLength(exportCsv(2000)));
  });

  it("confirming saves an Import profile and the parsed values read back in SI units", async () => {
    const s = await RideSession.findByPk(firstSession);
    await confirmMapping(sequelize(), team.teamId, firstSession, s!.mapping as Mapping, "Bench unit 3");
    expect(await ImportProfile.count({ where: { teamId: team.teamId } })).toBe(1);
    expect(await runOneJob(firstSession)).toBe("ready");
    const ready = await RideSession.findByPk(firstSession);
    expect(ready?.status).toBe("ready");
    expect(ready?.progress).toBe(100);
    expect(ready?.durationS).toBeCloseTo(19.99, 6);
    const channels = await listChannels(sequelize(), firstSession);
    expect(channels.map((c) => c.role)).toEqual(["time", "speed_front", "brake_front", "gps_speed"]);
    const data = await readChannels(sequelize(), channels);
    const time = data.get(at(channels, 0).id)!;
    const speed = data.get(at(channels, 1).id)!;
    const brake = data.get(at(channels, 2).id)!;
    const gps = data.get(at(channels, 3).id)!;
    expect(time.length).toBe(2000);
    for (const i of [0, 1, 777, 1999]) {
      const t = i / 100;
      expect(time[i]).toBeCloseTo(t, 9);
      // km/h → m/s by 1/3.6, exact (NIST SP 811, App. B); Float32 storage keeps ~7 digits.
      expect(speed[i]).toBeCloseTo(Number((100 + 50 * Math.sin(t)).toFixed(3)) * KMH_TO_MPS, 4);
    }
    // bar → Pa by 100 000, exact (NIST SP 811, App. B).
    expect(brake[0]).toBe(8.5 * BAR_TO_PA);
    expect(Number.isNaN(gps[1])).toBe(true);
    expect(at(channels, 3).sampleCount).toBe(400);
  });

  it("the next file with the same header is queued at once with the saved profile", async () => {
    const { sessionId } = await up.upload(new File([exportCsv(500)], "fp2-bike27.csv"), team.members.owner.cookie);
    const s = await RideSession.findByPk(sessionId);
    expect(s?.status).toBe("queued");
    expect(s?.importProfileId).not.toBeNull();
    expect(await runOneJob(sessionId)).toBe("ready");
  });

  it.each(["rider", "viewer"] as const)("a %s cannot upload, and nothing is stored", async (role) => {
    const before = await RideSession.count({ where: { teamId: team.teamId } });
    await expect(up.upload(new File([exportCsv(10)], "x.csv"), team.members[role].cookie)).rejects.toThrow(/engineers and owners/);
    expect(await RideSession.count({ where: { teamId: team.teamId } })).toBe(before);
  });

  it("a bad cell fails the session with line and column, keeps the file and shows no channels", async () => {
    const body = exportCsv(300, { badCellAtRow: 200 });
    const { sessionId } = await up.upload(new File([body], "fp3-bike27.csv"), team.members.engineer.cookie);
    expect((await RideSession.findByPk(sessionId))?.status).toBe("queued");
    expect(await runOneJob(sessionId)).toBe("failed");
    const s = await RideSession.findByPk(sessionId);
    expect(s?.status).toBe("failed");
    // Line 204 = 3 preamble/header lines + row index 200 + 1.
    expect(s?.statusReason).toMatch(/line 204/i);
    expect(s?.statusReason).toMatch(/Front wheel speed/);
    expect(s?.statusReason).toMatch(/n\/a/);
    expect(await listChannels(sequelize(), sessionId)).toEqual([]);
    const log = await LogFile.findByPk(s!.logFileId!);
    const stored = await fetch(log!.url!);
    expect(stored.status).toBe(200);
    expect(await stored.text()).toBe(body);
  });
});

function startWorker(extraEnv: Record<string, string> = {}): ChildProcess & { output: string[] } {
  const root = path.resolve(__dirname, "../..");
  // `node --import tsx`, not the tsx CLI: the CLI runs the script in a child process, so killing
  // its PID would leave the real worker running.
  const child = spawn(process.execPath, ["--import", "tsx", "workers/ingest-worker.ts"], {
    cwd: root,
    env: { ...process.env, LAPBENCH_WORKER_POLL_MS: "100", ...extraEnv },
    stdio: ["ignore", "pipe", "pipe"],
  }) as ChildProcess & { output: string[] };
  child.output = [];
  child.stdout!.on("data", (d: Buffer) => child.output.push(d.toString()));
  child.stderr!.on("data", (d: Buffer) => child.output.push(d.toString()));
  return child;
}

async function waitFor(cond: () => Promise<boolean>, timeoutMs: number, what: string) {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    if (await cond()) return;
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`timed out waiting for ${what}`);
}

async function stop(child: ChildProcess) {
  if (child.exitCode !== null) return;
  child.kill("SIGTERM");
  await new Promise((r) => child.once("exit", r));
}

describe("worker processes", () => {
  // Files run one at a time and share the queue: close jobs earlier files left queued, so the
  // worker processes started here only see this file's jobs.
  beforeAll(async () => {
    await sequelize().query("UPDATE jobs SET state = 'failed', error = 'left queued by an earlier test file' WHERE state IN ('queued', 'running')", { type: QueryTypes.UPDATE });
  });

  it("two workers at once never process the same job", async () => {
    const ids: number[] = [];
    for (let i = 0; i < 6; i++) ids.push((await up.upload(new File([exportCsv(3000, { run: i })], `batch-${i}.csv`), team.members.engineer.cookie)).sessionId);
    const w1 = startWorker();
    const w2 = startWorker();
    try {
      await waitFor(async () => (await RideSession.count({ where: { id: ids, status: "ready" } })) === ids.length, 60_000, "six ready sessions");
    } finally {
      await Promise.all([stop(w1), stop(w2)]);
    }
    const jobs = await sequelize().query<{ session_id: number; attempts: number; state: string; locked_by: string | null }>(
      `SELECT session_id, attempts, state, locked_by FROM jobs WHERE session_id IN (${ids.join(",")})`,
      { type: QueryTypes.SELECT },
    );
    expect(jobs).toHaveLength(6);
    for (const j of jobs) {
      expect(j.state).toBe("done");
      expect(j.attempts).toBe(1);
    }
    // Each of these sessions' jobs was started exactly once across both workers' logs. (The
    // workers may also pick up jobs other test files left in the shared queue; those don't count.)
    const log = [...w1.output, ...w2.output].join("");
    const startedSessions = [...log.matchAll(/job \d+ \(session (\d+),/g)].map((m) => Number(m[1])).filter((id) => ids.includes(id));
    expect(startedSessions.sort((x, y) => x - y)).toEqual([...ids].sort((x, y) => x - y));
    for (const id of ids) expect((await listChannels(sequelize(), id)).length).toBe(4);
  });

  it("a worker killed mid-write leaves nothing visible; the job is retried and completes", async () => {
    const { sessionId } = await up.upload(new File([exportCsv(4000)], "killed.csv"), team.members.engineer.cookie);
    const w1 = startWorker({ LAPBENCH_TEST_PAUSE_BEFORE_COMMIT_MS: "20000", LAPBENCH_WORKER_STALE_S: "2" });
    // Wait until the chunks are written inside the open transaction.
    await waitFor(async () => w1.output.join("").includes(`session ${sessionId}: samples written`), 30_000, "the write to reach the pause");
    expect(await listChannels(sequelize(), sessionId)).toEqual([]); // uncommitted: invisible
    w1.kill("SIGKILL");
    await new Promise((r) => w1.once("exit", r));
    expect(await listChannels(sequelize(), sessionId)).toEqual([]);
    const w2 = startWorker({ LAPBENCH_WORKER_STALE_S: "2" });
    try {
      await waitFor(async () => (await RideSession.findByPk(sessionId))?.status === "ready", 60_000, "the retried job");
    } finally {
      await stop(w2);
    }
    const [job] = await sequelize().query<{ attempts: number; state: string }>("SELECT attempts, state FROM jobs WHERE session_id = ?", { replacements: [sessionId], type: QueryTypes.SELECT });
    expect(job).toEqual({ attempts: 2, state: "done" });
    expect((await listChannels(sequelize(), sessionId)).length).toBe(4);
  });
});
