/**
 * A CSV refused because rows repeat their time stamps (a 1 kHz log exported with times rounded
 * to 10 ms), imported again from the refusal keeping the first row of each stamp — through the
 * lib functions the session page calls, the real upload path and the real MariaDB.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import { initModels, ImportProfile, RideSession } from "@/models";
import { runIngestJob } from "@/workers/ingest/run-ingest-job";
import { confirmSessionImport, getImportScreen, keepFirstOfRepeatedTimes } from "@/lib/data/session-edit";
import { getSessionOverview } from "@/lib/data/session-overview";
import { importFormSchema } from "@/lib/forms/session-form";
import type { TeamContext } from "@/lib/auth/guard";
import type { TeamRole } from "@/lib/auth/permissions";
import { HttpError } from "@/lib/http/http-error";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";

let team: TestTeam;
let other: TestTeam;
let up: UploadHarness;
const sequelize = () => getSequelize();

function ctxOf(t: TestTeam, role: TeamRole): TeamContext {
  const m = t.members[role];
  return { teamId: t.teamId, teamName: "t", teamSlug: "t", role, userId: m.userId, userName: role, email: m.email, memberships: [] };
}

/**
 * 1 000 rows at 1 kHz, time written with two decimals: every 10 ms stamp is written on 10 rows, so
 * 100 stamps and 900 rows repeating the one before (by construction). The speed column is the row
 * number, so the rows kept show which of each stamp survived.
 */
function roundedKilohertzCsv(): string {
  const lines = ["Time [s],Front wheel speed [m/s],Front brake [bar]"];
  for (let i = 0; i < 1000; i++) lines.push(`${(Math.floor(i / 10) / 100).toFixed(2)},${i},${i % 100 < 10 ? 8 : 0}`);
  return lines.join("\n") + "\n";
}

async function parse(id: number): Promise<"ready" | "failed"> {
  const r = await runIngestJob(sequelize(), id);
  await sequelize().query("UPDATE jobs SET state = 'done' WHERE session_id = ? AND state = 'queued'", { replacements: [id], type: QueryTypes.UPDATE });
  return r;
}

async function expectHttp(p: Promise<unknown>, status: number): Promise<void> {
  const e = await p.then(
    () => null,
    (err: unknown) => err,
  );
  expect(e).toBeInstanceOf(HttpError);
  expect((e as HttpError).status).toBe(status);
}

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Repeated stamps team");
  other = await createTeamWithRoles("Repeated stamps other team");
  up = await startUploadHarness();
});
afterAll(async () => {
  await up?.close();
});

describe("a CSV refused for repeated time stamps", () => {
  let sessionId: number;

  it("is refused with the count, and the session page offers to keep the first row of each stamp", async () => {
    ({ sessionId } = await up.upload(new File([roundedKilohertzCsv()], "rounded-1khz.csv", { type: "text/csv" }), team.members.engineer.cookie));
    const screen = await getImportScreen(ctxOf(team, "engineer"), sessionId);
    const v = importFormSchema.parse({
      title: "Rounded export",
      kind: "test",
      eventId: "",
      bikeId: "",
      engineId: "",
      riderId: "",
      startedAt: "",
      conditions: "",
      sharedWithRiders: false,
      profileName: "Rounded logger",
      timeFormat: "seconds",
      columns: screen.columns.map((c) => ({ index: c.index, role: c.role, unit: c.unit, scale: c.scale, offset: c.offset })),
    });
    await confirmSessionImport(sequelize(), ctxOf(team, "engineer"), sessionId, v);
    expect(await parse(sessionId)).toBe("failed");
    const o = await getSessionOverview(ctxOf(team, "engineer"), sessionId);
    expect(o.session.status).toBe("failed");
    expect(o.session.statusReason).toMatch(/Line 3, column 'Time \[s\]': the time '0\.00' repeats the one on line 2/);
    expect(o.session.statusReason).toMatch(/900 rows repeat the time stamp of the row before/);
    expect(o.repeatedTimeRows).toBe(900);
    expect(o.channels).toEqual([]);
  });

  it("viewers and riders cannot choose it; another team's engineer gets 404; nothing is queued", async () => {
    await expectHttp(keepFirstOfRepeatedTimes(sequelize(), ctxOf(team, "viewer"), sessionId), 403);
    await expectHttp(keepFirstOfRepeatedTimes(sequelize(), ctxOf(team, "rider"), sessionId), 403);
    await expectHttp(keepFirstOfRepeatedTimes(sequelize(), ctxOf(other, "engineer"), sessionId), 404);
    expect((await RideSession.findByPk(sessionId))?.status).toBe("failed");
  });

  it("imports keeping the first row of each stamp: 100 samples, the dropped count on the session page, the team's profile unchanged", async () => {
    await keepFirstOfRepeatedTimes(sequelize(), ctxOf(team, "engineer"), sessionId);
    expect((await RideSession.findByPk(sessionId))?.status).toBe("queued");
    expect(await parse(sessionId)).toBe("ready");
    const o = await getSessionOverview(ctxOf(team, "viewer"), sessionId);
    expect(o.repeatedTimeRows).toBeNull();
    expect(o.importNotes).toContain("900 rows repeating the time stamp of the row before were dropped (the first row of each time stamp kept).");
    const speed = o.channels.find((c) => c.name === "Front wheel speed")!;
    // The first row of each stamp: rows 0, 10, …, 990 — speed 0 … 990 m/s as written, 100 samples.
    expect(speed.samples).toBe(100);
    expect(speed.rateHz).toBeCloseTo(100, 6);
    expect(o.session.durationS).toBeCloseTo(0.99, 9);
    const profile = await ImportProfile.findOne({ where: { teamId: team.teamId } });
    expect((profile?.mapping as { duplicateTimes?: string }).duplicateTimes).toBeUndefined();
  });

  it("a session that was not refused for repeated stamps cannot be imported this way (409)", async () => {
    await expectHttp(keepFirstOfRepeatedTimes(sequelize(), ctxOf(team, "engineer"), sessionId), 409);
  });
});
