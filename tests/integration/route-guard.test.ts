/**
 * The role guard over every API route that exists, against the real MariaDB: no session → 401,
 * each role gets what the role table allows (owner: team and members; owner and engineer:
 * upload and setup data; rider: their own and shared sessions; viewer: read-only), and another team's resources answer 404.
 */
import { describe, it, expect, beforeAll } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { initModels, Lap, RideSession, Rider } from "@/models";
import { createTeamWithRoles, req, params, type TestTeam } from "./helpers/teams";
import * as sessionsRoute from "@/app/api/sessions/route";
import * as sessionRoute from "@/app/api/sessions/[id]/route";
import * as teamApiRoute from "@/app/api/team/route";
import * as seriesRoute from "@/app/api/series/route";
import * as lapsRoute from "@/app/api/sessions/[id]/laps/route";
import * as lapsCsvRoute from "@/app/api/sessions/[id]/laps.csv/route";
import * as lapGpxRoute from "@/app/api/sessions/[id]/laps/[lap]/gpx/route";
import * as teamExportRoute from "@/app/api/team/export/route";
import type { TeamRole } from "@/lib/auth/permissions";

const ROLES: TeamRole[] = ["owner", "engineer", "rider", "viewer"];

let a: TestTeam;
let b: TestTeam;
let aSessionRider: number; // a session of team A ridden by A's rider user
let aSessionOther: number; // a session of team A with another rider, not shared
let bSession: number;

beforeAll(async () => {
  initModels();
  [a, b] = await Promise.all([createTeamWithRoles("Team A"), createTeamWithRoles("Team B")]);
  const riderA = await Rider.create({ teamId: a.teamId, name: "A rider", raceNumber: "7", userId: a.members.rider.userId });
  const otherA = await Rider.create({ teamId: a.teamId, name: "Other rider", raceNumber: "8", userId: null });
  aSessionRider = (await RideSession.create({ teamId: a.teamId, riderId: riderA.id, title: "A FP1", createdBy: a.members.engineer.userId, logFileId: null, eventId: null, bikeId: null, engineId: null, trackId: null, importProfileId: null, startedAt: null, conditions: null, statusReason: null, mapping: null, summary: null, durationS: null })).id;
  aSessionOther = (await RideSession.create({ teamId: a.teamId, riderId: otherA.id, title: "A FP1 other", createdBy: a.members.engineer.userId, logFileId: null, eventId: null, bikeId: null, engineId: null, trackId: null, importProfileId: null, startedAt: null, conditions: null, statusReason: null, mapping: null, summary: null, durationS: null })).id;
  // Lap 1 exists, so a 404 for team B below comes from the team check, not a missing lap.
  await Lap.create({ sessionId: aSessionRider, number: 1, startTimeS: 0, endTimeS: 90, lapTimeMs: 90_000, distanceM: 3000, sectorTimesMs: null, topSpeedMps: null, stats: null });
  bSession = (await RideSession.create({ teamId: b.teamId, riderId: null, title: "B FP1", createdBy: b.members.engineer.userId, logFileId: null, eventId: null, bikeId: null, engineId: null, trackId: null, importProfileId: null, startedAt: null, conditions: null, statusReason: null, mapping: null, summary: null, durationS: null })).id;
});

describe("every API route refuses a request without a session", () => {
  // The list is checked against the files on disk, so a new route without a row here fails.
  const tested = [
    "api/sessions/route.ts",
    "api/sessions/[id]/route.ts",
    "api/team/route.ts",
    "api/series/route.ts",
    "api/sessions/[id]/laps/route.ts",
    "api/sessions/[id]/laps.csv/route.ts",
    "api/sessions/[id]/laps/[lap]/gpx/route.ts",
    "api/team/export/route.ts",
  ];
  const exempt = ["api/auth/[...all]/route.ts", "api/uploadthing/route.ts"]; // better-auth's own and the upload SDK's (guarded in its middleware)

  it("covers all route files under app/api", () => {
    const found: string[] = [];
    const walk = (dir: string) => {
      for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
        const p = path.join(dir, e.name);
        if (e.isDirectory()) walk(p);
        else if (e.name === "route.ts") found.push(path.relative(path.resolve("app"), p));
      }
    };
    walk(path.resolve("app/api"));
    expect(found.filter((f) => !exempt.includes(f)).sort()).toEqual([...tested].sort());
  });

  it.each([
    ["GET /api/sessions", () => sessionsRoute.GET(req("/api/sessions"), params({}))],
    ["GET /api/sessions/:id", () => sessionRoute.GET(req(`/api/sessions/${aSessionRider}`), params({ id: String(aSessionRider) }))],
    ["GET /api/team", () => teamApiRoute.GET(req("/api/team"), params({}))],
    ["GET /api/series", () => seriesRoute.GET(req(`/api/series?laps=${aSessionRider}:1&roles=speed_front&x=distance&width=800`), params({}))],
    ["GET /api/sessions/:id/laps", () => lapsRoute.GET(req(`/api/sessions/${aSessionRider}/laps`), params({ id: String(aSessionRider) }))],
    ["GET /api/sessions/:id/laps.csv", () => lapsCsvRoute.GET(req(`/api/sessions/${aSessionRider}/laps.csv`), params({ id: String(aSessionRider) }))],
    ["GET /api/sessions/:id/laps/:lap/gpx", () => lapGpxRoute.GET(req(`/api/sessions/${aSessionRider}/laps/1/gpx`), params({ id: String(aSessionRider), lap: "1" }))],
    ["GET /api/team/export", () => teamExportRoute.GET(req("/api/team/export"), params({}))],
  ])("%s → 401", async (_name, call) => {
    const res = await call();
    expect(res.status).toBe(401);
    expect((await res.json()).error).toMatch(/sign in/i);
  });

  it("a forged session cookie is refused", async () => {
    const res = await teamApiRoute.GET(req("/api/team", "better-auth.session_token=forged.value"), params({}));
    expect(res.status).toBe(401);
  });
});

describe("roles see what the role table allows", () => {
  it.each(ROLES)("%s reads the team with their role", async (role) => {
    const res = await teamApiRoute.GET(req("/api/team", a.members[role].cookie), params({}));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.role).toBe(role);
    expect(body.team.id).toBe(a.teamId);
    expect(body.members.map((m: { email: string }) => m.email).sort()).toEqual(ROLES.map((r) => a.members[r].email).sort());
  });

  it.each(["owner", "engineer", "viewer"] as const)("%s sees every session of the team", async (role) => {
    const res = await sessionsRoute.GET(req("/api/sessions", a.members[role].cookie), params({}));
    const ids = (await res.json()).sessions.map((s: { id: number }) => s.id);
    expect(ids).toContain(aSessionRider);
    expect(ids).toContain(aSessionOther);
    expect(ids).not.toContain(bSession);
  });

  it("a rider sees their own sessions, not another rider's unshared one", async () => {
    const res = await sessionsRoute.GET(req("/api/sessions", a.members.rider.cookie), params({}));
    const ids = (await res.json()).sessions.map((s: { id: number }) => s.id);
    expect(ids).toEqual([aSessionRider]);
    const other = await sessionRoute.GET(req(`/api/sessions/${aSessionOther}`, a.members.rider.cookie), params({ id: String(aSessionOther) }));
    expect(other.status).toBe(404);
  });

  it("a session shared with riders becomes visible to the rider", async () => {
    await RideSession.update({ sharedWithRiders: true }, { where: { id: aSessionOther } });
    const res = await sessionRoute.GET(req(`/api/sessions/${aSessionOther}`, a.members.rider.cookie), params({ id: String(aSessionOther) }));
    expect(res.status).toBe(200);
    await RideSession.update({ sharedWithRiders: false }, { where: { id: aSessionOther } });
  });

  it("only the owner exports the whole team: a zip for the owner, 403 for every other role", async () => {
    const res = await teamExportRoute.GET(req("/api/team/export", a.members.owner.cookie), params({}));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/zip");
    expect(Buffer.from(await res.arrayBuffer()).subarray(0, 4).toString("latin1")).toBe("PK\x03\x04"); // a ZIP local file header (APPNOTE.TXT 4.3.7)
    for (const role of ["engineer", "rider", "viewer"] as const) {
      const refused = await teamExportRoute.GET(req("/api/team/export", a.members[role].cookie), params({}));
      expect(refused.status, role).toBe(403);
    }
  });
});

describe("team isolation", () => {
  it.each(ROLES)("%s of team B gets 404 for a session of team A", async (role) => {
    const res = await sessionRoute.GET(req(`/api/sessions/${aSessionRider}`, b.members[role].cookie), params({ id: String(aSessionRider) }));
    expect(res.status).toBe(404);
    expect(JSON.stringify(await res.json())).not.toContain("A FP1");
  });

  it.each(ROLES)("%s of team B gets 404 for team A's laps, lap table, lap GPX and lap series", async (role) => {
    const cookie = b.members[role].cookie;
    const id = String(aSessionRider);
    for (const res of [
      await lapsRoute.GET(req(`/api/sessions/${id}/laps`, cookie), params({ id })),
      await lapsCsvRoute.GET(req(`/api/sessions/${id}/laps.csv`, cookie), params({ id })),
      await lapGpxRoute.GET(req(`/api/sessions/${id}/laps/1/gpx`, cookie), params({ id, lap: "1" })),
      await seriesRoute.GET(req(`/api/series?laps=${id}:1&roles=speed_front&x=distance&width=800`, cookie), params({})),
    ]) {
      expect(res.status).toBe(404);
    }
  });

  it("the same lap routes answer team A's own owner (the 404s above are the team check)", async () => {
    const id = String(aSessionRider);
    const cookie = a.members.owner.cookie;
    expect((await lapsRoute.GET(req(`/api/sessions/${id}/laps`, cookie), params({ id }))).status).toBe(200);
    expect((await lapsCsvRoute.GET(req(`/api/sessions/${id}/laps.csv`, cookie), params({ id }))).status).toBe(200);
  });

  it("a non-numeric or unknown id is a 404, not an error", async () => {
    for (const id of ["abc", "0", "99999999"]) {
      const res = await sessionRoute.GET(req(`/api/sessions/${id}`, a.members.owner.cookie), params({ id }));
      expect(res.status).toBe(404);
    }
  });
});
