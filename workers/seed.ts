/**
 * Seeds the invented demo team (idempotent): four sign-ins, one per role, riders, bikes set up
 * like the sample-log generator's bike, engines, the invented circuit with its gates, an event
 * there, and three ridden sessions ingested through the real path (upload store → registerUpload
 * → Import profile → ingest job), so the app opens on ready sessions with laps and findings.
 * Every name here is invented. Run by `npm start`; safe to run again.
 */
import fs from "node:fs";
import path from "node:path";
import { QueryTypes, type Sequelize } from "sequelize";
import { UTApi } from "uploadthing/server";
import { config } from "../lib/config";
import { getSequelize } from "../models/db";
import { initModels, Rider, Bike, Engine, RaceEvent, RideSession, type SessionKind } from "../models";
import { createAuth } from "../lib/auth/create-auth";
import { confirmMapping, prepareImport, registerUpload } from "../lib/data/imports";
import { ensureTrack } from "../lib/data/tracks";
import type { Mapping } from "../lib/ingest/mapping";
import { BIKE } from "../sample-logs/bike-model";
import { DEMO_ROSTER, type DemoBikeName } from "../sample-logs/demo-roster";
import { DEMO_PASSWORD, DEMO_TEAM, DEMO_USERS } from "./demo-accounts";
import { demoTrackInput } from "./demo-track";
import { ingestNow } from "./ingest/ingest-now";
import { seedHistory } from "./seed-history";

/** A seeded row by its name; a missing one is a bug in the seed lists, so say which. */
function need<T>(map: Record<string, T>, key: string, what: string): T {
  const v = map[key];
  if (v === undefined) throw new Error(`seed: no ${what} entry "${key}"`);
  return v;
}

const SAMPLE_DIR = path.join(config.root, "sample-logs", "files");

const RIDER_B = DEMO_ROSTER.riders.b;
const BIKE_A = DEMO_ROSTER.bikes.a.name;
const BIKE_B = DEMO_ROSTER.bikes.b.name;

/** The demo rides: sample-logs files (invented data) and what the team records about each. */
const DEMO_SESSIONS: { file: string; title: string; rider: "a" | "b"; bike: DemoBikeName; kind: SessionKind; profile: string }[] = [
  { file: "demo-session-20min.csv", title: "Practice 1", rider: "a", bike: BIKE_A, kind: "practice", profile: "Team logger CSV" },
  // Rider B's logger writes ';' with decimal commas and time in ms: a header of its own, so a profile of its own.
  { file: "demo-session-10min-rider-b.csv", title: "Practice 1", rider: "b", bike: BIKE_B, kind: "practice", profile: "Team logger CSV (semicolon, ms)" },
  { file: "three-laps-20hz.csv", title: "Qualifying", rider: "a", bike: BIKE_A, kind: "qualifying", profile: "Team logger CSV" },
];

export interface SeedOptions {
  /** The upload service; default from UPLOADTHING_TOKEN / UPLOADTHING_API_URL / UPLOADTHING_INGEST_URL (set by the start stack). */
  upload?: { token: string; apiUrl: string; ingestUrl: string };
  log?: (line: string) => void;
}

export interface SeedResult {
  teamId: string;
  userIds: Record<string, string>;
  trackId: number;
  /** Session id per sample file (absent when no upload service was available). */
  sessionIds: Record<string, number>;
}

function uploadFromEnv(): SeedOptions["upload"] {
  const token = process.env.UPLOADTHING_TOKEN;
  const apiUrl = process.env.UPLOADTHING_API_URL;
  if (!token || !apiUrl) return undefined;
  return { token, apiUrl, ingestUrl: process.env.UPLOADTHING_INGEST_URL ?? apiUrl };
}

async function findOrCreate<T>(find: () => Promise<T | null>, create: () => Promise<T>): Promise<[T, boolean]> {
  const found = await find();
  return found ? [found, false] : [await create(), true];
}

/** The session of a demo file, found by the uploaded file's name (the seed's own key for idempotency). */
async function sessionOfFile(sequelize: Sequelize, teamId: string, file: string): Promise<number | null> {
  const rows = await sequelize.query<{ id: number }>(
    "SELECT rs.id FROM ride_sessions rs JOIN log_files lf ON lf.id = rs.log_file_id WHERE rs.team_id = ? AND lf.name = ? ORDER BY rs.id LIMIT 1",
    { replacements: [teamId, file], type: QueryTypes.SELECT },
  );
  return rows[0]?.id ?? null;
}

export async function seedDemo(opts: SeedOptions = {}): Promise<SeedResult> {
  const say = opts.log ?? ((m: string) => console.log(`[seed] ${m}`));
  const sequelize = getSequelize();
  initModels(sequelize);
  const auth = createAuth(sequelize);

  const userIds: Record<string, string> = {};
  for (const u of DEMO_USERS) {
    const found = await sequelize.query<{ id: string }>("SELECT id FROM user WHERE email = ?", { replacements: [u.email], type: QueryTypes.SELECT });
    if (found[0]) userIds[u.role] = found[0].id;
    else {
      const r = await auth.api.signUpEmail({ body: { email: u.email, password: DEMO_PASSWORD, name: u.name } });
      userIds[u.role] = r.user.id;
      say(`sign-in ${u.email} (${u.role}) created`);
    }
  }
  // The demo addresses are invented (.example) and cannot receive mail: mark them confirmed.
  await sequelize.query("UPDATE user SET emailVerified = 1 WHERE email IN (?)", { replacements: [DEMO_USERS.map((u) => u.email)], type: QueryTypes.UPDATE });

  let teamId: string;
  const teams = await sequelize.query<{ id: string }>("SELECT id FROM organization WHERE slug = ?", { replacements: [DEMO_TEAM.slug], type: QueryTypes.SELECT });
  if (teams[0]) teamId = teams[0].id;
  else {
    const t = await auth.api.createOrganization({ body: { name: DEMO_TEAM.name, slug: DEMO_TEAM.slug, userId: userIds.owner } });
    if (!t) throw new Error("could not create the demo team");
    teamId = t.id;
    say(`team ${DEMO_TEAM.name} created`);
  }

  for (const u of DEMO_USERS) {
    if (u.role === "owner") continue;
    const m = await sequelize.query<{ id: string }>("SELECT id FROM member WHERE organizationId = ? AND userId = ?", {
      replacements: [teamId, userIds[u.role]],
      type: QueryTypes.SELECT,
    });
    if (!m[0]) await auth.api.addMember({ body: { userId: need(userIds, u.role, "userIds"), role: u.role, organizationId: teamId } });
  }

  const riderUser = DEMO_USERS.find((u) => u.role === "rider")!;
  const [riderA] = await findOrCreate(
    () => Rider.findOne({ where: { teamId, name: riderUser.name } }),
    () => Rider.create({ teamId, name: riderUser.name, raceNumber: DEMO_ROSTER.riders.a.raceNumber, userId: userIds.rider }),
  );
  const [riderB] = await findOrCreate(
    () => Rider.findOne({ where: { teamId, name: RIDER_B.name } }),
    () => Rider.create({ teamId, name: RIDER_B.name, raceNumber: RIDER_B.raceNumber, userId: null }),
  );

  // Invented machines set up like the sample-log generator's bike (sample-logs/bike-model.ts), so
  // gear, slip and rev-ceiling figures of the demo sessions agree with the logs. Its rolling
  // circumferences sit a little under the nominal π·D of a 120/70 ZR17 front (1884 mm) and a
  // 190/55 ZR17 rear (2013 mm), as real tyres roll smaller (nominal D = 25.4·rim + 2·width·aspect/100, ISO 5751 / ETRTO
  // practice, from memory).
  const setup = {
    className: "Superbike (1000 cc four)",
    wheelCircFrontMm: BIKE.frontCircumferenceM * 1000,
    wheelCircRearMm: BIKE.rearCircumferenceM * 1000,
    primaryRatio: BIKE.primaryRatio,
    gearboxRatios: [...BIKE.gearRatios],
    sprocketFront: BIKE.frontSprocket,
    sprocketRear: BIKE.rearSprocket,
    revCeilingRpm: BIKE.revCeilingRpm,
    forkStrokeMm: BIKE.forkStrokeMm,
    shockStrokeMm: BIKE.shockStrokeMm,
  };
  const bikes: Record<string, Bike> = {};
  const engines: Record<string, Engine> = {};
  for (const [name, serial, notes] of [
    [BIKE_A, DEMO_ROSTER.bikes.a.engineSerial, DEMO_ROSTER.bikes.a.engineNotes],
    [BIKE_B, DEMO_ROSTER.bikes.b.engineSerial, DEMO_ROSTER.bikes.b.engineNotes],
  ] as const) {
    const [bike, created] = await findOrCreate(
      () => Bike.findOne({ where: { teamId, name } }),
      () => Bike.create({ teamId, name, ...setup, tyreCrownRadiusMm: 95, tyreCrownRadiusFrontMm: 80, calibrations: null, thresholds: null }),
    );
    // Bikes made by the earlier seed (primary 1.667, 16/41) get the generator's setup; a bike the
    // team has edited since is left alone.
    if (!created && bike.primaryRatio === 1.667 && bike.sprocketRear === 41) await bike.update(setup);
    bikes[name] = bike;
    [engines[name]] = await findOrCreate(
      () => Engine.findOne({ where: { teamId, serial } }),
      () => Engine.create({ teamId, bikeId: bike.id, serial, rebuildIntervalH: 30, rebuildIntervalKm: 5000, notes }),
    );
  }

  const { track, created: trackCreated } = await ensureTrack(sequelize, teamId, demoTrackInput());
  if (trackCreated) say(`track ${track.name} created (${track.outline?.length ?? 0} outline points, ${track.corners?.length ?? 0} corners)`);

  // The event of the demo sessions (their logs start on 17 May 2031).
  const eventFields = { trackId: track.id, startsOn: "2031-05-17", endsOn: "2031-05-18" };
  const [event, eventCreated] = await findOrCreate(
    () => RaceEvent.findOne({ where: { teamId, name: "Spring test days" } }),
    () => RaceEvent.create({ teamId, name: "Spring test days", ...eventFields }),
  );
  if (!eventCreated && event.trackId !== track.id) await event.update(eventFields);

  const sessionIds: Record<string, number> = {};
  const upload = opts.upload ?? uploadFromEnv();
  const utapi = upload ? new UTApi({ token: upload.token, apiUrl: upload.apiUrl, ingestUrl: upload.ingestUrl, logLevel: "Error" }) : null;
  // After the first event's sessions: a second event, a setup change with its effect, an engine nearing its rebuild.
  const history = async () => Object.assign(sessionIds, await seedHistory({ sequelize, teamId, engineerId: need(userIds, "engineer", "userIds"), rider: riderA, bike: need(bikes, BIKE_A, "bikes"), engine: need(engines, BIKE_A, "engines"), track, utapi, say }));
  if (!upload || !utapi) {
    await history();
    say("no upload service configured (UPLOADTHING_TOKEN, UPLOADTHING_API_URL): demo sessions skipped — `npm start` runs one");
    return { teamId, userIds, trackId: track.id, sessionIds };
  }

  for (const d of DEMO_SESSIONS) {
    const started = Date.now();
    let sessionId = await sessionOfFile(sequelize, teamId, d.file);
    if (sessionId === null) {
      const bytes = fs.readFileSync(path.join(SAMPLE_DIR, d.file));
      const up = await utapi.uploadFiles(new File([bytes], d.file, { type: "text/csv" }));
      if (up.error || !up.data) throw new Error(`uploading ${d.file} to the upload service failed: ${up.error?.message ?? "no data"}`);
      ({ sessionId } = await registerUpload(sequelize, {
        teamId,
        userId: need(userIds, "engineer", "userIds"),
        file: { key: up.data.key, name: d.file, size: up.data.size, ufsUrl: up.data.ufsUrl, fileHash: up.data.fileHash },
      }));
    }
    sessionIds[d.file] = sessionId;
    let s = (await RideSession.findByPk(sessionId))!;
    if (s.status === "ready") {
      // Left as it is: the team may have edited the demo session since.
      say(`${d.file}: already ingested (session ${sessionId})`);
      continue;
    }
    await s.update({ title: d.title, kind: d.kind, riderId: (d.rider === "a" ? riderA : riderB).id, bikeId: need(bikes, d.bike, "bikes").id, engineId: need(engines, d.bike, "engines").id, eventId: event.id });
    if (s.status === "failed" || s.status === "uploaded") s = await prepareImport(sequelize, sessionId);
    if (s.status === "mapping") await confirmMapping(sequelize, teamId, sessionId, s.mapping as Mapping, d.profile);
    const outcome = await ingestNow(sequelize, sessionId, "seed");
    const done = (await RideSession.findByPk(sessionId))!;
    const summary = done.summary as { lapCount?: number; findingCounts?: Record<string, number> } | null;
    if (outcome === "no-job") say(`${d.file}: session ${sessionId} is with the ingest worker (${done.status})`);
    else if (outcome === "failed") say(`${d.file}: session ${sessionId} FAILED: ${done.statusReason}`);
    else {
      const findings = Object.entries(summary?.findingCounts ?? {}).map(([k, n]) => `${n} ${k}`).join(", ") || "none";
      say(`${d.file}: session ${sessionId} ready in ${Date.now() - started} ms — ${summary?.lapCount ?? 0} laps, findings: ${findings}`);
    }
  }
  await history();
  return { teamId, userIds, trackId: track.id, sessionIds };
}

if (process.argv[1] && /seed\.ts$/.test(process.argv[1])) {
  const t0 = Date.now();
  seedDemo()
    .then(async ({ teamId }) => {
      console.log(`[seed] demo team ready (${teamId}) in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
      await getSequelize().close();
    })
    .catch((e) => {
      console.error("[seed] failed:", e);
      process.exit(1);
    });
}
