/**
 * The demo seed on this run's fresh database, with the local upload fake as the upload store:
 * run twice, nothing is duplicated, and the three demo sessions are ready with the laps and the
 * planted findings of the generator's ground truth (sample-logs/files/*.truth.json).
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { readFileSync } from "node:fs";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import { initModels, Bike, Engine, Finding, ImportProfile, Lap, LogFile, RaceEvent, Rider, RideSession, Track } from "@/models";
import { CAUTION_TEXT } from "@/lib/findings/caution";
import { formatLapList } from "@/lib/findings/collapse-findings";
import { makeUploadthingToken, startUploadFake, type UploadFake } from "@/workers/services/upload-fake";
import { seedDemo, type SeedResult } from "@/workers/seed";
import { DEMO_TEAM, DEMO_USERS } from "@/workers/demo-accounts";
import { BIKE } from "@/sample-logs/bike-model";
import { CIRCUIT } from "@/sample-logs/circuit";
import { at } from "../fixtures/at";

const DIR = path.resolve(__dirname, "../../sample-logs/files");
interface Truth {
  laps: { number: number; flags: { outLap: boolean; inLap: boolean } }[];
  events: { kind: string; lap: number; startS: number }[];
}
const truthOf = (csv: string): Truth => JSON.parse(readFileSync(path.join(DIR, csv.replace(/\.csv$/, ".truth.json")), "utf8"));

let fake: UploadFake;
let storageDir: string;
let first: SeedResult;
let second: SeedResult;
const lines: string[] = [];

async function counts(teamId: string) {
  return {
    riders: await Rider.count({ where: { teamId } }),
    bikes: await Bike.count({ where: { teamId } }),
    engines: await Engine.count({ where: { teamId } }),
    tracks: await Track.count({ where: { teamId } }),
    events: await RaceEvent.count({ where: { teamId } }),
    sessions: await RideSession.count({ where: { teamId } }),
    logFiles: await LogFile.count({ where: { teamId } }),
    profiles: await ImportProfile.count({ where: { teamId } }),
    findings: await Finding.count({ where: { teamId } }),
    files: fs.readdirSync(storageDir).filter((n) => !n.endsWith(".json")).length,
  };
}

beforeAll(async () => {
  initModels();
  storageDir = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-seed-"));
  const apiKey = "sk_seed_test_key";
  fake = await startUploadFake({ port: 0, storageDir, apiKey });
  const upload = { token: makeUploadthingToken({ apiKey, appId: "lapbench-seed-test" }), apiUrl: fake.url, ingestUrl: fake.url };
  const t0 = Date.now();
  first = await seedDemo({ upload, log: (l) => lines.push(l) });
  const firstMs = Date.now() - t0;
  const before = await counts(first.teamId);
  second = await seedDemo({ upload, log: (l) => lines.push(l) });
  console.log(`[seed.test] first run ${firstMs} ms\n${lines.join("\n")}`);
  expect(await counts(second.teamId)).toEqual(before);
}, 180_000);
afterAll(async () => {
  await fake?.close();
  fs.rmSync(storageDir, { recursive: true, force: true });
});

describe("seedDemo on a fresh database, run twice", () => {
  it("the second run finds everything and adds nothing", async () => {
    expect(second.teamId).toBe(first.teamId);
    expect(second.sessionIds).toEqual(first.sessionIds);
    const c = await counts(first.teamId);
    // Three committed sample files and two sessions generated at seed time (workers/seed-history.ts).
    expect(c).toMatchObject({ riders: 2, bikes: 2, engines: 2, tracks: 1, events: 2, sessions: 5, logFiles: 5, files: 5 });
    // Two headers (rider B's logger writes ';', decimal commas and ms): two Import profiles.
    expect(c.profiles).toBe(2);
    const users = await getSequelize().query<{ n: number }>(`SELECT COUNT(*) AS n FROM user WHERE email IN (${DEMO_USERS.map(() => "?").join(",")})`, {
      replacements: DEMO_USERS.map((u) => u.email),
      type: QueryTypes.SELECT,
    });
    expect(Number(at(users, 0).n)).toBe(DEMO_USERS.length);
    const teams = await getSequelize().query<{ n: number }>("SELECT COUNT(*) AS n FROM organization WHERE slug = ?", { replacements: [DEMO_TEAM.slug], type: QueryTypes.SELECT });
    expect(Number(at(teams, 0).n)).toBe(1);
  });

  it("the track is the invented circuit; bikes are set up like the generator's bike", async () => {
    const track = await Track.findByPk(first.trackId);
    expect(track!.name).toBe(CIRCUIT.name);
    expect(track!.pitSpeedLimitKmh).toBe(CIRCUIT.pitLane.speedLimitKmh);
    expect(track!.gates!.sectors).toHaveLength(2);
    expect(track!.corners!.map((c) => c.name)).toEqual(CIRCUIT.corners.map((c) => c.name));
    // Outline at ~2 m spacing over the lap: length / 2 m points, plus the closing one.
    expect(Math.abs(track!.outline!.length - CIRCUIT.lengthM / 2)).toBeLessThan(3);
    const event = await RaceEvent.findOne({ where: { teamId: first.teamId, name: "Spring test days" } });
    expect(event!.trackId).toBe(track!.id);
    for (const b of await Bike.findAll({ where: { teamId: first.teamId } })) {
      expect(b.revCeilingRpm).toBe(BIKE.revCeilingRpm);
      expect(b.primaryRatio).toBe(BIKE.primaryRatio);
      expect(b.gearboxRatios).toEqual([...BIKE.gearRatios]);
      expect([b.sprocketFront, b.sprocketRear]).toEqual([BIKE.frontSprocket, BIKE.rearSprocket]);
      expect([b.wheelCircFrontMm, b.wheelCircRearMm]).toEqual([1850, 1960]);
    }
  });

  it.each(["demo-session-20min.csv", "demo-session-10min-rider-b.csv", "three-laps-20hz.csv"])(
    "%s: ready, on the circuit, laps and planted findings as its truth file",
    async (file) => {
      const truth = truthOf(file);
      const id = first.sessionIds[file];
      const s = await RideSession.findByPk(id);
      expect(s!.status).toBe("ready");
      expect(s!.trackId).toBe(first.trackId);
      expect(s!.riderId).not.toBeNull();
      expect(s!.bikeId).not.toBeNull();
      expect(s!.kind).toBe(file.startsWith("three-laps") ? "qualifying" : "practice");
      const laps = await Lap.findAll({ where: { sessionId: id }, order: [["number", "ASC"]] });
      expect(laps).toHaveLength(truth.laps.length);
      // The generator numbers the out-lap 0; Lapbench numbers from 1.
      for (const tl of truth.laps) expect([at(laps, tl.number).isOutLap, at(laps, tl.number).isInLap]).toEqual([tl.flags.outLap, tl.flags.inLap]);
      const findings = await Finding.findAll({ where: { sessionId: id } });
      // Repeats of one kind are one finding naming the laps (a person's list); the first event places it.
      const kinds = [...new Set(truth.events.map((e) => e.kind))];
      for (const kind of kinds) {
        const events = truth.events.filter((e) => e.kind === kind);
        const e = at(events, 0);
        const hit = findings.filter((f) => f.kind === e.kind && f.lapNumber === e.lap + 1 && f.startTimeS! <= e.startS + 1 && f.endTimeS! >= e.startS - 1);
        expect(hit, `${e.kind} lap ${e.lap + 1}`).toHaveLength(1);
        if (events.length > 1) expect(at(hit, 0).message).toContain(`${events.length} times, ${formatLapList(events.map((x) => x.lap + 1))}`);
        if (e.kind !== "pit_overspeed") expect(at(hit, 0).message.endsWith(CAUTION_TEXT)).toBe(true);
      }
      // Default thresholds on a clean ride: nothing but the planted events.
      expect(findings).toHaveLength(kinds.length);
    },
  );

  it("the rider is linked to the rider sign-in and rides bike 27", async () => {
    const riderUser = DEMO_USERS.find((u) => u.role === "rider")!;
    const rider = await Rider.findOne({ where: { teamId: first.teamId, userId: first.userIds.rider } });
    expect(rider!.name).toBe(riderUser.name);
    const s = await RideSession.findByPk(first.sessionIds["demo-session-20min.csv"]);
    expect(s!.riderId).toBe(rider!.id);
    expect((await Bike.findByPk(s!.bikeId!))!.name).toBe("Bike 27");
  });
});

describe("demo names agree", () => {
  it("each demo file's header names the team, rider and bike the seed files its session under", async () => {
    // The header of the file as uploaded (the committed sample files and the history files the seed generates).
    const header = async (logFileId: number) => {
      const url = (await LogFile.findByPk(logFileId))!.url!;
      const head = (await (await fetch(url)).text()).slice(0, 2000).split("\n");
      const field = (k: string) => head.find((l) => l.startsWith(`# ${k}: `))?.slice(k.length + 4).trim();
      return { team: field("team"), rider: field("rider"), bike: field("bike") };
    };
    const files = Object.keys(first.sessionIds);
    expect(files).toEqual(expect.arrayContaining(["demo-session-20min.csv", "demo-session-10min-rider-b.csv", "three-laps-20hz.csv", "summer-round-fp1.csv"]));
    for (const file of files) {
      const s = (await RideSession.findByPk(first.sessionIds[file]))!;
      const [org] = await getSequelize().query<{ name: string }>("SELECT name FROM organization WHERE id = ?", { replacements: [s.teamId], type: QueryTypes.SELECT });
      const seeded = { team: org!.name, rider: (await Rider.findByPk(s.riderId!))!.name, bike: (await Bike.findByPk(s.bikeId!))!.name };
      expect(await header(s.logFileId!), file).toEqual(seeded);
    }
  });
});

describe("the demo team's history", () => {
  it("holds two events, a setup change with a measurable lap-time effect and an engine past 80 % of its interval", async () => {
    const { requireTeam } = await import("@/lib/auth/guard");
    const { getSetupEffects } = await import("@/lib/data/setup-history");
    const { getSeasonRecord } = await import("@/lib/data/season-record");
    const { enginesOfBike } = await import("@/lib/data/engines");
    const { signInCookie } = await import("./helpers/teams");
    const engineer = DEMO_USERS.find((u) => u.role === "engineer")!;
    const { DEMO_PASSWORD } = await import("@/workers/demo-accounts");
    const ctx = await requireTeam(new Headers({ cookie: await signInCookie(engineer.email, DEMO_PASSWORD) }));
    const record = await getSeasonRecord(ctx);
    expect(record.events.filter((e) => e.eventId != null).map((e) => e.eventName)).toEqual(["Spring test days", "Summer round"]);
    const { effects } = await getSetupEffects(ctx, { sessionId: first.sessionIds["summer-round-fp2.csv"] });
    const e = effects.find((x) => x.after.sessionId === first.sessionIds["summer-round-fp2.csv"])!;
    expect(e.changes.map((c) => c.field)).toContain("shockReboundClicks");
    // More grip in the second outing's rider profile: quicker by well over the 1 ms a lap time is stored to.
    expect(e.bestLapDeltaMs!).toBeLessThan(-200);
    expect(e.bestThreeMeanDeltaMs!).toBeLessThan(-200);
    const bike27 = (await Bike.findOne({ where: { teamId: first.teamId, name: "Bike 27" } }))!;
    const { engines } = await enginesOfBike(ctx, bike27.id);
    const used = engines.find((x) => x.serial === "LV-E101")!.ledger.usedPct!;
    expect(used).toBeGreaterThan(80);
    expect(used).toBeLessThan(100);
  });
});
