/**
 * The access matrix: every route handler and every server action, discovered from the files (a new
 * one without a row here fails the first test), called as each of seven actors — anonymous, owner,
 * engineer, rider on their own session, rider on another rider's session, viewer, and the owner of
 * another team — against the real MariaDB. Each cell asserts the outcome (allowed, or refused with
 * 401/403/404) and, where refused, that no table changed (CHECKSUM TABLE before and after).
 * Only Next's request plumbing is replaced (headers, cookies, revalidation, redirect); auth is real.
 */
import fs from "node:fs";
import path from "node:path";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { QueryTypes } from "sequelize";
import { SMTPServer } from "smtp-server";
import { initModels, Bike, Engine, Finding, ImportProfile, Lap, LogFile, Note, RaceEvent, RideSession, Rider, Track } from "@/models";
import { getSequelize } from "@/models/db";
import { config } from "@/lib/config";
import { createTeamWithRoles, createUser, testAuth, req, params, type TestTeam } from "./helpers/teams";
import { makeUploadthingToken, startUploadFake, type UploadFake } from "../../workers/services/upload-fake";
import os from "node:os";
import { runIngestJob } from "@/workers/ingest/run-ingest-job";
import { prepareImport } from "@/lib/data/imports";
import { createTrackWithSuggestedGate } from "@/lib/data/session-track";
import { generateSession } from "@/sample-logs/generate-session";
import { gpxChunks } from "@/sample-logs/write-formats";
import { at } from "../fixtures/at";

const request = vi.hoisted(() => ({ cookie: "" }));
class Redirected extends Error {
  constructor(public readonly url: string) {
    super(`redirect to ${url}`);
  }
}
class NotFound extends Error {}
vi.mock("next/headers", () => ({
  headers: async () => new Headers(request.cookie ? { cookie: request.cookie } : {}),
  cookies: async () => ({ get: () => undefined, getAll: () => [], set: () => undefined, delete: () => undefined, has: () => false }),
}));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));
vi.mock("next/navigation", () => ({
  redirect: (url: string) => {
    throw new Redirected(url);
  },
  notFound: () => {
    throw new NotFound("not found");
  },
}));

// The upload route reads the SDK's settings from the environment when it handles a request.
let uploadFake: UploadFake;
const UPLOAD_KEY = "sk_access_matrix_key";

const ACTORS = ["anonymous", "owner", "engineer", "rider-own", "rider-other", "viewer", "outsider"] as const;
type Actor = (typeof ACTORS)[number];
type Outcome = "ok" | "denied" | `passed:${string}`;

let a: TestTeam;
let b: TestTeam;
let riderOwn: number;
let riderOther: number;
let aBike: number;
let aBike2: number;
let aEngine: number;
let aTrack: number;
let aEvent: number;
let smtp: SMTPServer;
/** A ready session of team A read from a GPX file of the sample generator (GPS positions, no track yet). */
let aGpsSession: number;
/** Where the upload fake keeps its files (the matrix stores its own logs there). */
let storageDir: string;

function cookieOf(actor: Actor): string {
  switch (actor) {
    case "anonymous": return "";
    case "outsider": return b.members.owner.cookie;
    case "rider-own": case "rider-other": return a.members.rider.cookie;
    default: return a.members[actor].cookie;
  }
}

function newSession(extra: Partial<Parameters<typeof RideSession.create>[0]> = {}) {
  return RideSession.create({
    teamId: a.teamId, eventId: null, bikeId: null, engineId: null, riderId: riderOther, trackId: null, logFileId: null, importProfileId: null, title: "Matrix",
    startedAt: null, conditions: null, statusReason: null, mapping: null, summary: null, durationS: null, createdBy: a.members.engineer.userId, status: "ready", ...extra,
  });
}
/** A CSV log (time, front wheel speed) on the upload fake, uploaded anew for each call. */
function storeLog(key: string, name: string, type: string, bytes: Buffer) {
  fs.writeFileSync(path.join(storageDir, key), bytes);
  fs.writeFileSync(path.join(storageDir, `${key}.json`), JSON.stringify({ key, name, size: bytes.length, type, customId: null, fileHash: "", uploadedAt: 0 }));
  return LogFile.create({ teamId: a.teamId, uploadKey: key, name, bytes: bytes.length, sha256: null, contentType: type, url: `${uploadFake.url}/f/${key}`, uploadedBy: a.members.engineer.userId });
}
/** A fresh CSV session of team A waiting on the mapping screen (the rider's own for "rider-own"). */
async function csvSessionFor(actor: Actor): Promise<number> {
  const rows = Array.from({ length: 200 }, (_, i) => `${(i * 0.01).toFixed(2)},${(100 + i * 0.1).toFixed(1)}`);
  const log = await storeLog(`matrix-csv-${++n}`, "matrix.csv", "text/csv", Buffer.from(`Time [s],Front wheel speed [km/h]\n${rows.join("\n")}\n`, "utf8"));
  const s = await newSession({ status: "uploaded", logFileId: log.id, riderId: actor === "rider-own" ? riderOwn : riderOther });
  // forceMapping: the first confirmation saves a profile for this header, which would otherwise queue the next copy at once.
  expect((await prepareImport(getSequelize(), s.id, { forceMapping: true })).status).toBe("mapping");
  return s.id;
}
/** The GPS session, ridden by the rider for "rider-own" and by the team-mate for everyone else, and its first lap. */
async function gpsSessionFor(actor: Actor): Promise<{ id: string; lap: string }> {
  await RideSession.update({ riderId: actor === "rider-own" ? riderOwn : riderOther }, { where: { id: aGpsSession } });
  const lap = await Lap.findOne({ where: { sessionId: aGpsSession }, order: [["number", "ASC"]] });
  return { id: String(aGpsSession), lap: String(lap!.number) };
}
/** A fresh session of team A: the rider's own for "rider-own", another rider's for everyone else. */
async function sessionFor(actor: Actor): Promise<number> {
  const s = await newSession({ riderId: actor === "rider-own" ? riderOwn : riderOther });
  await Lap.create({ sessionId: s.id, number: 1, startTimeS: 0, endTimeS: 90, lapTimeMs: 90_000, distanceM: 3000, sectorTimesMs: null, topSpeedMps: null, stats: null });
  return s.id;
}

function form(values: Record<string, string | number>): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(values)) f.set(k, String(v));
  return f;
}

// Refusals as the actions word them (those that carry no status), better-auth's included.
const DENIED = /sign in|not a member|member not found|does not allow|only (engineers|the note|owners)|cannot add|viewers cannot|was not found|not found in your team|you are not|not allowed|add notes to sessions you rode|EMAIL_VERIFICATION|recipient/i;

/** The outcome of a server action: allowed (ok / redirect), refused by access rules, or an input/state error after access passed. */
async function actionOutcome(run: () => Promise<unknown>): Promise<Outcome> {
  let r: unknown;
  try {
    r = await run();
  } catch (e) {
    if (e instanceof Redirected) return e.url.startsWith("/sign-in") ? "denied" : "ok";
    if (e instanceof NotFound) return "denied";
    throw e;
  }
  const s = (r ?? {}) as { ok?: boolean; status?: number; message?: string };
  if (s.ok) return "ok";
  if (s.status === 401 || s.status === 403 || s.status === 404) return "denied";
  if (s.status === undefined && DENIED.test(s.message ?? "")) return "denied";
  return `passed:${s.status ?? ""} ${s.message ?? ""}`;
}
async function routeOutcome(res: Response): Promise<Outcome> {
  if (res.status === 401 || res.status === 403 || res.status === 404) return "denied";
  // better-auth answers a non-member with 400 and a code saying so.
  if (res.status === 400 && /NOT_A_MEMBER|NOT_ALLOWED/.test(await res.clone().text())) return "denied";
  if (res.status === 200) return "ok";
  return `passed:${res.status} ${(await res.text()).slice(0, 120)}`;
}

/** Checksums of every table that holds team or account data (sign-in bookkeeping left out). */
async function checksums(): Promise<string> {
  const tables = (await getSequelize().query<{ t: string }>(
    "SELECT table_name AS t FROM information_schema.tables WHERE table_schema = DATABASE() AND table_name NOT IN ('session','rateLimit','verification','lapbench_migrations','channel_chunks') ORDER BY table_name",
    { type: QueryTypes.SELECT },
  )).map((r) => r.t);
  const rows = await getSequelize().query<{ Table: string; Checksum: string }>(`CHECKSUM TABLE ${tables.map((t) => `\`${t}\``).join(", ")}`, { type: QueryTypes.SELECT });
  return rows.map((r) => `${r.Table}=${r.Checksum}`).join(";");
}

interface Row {
  /** "app/api/…/route.ts GET" or "lib/actions/file.ts exportName". */
  key: string;
  /** Who is allowed ("ok"); everyone else must be refused. `passed` = access granted, refused for the state or input (shown). */
  allow: Partial<Record<Actor, "ok" | "passed">>;
  call(actor: Actor): Promise<Outcome>;
  /** Reads only (or sends mail only): an allowed call leaves every table as it was. GET handlers are reads; any other allowed call must change a table. */
  reads?: true;
}

const ALL_MEMBERS = { owner: "ok", engineer: "ok", "rider-own": "ok", "rider-other": "ok", viewer: "ok" } as const;
const EDITORS = { owner: "ok", engineer: "ok" } as const;

const routeMod = (p: string) => import(/* @vite-ignore */ path.resolve("app", p));
/** Table checksums right before and after the one call a cell makes (its fixtures are made before). */
const around = { before: "", after: "" };
async function measured<T>(call: () => Promise<T>): Promise<T> {
  around.before = await checksums();
  try {
    return await call();
  } finally {
    around.after = await checksums();
  }
}
async function callRoute(file: string, method: string, url: string, actor: Actor, p: Record<string, string>, init: RequestInit = {}): Promise<Outcome> {
  const mod = (await routeMod(file)) as Record<string, (r: Request, c: { params: Promise<unknown> }) => Promise<Response>>;
  const res = await measured(() => at(mod, method)(req(url, cookieOf(actor), init), params(p)));
  return routeOutcome(res);
}
async function act<K extends string>(file: string, name: K, actor: Actor, ...args: unknown[]): Promise<Outcome> {
  const mod = (await import(/* @vite-ignore */ path.resolve("lib/actions", file))) as Record<string, (...x: unknown[]) => Promise<unknown>>;
  request.cookie = cookieOf(actor);
  return measured(() => actionOutcome(() => at(mod, name)(...args)));
}

const validImport = (title: string) => ({
  title, kind: "practice", eventId: "", bikeId: "", engineId: "", riderId: "", startedAt: "", conditions: "", sharedWithRiders: false,
  profileName: "Matrix profile", timeFormat: "seconds",
  columns: [{ index: 0, role: "time", unit: "s", scale: 1, offset: 0 }, { index: 1, role: "speed_front", unit: "km/h", scale: 1, offset: 0 }],
});

let n = 0;
let mailToggle = 0; // alternates "session ready" on and off, so even the same person's second save changes their row
const uniq = (s: string) => `${s} ${++n}`;

const ROWS: Row[] = [
  // Route handlers (app/api).
  { key: "api/sessions/route.ts GET", allow: { ...ALL_MEMBERS, outsider: "ok" }, call: (x) => callRoute("api/sessions/route.ts", "GET", "/api/sessions", x, {}) },
  { key: "api/sessions/[id]/route.ts GET", allow: { owner: "ok", engineer: "ok", "rider-own": "ok", viewer: "ok" }, call: async (x) => { const id = String(await sessionFor(x)); return callRoute("api/sessions/[id]/route.ts", "GET", `/api/sessions/${id}`, x, { id }); } },
  { key: "api/team/route.ts GET", allow: { ...ALL_MEMBERS, outsider: "ok" }, call: (x) => callRoute("api/team/route.ts", "GET", "/api/team", x, {}) },
  {
    key: "api/series/route.ts GET",
    allow: { owner: "ok", engineer: "ok", "rider-own": "ok", viewer: "ok" },
    call: async (x) => { const g = await gpsSessionFor(x); return callRoute("api/series/route.ts", "GET", `/api/series?laps=${g.id}:${g.lap}&roles=gps_speed&x=distance&width=800`, x, {}); },
  },
  { key: "api/sessions/[id]/laps/route.ts GET", allow: { owner: "ok", engineer: "ok", "rider-own": "ok", viewer: "ok" }, call: async (x) => { const id = String(await sessionFor(x)); return callRoute("api/sessions/[id]/laps/route.ts", "GET", `/api/sessions/${id}/laps`, x, { id }); } },
  { key: "api/sessions/[id]/laps.csv/route.ts GET", allow: { owner: "ok", engineer: "ok", "rider-own": "ok", viewer: "ok" }, call: async (x) => { const id = String(await sessionFor(x)); return callRoute("api/sessions/[id]/laps.csv/route.ts", "GET", `/api/sessions/${id}/laps.csv`, x, { id }); } },
  {
    key: "api/sessions/[id]/laps/[lap]/gpx/route.ts GET",
    allow: { owner: "ok", engineer: "ok", "rider-own": "ok", viewer: "ok" },
    call: async (x) => { const g = await gpsSessionFor(x); return callRoute("api/sessions/[id]/laps/[lap]/gpx/route.ts", "GET", `/api/sessions/${g.id}/laps/${g.lap}/gpx`, x, g); },
  },
  {
    key: "api/uploadthing/route.ts POST",
    allow: { owner: "ok", engineer: "ok", outsider: "ok" }, // the outsider uploads into their own team
    call: (x) => callRoute("api/uploadthing/route.ts", "POST", "/api/uploadthing?actionType=upload&slug=logFile", x, {}, {
      method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ files: [{ name: "fp1.csv", size: 100, type: "text/csv", lastModified: 1 }], input: null }),
    }),
  },
  {
    key: "api/uploadthing/route.ts GET",
    // The SDK's route description (slugs and limits), public by design; it reads and changes nothing.
    allow: { anonymous: "ok", ...ALL_MEMBERS, outsider: "ok" },
    call: (x) => callRoute("api/uploadthing/route.ts", "GET", "/api/uploadthing", x, {}),
  },
  {
    key: "api/auth/[...all]/route.ts GET",
    // better-auth's session read: answers everyone (null when signed out).
    allow: { anonymous: "ok", ...ALL_MEMBERS, outsider: "ok" },
    call: (x) => callRoute("api/auth/[...all]/route.ts", "GET", "/api/auth/get-session", x, {}),
  },
  {
    key: "api/auth/[...all]/route.ts POST",
    // Renaming team A through better-auth's own endpoint: the owner only.
    allow: { owner: "ok" },
    call: (x) => callRoute("api/auth/[...all]/route.ts", "POST", "/api/auth/organization/update", x, {}, {
      method: "POST", headers: { "content-type": "application/json", origin: config.appUrl }, body: JSON.stringify({ organizationId: a.teamId, data: { name: uniq("Matrix A") } }),
    }),
  },
  {
    key: "api/team/export/route.ts GET",
    // The whole team as a zip: the owner only (the other team's owner gets their own team's, never A's).
    allow: { owner: "ok", outsider: "ok" },
    call: async (x) => {
      const mod = (await routeMod("api/team/export/route.ts")) as Record<string, (r: Request, c: { params: Promise<unknown> }) => Promise<Response>>;
      let exported = "";
      const res = await measured(async () => {
        const r = await at(mod, "GET")(req("/api/team/export", cookieOf(x)), params({}));
        // Read the streamed zip to its end, so the export has finished before the checksum after it.
        if (r.status === 200) exported = Buffer.from(await r.arrayBuffer()).subarray(0, 2).toString("latin1");
        return r;
      });
      const out = await routeOutcome(res);
      return out === "ok" && exported !== "PK" ? (`passed:200 not a zip (${JSON.stringify(exported)})` as Outcome) : out;
    },
  },

  // Server actions (lib/actions).
  { key: "bikes.ts createBikeAction", allow: { ...EDITORS, outsider: "ok" }, call: (x) => act("bikes.ts", "createBikeAction", x, {}, form({ name: uniq("Bike") })) },
  { key: "bikes.ts updateBikeAction", allow: EDITORS, call: (x) => act("bikes.ts", "updateBikeAction", x, {}, form({ bikeId: aBike, name: uniq("A bike") })) },
  { key: "bikes.ts createEngineAction", allow: EDITORS, call: (x) => act("bikes.ts", "createEngineAction", x, {}, form({ serial: uniq("E"), bikeId: aBike })) },
  { key: "bikes.ts updateEngineAction", allow: EDITORS, call: (x) => act("bikes.ts", "updateEngineAction", x, {}, form({ engineId: aEngine, serial: uniq("A-E"), bikeId: aBike })) },
  {
    key: "engine-history.ts moveEngineAction",
    allow: EDITORS,
    call: async (x) => {
      const e = await Engine.create({ teamId: a.teamId, bikeId: aBike, serial: uniq("M-MOVE"), rebuildIntervalH: 10, rebuildIntervalKm: null, notes: null });
      return act("engine-history.ts", "moveEngineAction", x, {}, form({ engineId: e.id, toBikeId: aBike2, onDate: "2031-05-18", note: "Swapped for the race" }));
    },
  },
  {
    key: "engine-history.ts recordRebuildAction",
    allow: EDITORS,
    call: async (x) => {
      const e = await Engine.create({ teamId: a.teamId, bikeId: aBike, serial: uniq("M-REB"), rebuildIntervalH: 10, rebuildIntervalKm: null, notes: null });
      return act("engine-history.ts", "recordRebuildAction", x, {}, form({ engineId: e.id, onDate: "2031-05-19", note: "Top end refreshed" }));
    },
  },
  {
    key: "event-report.ts sendEventReportAction",
    // Mailed to team A's owner (who wants reports by default); no table changes when it is sent.
    allow: EDITORS,
    reads: true,
    call: (x) => act("event-report.ts", "sendEventReportAction", x, {}, form({ eventId: aEvent })),
  },
  {
    key: "import-profiles.ts saveImportProfileAction",
    allow: EDITORS,
    call: async (x) => {
      const p = await matrixProfile();
      const payload = { name: uniq("Renamed profile"), timeFormat: "seconds", columns: [{ index: 0, role: "time", unit: "s", scale: 1, offset: 0 }, { index: 1, role: "speed_front", unit: "km/h", scale: 1.02, offset: 0 }] };
      return act("import-profiles.ts", "saveImportProfileAction", x, {}, form({ profileId: p, payload: JSON.stringify(payload) }));
    },
  },
  { key: "import-profiles.ts deleteImportProfileAction", allow: EDITORS, call: async (x) => act("import-profiles.ts", "deleteImportProfileAction", x, {}, form({ profileId: await matrixProfile() })) },
  {
    key: "imports.ts resolveDuplicateAction",
    // "Keep the earlier one": the held-back copy is dropped (uploads are the owner's and engineers').
    allow: EDITORS,
    call: async (x) => {
      const earlier = await sessionFor(x);
      const held = await newSession({ status: "uploaded", title: "Matrix copy", summary: { duplicateOf: { sessionId: earlier, title: "Matrix", uploadedAt: "2031-05-17T09:00:00Z" } } });
      return act("imports.ts", "resolveDuplicateAction", x, {}, form({ sessionId: held.id, choice: "existing" }));
    },
  },
  {
    key: "mail-preferences.ts saveMailPreferencesAction",
    // Each person's own settings: every signed-in member, the other team's owner included (their own row).
    allow: { ...ALL_MEMBERS, outsider: "ok" },
    call: (x) => act("mail-preferences.ts", "saveMailPreferencesAction", x, {}, form(++mailToggle % 2 ? { sessionReady: "on", eventReport: "on" } : { eventReport: "on" })),
  },
  {
    key: "session-track.ts changeSessionTrackAction",
    allow: EDITORS,
    call: async (x) => act("session-track.ts", "changeSessionTrackAction", x, {}, form({ sessionId: await sessionFor(x), trackId: aTrack })),
  },
  {
    key: "session-track.ts confirmSuggestedGateAction",
    // The GPS session, off any track again before each call, the rider's own for "rider-own".
    allow: EDITORS,
    call: async (x) => {
      await RideSession.update({ trackId: null, riderId: x === "rider-own" ? riderOwn : riderOther }, { where: { id: aGpsSession } });
      return act("session-track.ts", "confirmSuggestedGateAction", x, {}, form({ sessionId: aGpsSession, name: uniq("Suggested track") }));
    },
  },
  { key: "events.ts createEventAction", allow: { ...EDITORS, outsider: "ok" }, call: (x) => act("events.ts", "createEventAction", x, {}, form({ name: uniq("Round"), startsOn: "2031-05-17", endsOn: "2031-05-18", trackId: "" })) },
  { key: "events.ts updateEventAction", allow: EDITORS, call: (x) => act("events.ts", "updateEventAction", x, {}, form({ eventId: aEvent, name: uniq("A round"), startsOn: "2031-05-17", endsOn: "2031-05-18", trackId: "" })) },
  {
    key: "findings.ts acknowledgeFindingAction",
    allow: EDITORS,
    call: async (x) => {
      const f = await Finding.create({ teamId: a.teamId, sessionId: await sessionFor(x), kind: "brake_on_straight", lapNumber: 1, startTimeS: 1, endTimeS: 2, distanceM: null, lat: null, lon: null, measuredValue: null, thresholdValue: null, unit: null, message: "Matrix finding", acknowledgedBy: null, acknowledgedAt: null, note: null });
      return act("findings.ts", "acknowledgeFindingAction", x, {}, form({ findingId: f.id, note: "checked" }));
    },
  },
  {
    key: "imports.ts confirmImportAction",
    // A CSV session waiting on the mapping screen; confirming queues it to be read.
    allow: EDITORS,
    call: async (x) => act("imports.ts", "confirmImportAction", x, await csvSessionFor(x), validImport("Matrix import")),
  },
  {
    key: "imports.ts saveSessionDetailsAction",
    allow: EDITORS,
    call: async (x) => act("imports.ts", "saveSessionDetailsAction", x, await sessionFor(x), { title: uniq("Details"), kind: "practice", eventId: "", bikeId: "", engineId: "", riderId: "", startedAt: "", conditions: "", sharedWithRiders: false }),
  },
  {
    key: "imports.ts keepFirstOfRepeatedTimesAction",
    // A CSV refused for repeated time stamps; keeping the first row of each stamp queues it to be read again.
    allow: EDITORS,
    call: async (x) => {
      const s = await newSession({
        status: "failed",
        riderId: x === "rider-own" ? riderOwn : riderOther,
        summary: { failure: { code: "DUPLICATE_TIME", message: "Repeated time stamps" } },
        mapping: { timeFormat: "seconds", columns: [{ index: 0, role: "time", unit: "s", scale: 1, offset: 0 }, { index: 1, role: "speed_front", unit: "km/h", scale: 1, offset: 0 }] },
      });
      return act("imports.ts", "keepFirstOfRepeatedTimesAction", x, {}, form({ sessionId: s.id }));
    },
  },
  {
    key: "imports.ts reimportAction",
    allow: EDITORS, // queued again; the worker then reports the missing file on the session
    call: async (x) => act("imports.ts", "reimportAction", x, {}, form({ sessionId: await sessionFor(x) })),
  },
  { key: "session-notes.ts createNoteAction", allow: { ...EDITORS, "rider-own": "ok" }, call: async (x) => act("session-notes.ts", "createNoteAction", x, {}, form({ sessionId: await sessionFor(x), text: "Matrix note", lapNumber: "" })) },
  {
    key: "session-notes.ts deleteNoteAction",
    allow: EDITORS, // the author (the engineer) and the owner
    call: async (x) => {
      const note = await Note.create({ teamId: a.teamId, sessionId: await sessionFor(x), lapNumber: null, authorId: a.members.engineer.userId, text: "Engineer's note" });
      return act("session-notes.ts", "deleteNoteAction", x, {}, form({ noteId: note.id }));
    },
  },
  { key: "setup-sheets.ts saveSetupSheetAction", allow: EDITORS, call: async (x) => act("setup-sheets.ts", "saveSetupSheetAction", x, {}, form({ sessionId: await sessionFor(x), baseVersion: 0, forkPreloadMm: 8 })) },
  { key: "thresholds.ts saveThresholdsAction", allow: EDITORS, call: (x) => act("thresholds.ts", "saveThresholdsAction", x, {}, form({ scope: "bike", id: aBike })) },
  { key: "tracks.ts createTrackAction", allow: { ...EDITORS, outsider: "ok" }, call: (x) => act("tracks.ts", "createTrackAction", x, {}, form({ name: uniq("Track") })) },
  {
    key: "tracks.ts saveTrackAction",
    allow: EDITORS,
    call: (x) => act("tracks.ts", "saveTrackAction", x, {}, form({ trackId: aTrack, payload: JSON.stringify({ name: uniq("Matrix track"), gates: { startFinish: null, sectors: [], pitEntry: null, pitExit: null }, corners: [], pitSpeedLimitKmh: 60 }) })),
  },
  { key: "team.ts inviteMember", allow: { owner: "ok", outsider: "ok" }, call: (x) => act("team.ts", "inviteMember", x, {}, form({ email: `${uniq("invitee").replace(" ", "-")}@example.com`, role: "viewer" })) },
  {
    key: "team.ts changeRole",
    allow: { owner: "ok" },
    call: async (x) => act("team.ts", "changeRole", x, {}, form({ memberId: await freshMember(), role: "engineer" })),
  },
  { key: "team.ts removeMember", allow: { owner: "ok" }, call: async (x) => act("team.ts", "removeMember", x, {}, form({ memberId: await freshMember() })) },
  {
    key: "team.ts cancelInvitation",
    allow: { owner: "ok" },
    call: async (x) => {
      const inv = await testAuth().api.createInvitation({ body: { email: `${uniq("cancel").replace(" ", "-")}@example.com`, role: "viewer", organizationId: a.teamId }, headers: new Headers({ cookie: a.members.owner.cookie }) });
      return act("team.ts", "cancelInvitation", x, {}, form({ invitationId: inv.id }));
    },
  },
  {
    key: "team.ts createTeam",
    // Anyone signed in may start a team of their own (then their active team is set back for the next rows).
    allow: { ...ALL_MEMBERS, outsider: "ok" },
    call: async (x) => {
      const out = await act("team.ts", "createTeam", x, {}, form({ name: uniq("Side team") }));
      await restoreActiveTeams();
      return out;
    },
  },
  {
    key: "team.ts switchTeam",
    allow: ALL_MEMBERS,
    reads: true, // it changes only the sign-in bookkeeping (the active team), left out of the checksums
    call: async (x) => {
      const out = await act("team.ts", "switchTeam", x, a.teamId);
      await restoreActiveTeams();
      return out;
    },
  },
  {
    key: "team.ts acceptInvitation",
    // An invitation for someone else: no actor is its (confirmed) recipient.
    allow: {},
    call: async (x) => {
      const inv = await testAuth().api.createInvitation({ body: { email: `${uniq("someone").replace(" ", "-")}@example.com`, role: "engineer", organizationId: a.teamId }, headers: new Headers({ cookie: a.members.owner.cookie }) });
      return act("team.ts", "acceptInvitation", x, inv.id);
    },
  },
];

/** A fresh Import profile of team A for a two-column header (time, front wheel speed). */
async function matrixProfile(): Promise<number> {
  const p = await ImportProfile.create({
    teamId: a.teamId, name: uniq("Matrix profile"), headerSignature: `matrix${String(++n).padStart(58, "0")}`, format: "csv",
    mapping: { timeFormat: "seconds", columns: [{ index: 0, name: "t", role: "time", unit: "s", scale: 1, offset: 0 }, { index: 1, name: "v_front", role: "speed_front", unit: "km/h", scale: 1, offset: 0 }] },
  });
  return p.id;
}

async function freshMember(): Promise<string> {
  const u = await createUser("matrix-member");
  const m = await testAuth().api.addMember({ body: { userId: u.userId, role: "viewer", organizationId: a.teamId } });
  return m!.id;
}
async function restoreActiveTeams() {
  for (const t of [a, b]) {
    const ids = Object.values(t.members).map((m) => m.userId);
    await getSequelize().query("UPDATE session SET activeOrganizationId = ? WHERE userId IN (?)", { replacements: [t.teamId, ids], type: QueryTypes.UPDATE });
  }
}

const readsOnly = (row: Row) => row.reads ?? row.key.endsWith(" GET");

function discovered(): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.name === "route.ts") {
        const src = fs.readFileSync(p, "utf8");
        const methods = new Set<string>();
        for (const m of src.matchAll(/export\s+(?:async\s+function|const)\s+(GET|POST|PUT|PATCH|DELETE|HEAD|OPTIONS)\b/g)) methods.add(at(m, 1));
        for (const m of src.matchAll(/export\s+const\s+\{([^}]*)\}/g)) for (const name of at(m, 1).split(",").map((s) => s.trim())) if (/^(GET|POST|PUT|PATCH|DELETE|HEAD|OPTIONS)$/.test(name)) methods.add(name);
        for (const m of methods) out.push(`${path.relative(path.resolve("app"), p)} ${m}`);
      }
    }
  };
  walk(path.resolve("app/api"));
  for (const f of fs.readdirSync(path.resolve("lib/actions"))) {
    const src = fs.readFileSync(path.resolve("lib/actions", f), "utf8");
    if (!/^\s*["']use server["']/.test(src)) continue;
    for (const m of src.matchAll(/export\s+async\s+function\s+(\w+)/g)) out.push(`${f} ${m[1]}`);
    for (const m of src.matchAll(/export\s+const\s+(\w+)\s*=\s*async/g)) out.push(`${f} ${m[1]}`);
  }
  return out.sort();
}

beforeAll(async () => {
  initModels();
  smtp = new SMTPServer({ authOptional: true, disabledCommands: ["STARTTLS"], onData(stream, _s, done) { stream.resume(); stream.on("end", () => done()); } });
  await new Promise<void>((ok) => smtp.listen(0, "127.0.0.1", ok));
  config.smtp.port = (smtp.server.address() as AddressInfo).port;
  storageDir = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-matrix-"));
  uploadFake = await startUploadFake({ port: 0, storageDir, apiKey: UPLOAD_KEY });
  Object.assign(process.env, {
    UPLOADTHING_TOKEN: makeUploadthingToken({ apiKey: UPLOAD_KEY, appId: "lapbench-matrix" }),
    UPLOADTHING_INGEST_URL: uploadFake.url,
    UPLOADTHING_CALLBACK_URL: `${config.appUrl}/api/uploadthing`,
    UPLOADTHING_IS_DEV: "false",
    UPLOADTHING_LOG_LEVEL: "None",
  });
  [a, b] = await Promise.all([createTeamWithRoles("Matrix A"), createTeamWithRoles("Matrix B")]);
  riderOwn = (await Rider.create({ teamId: a.teamId, name: "Matrix rider", raceNumber: "21", userId: a.members.rider.userId })).id;
  riderOther = (await Rider.create({ teamId: a.teamId, name: "Matrix team-mate", raceNumber: "22", userId: null })).id;
  aBike = (await Bike.create({ teamId: a.teamId, name: "Matrix bike", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: 14000, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null })).id;
  aBike2 = (await Bike.create({ teamId: a.teamId, name: "Matrix spare bike", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: 14000, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null })).id;
  aEngine = (await Engine.create({ teamId: a.teamId, bikeId: aBike, serial: "M-E1", rebuildIntervalH: 10, rebuildIntervalKm: null, notes: null })).id;
  aTrack = (await Track.create({ teamId: a.teamId, name: "Matrix track", centerLat: null, centerLon: null, lengthM: null, gates: null, corners: null, outline: null, pitSpeedLimitKmh: null, thresholds: null })).id;
  // A GPX log of our own generator, stored on the upload fake and read by the real ingest job.
  const gpx = Buffer.from([...gpxChunks(generateSession({ flyingLaps: 2 }))].join(""), "utf8");
  const gpxLog = await storeLog("matrix-gpx", "matrix.gpx", "application/gpx+xml", gpx);
  aGpsSession = (await newSession({ status: "uploaded", logFileId: gpxLog.id, title: "Matrix GPS" })).id;
  expect((await prepareImport(getSequelize(), aGpsSession)).status).toBe("queued");
  const ingested = await runIngestJob(getSequelize(), aGpsSession);
  expect(ingested, (await RideSession.findByPk(aGpsSession))?.statusReason ?? "").toBe("ready");
  await getSequelize().query("UPDATE jobs SET state = 'done' WHERE session_id = ? AND state = 'queued'", { replacements: [aGpsSession], type: QueryTypes.UPDATE });
  // Split into laps on a track made from its own GPS, so its laps have series and positions to serve.
  const m = a.members.engineer;
  await createTrackWithSuggestedGate({ teamId: a.teamId, teamName: "Matrix A", teamSlug: "matrix-a", role: "engineer", userId: m.userId, userName: "engineer", email: m.email, memberships: [] }, aGpsSession, "Matrix GPS circuit");
  aEvent = (await RaceEvent.create({ teamId: a.teamId, trackId: null, name: "Matrix round", startsOn: "2031-05-17", endsOn: "2031-05-18" })).id;
});

afterAll(async () => {
  await uploadFake?.close();
  await new Promise<void>((ok) => smtp.close(() => ok()));
});

describe("access matrix", () => {
  it("has a row for every route handler and server action in the code", () => {
    expect(ROWS.map((r) => r.key).sort()).toEqual(discovered());
  });

  it(`every row × ${ACTORS.length} actors: allowed or refused as the roles say, and a refusal changes nothing`, { timeout: 600_000 }, async () => {
    const failures: string[] = [];
    let cells = 0;
    let allowedChanges = 0; // the checksum does see changes: allowed writes must show up in it
    for (const row of ROWS) {
      for (const actor of ACTORS) {
        const want = row.allow[actor] ?? "denied";
        around.before = around.after = "";
        const outcome = await row.call(actor).catch((e: unknown) => `passed:threw ${(e as Error).message}` as Outcome);
        cells++;
        const got = outcome === "ok" ? "ok" : outcome === "denied" ? "denied" : "passed";
        if (want !== got) failures.push(`${row.key} as ${actor}: expected ${want}, got ${outcome}`);
        if (got === "ok" && around.before && around.before !== around.after) allowedChanges++;
        if (got === "ok" && around.before && (around.before !== around.after) === readsOnly(row)) failures.push(`${row.key} as ${actor}: allowed, but ${readsOnly(row) ? "a read changed data" : "nothing changed"}`);
        if (got === "denied") {
          if (!around.before) failures.push(`${row.key} as ${actor}: no checksum taken`);
          else if (around.before !== around.after) failures.push(`${row.key} as ${actor}: refused, but the data changed`);
        }
      }
    }
    console.log(`[access matrix] ${ROWS.length} routes and actions × ${ACTORS.length} actors = ${cells} cells checked`);
    expect(failures).toEqual([]);
    expect(allowedChanges).toBeGreaterThan(20);
  });
});
