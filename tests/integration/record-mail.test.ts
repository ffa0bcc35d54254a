/**
 * E-mail of the team record through nodemailer and the local SMTP fake (read back with mailparser
 * by lib/mail/captured-mail): "session ready" to the session's rider with their summary in plain
 * text and a link to the Rider brief, to engineers with the findings count, once per person, only
 * to those who want it; the owner's event report; and a mail service that is down fails nothing.
 * Both parts (plain text and HTML) come from the same React components.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { startMailFake, type MailFake } from "@/workers/services/mail-fake";
import { listCapturedMail, findLatestMailTo } from "@/lib/mail/captured-mail";
import { config } from "@/lib/config";
import { getSequelize } from "@/models/db";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { buildWorld, type World } from "./helpers/record-world";
import { requireTeam } from "@/lib/auth/guard";
import { notifySessionReady } from "@/lib/mail/session-ready";
import { saveMailPreferences } from "@/lib/data/mail-preferences";
import { sendEventReport } from "@/lib/data/event-report";
import { at } from "../fixtures/at";

let fake: MailFake;
let dir: string;
let team: TestTeam;
let world: World;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-record-mail-"));
  fake = await startMailFake({ port: config.smtp.port, dir });
  team = await createTeamWithRoles("Mail team");
  world = await buildWorld(team, [
    { title: "Mail FP", event: "a", rider: "own", bike: "one", startedAt: "2031-04-05T09:00:00Z", lapsMs: [93_000, 92_500, 92_800], topSpeedsMs: [80, 81.5, 80], findings: { open: 2, acknowledged: 1 } },
    { title: "Mail FP2", event: "a", rider: "own", bike: "one", startedAt: "2031-04-05T13:00:00Z", lapsMs: [92_000] },
  ]);
});
afterAll(async () => {
  await fake?.close().catch(() => undefined);
  fs.rmSync(dir, { recursive: true, force: true });
});

describe("session ready mail", () => {
  it("reaches the rider with the summary in plain text and a link, and engineers with the findings count", async () => {
    const id = at(world.sessions, "Mail FP");
    const r = await notifySessionReady(getSequelize(), id);
    expect(r.errors).toEqual([]);
    expect(r.sent.map((s) => s.audience).sort()).toEqual(["engineer", "rider"]);
    const rider = (await findLatestMailTo(team.members.rider.email, dir))!;
    expect(rider.subject).toBe("Mail FP is ready: your brief");
    expect(rider.text).toMatch(/Best lap: 1:32\.500/);
    expect(rider.text).toMatch(/Best-three mean: 1:32\.767/); // (93.0 + 92.5 + 92.8) / 3 = 92.7667 s
    expect(rider.text).toMatch(/Top speed: 293\.4 km\/h/); // 81.5 m/s × 3.6 (SI → km/h, NIST SP 811)
    expect(rider.links).toContain(`${config.appUrl}/sessions/${id}/brief`);
    expect(rider.html).toMatch(/<html/);
    expect(rider.html).toContain(`/sessions/${id}/brief`);
    const eng = (await findLatestMailTo(team.members.engineer.email, dir))!;
    expect(eng.subject).toBe("Mail FP is ready: 3 findings");
    expect(eng.text).toMatch(/Findings: 3/);
    expect(eng.links).toContain(`${config.appUrl}/sessions/${id}`);
    // Owners and viewers get no "session ready" mail.
    expect(await findLatestMailTo(team.members.viewer.email, dir)).toBeUndefined();
  });

  it("is sent once per session and person, and not to those who turned it off", async () => {
    const before = (await listCapturedMail(dir)).length;
    expect((await notifySessionReady(getSequelize(), at(world.sessions, "Mail FP"))).sent).toEqual([]);
    await saveMailPreferences({ userId: team.members.rider.userId }, { sessionReady: false, eventReport: true });
    const r = await notifySessionReady(getSequelize(), at(world.sessions, "Mail FP2"));
    expect(r.sent.map((s) => s.to)).toEqual([team.members.engineer.email]);
    expect(r.skipped).toContain(team.members.rider.email);
    expect((await listCapturedMail(dir)).length).toBe(before + 1);
  });
});

describe("event report", () => {
  it("goes to the owner with best laps, findings and engine use", async () => {
    const ctx = await requireTeam(new Headers({ cookie: team.members.engineer.cookie }));
    const to = await sendEventReport(ctx, world.events.a.id);
    expect(to).toEqual([team.members.owner.email]);
    const m = (await findLatestMailTo(team.members.owner.email, dir))!;
    expect(m.subject).toBe("Event report: Round 1");
    expect(m.text).toMatch(/Wren Tallis/);
    expect(m.text).toMatch(/1:32\.000/);
    expect(m.text).toMatch(/2 open, 1 acknowledged/);
    expect(m.text).toMatch(new RegExp(`${world.engine.serial}: 0\\.00 h`));
    const rider = await requireTeam(new Headers({ cookie: team.members.rider.cookie }));
    await expect(sendEventReport(rider, world.events.a.id)).rejects.toMatchObject({ status: 403 });
  });
});

describe("a mail service that is down", () => {
  it("fails nothing: the outcome lists the error", async () => {
    await fake.close();
    await saveMailPreferences({ userId: team.members.rider.userId }, { sessionReady: true, eventReport: true });
    const s = await (await import("@/models")).RideSession.create({ ...(await (await import("@/models")).RideSession.findByPk(world.sessions["Mail FP2"]))!.get({ plain: true }), id: undefined, title: "Down" } as never);
    const r = await notifySessionReady(getSequelize(), s.id);
    expect(r.sent).toEqual([]);
    expect(r.errors.length).toBeGreaterThan(0);
  });
});
