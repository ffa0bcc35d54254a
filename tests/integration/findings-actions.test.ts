/**
 * Findings as a team works them: listing through the session's visibility, acknowledging with a
 * note (engineers and owners only; another team's finding is not even confirmed to exist), the
 * "Findings to review" list, and threshold changes that reanalyse the stored sessions.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { initModels, Finding, RideSession } from "@/models";
import { requireTeam, type TeamContext } from "@/lib/auth/guard";
import type { TeamRole } from "@/lib/auth/permissions";
import { HttpError } from "@/lib/http/http-error";
import { acknowledgeFinding, listFindingsToReview, listSessionFindings } from "@/lib/data/findings";
import { getThresholdSettings, saveBikeThresholds, saveTrackThresholds } from "@/lib/data/thresholds";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";
import { createRider, createSampleTrackAndBike, ingestSampleFile } from "./helpers/demo-track";
import { at } from "../fixtures/at";

let a: TestTeam;
let b: TestTeam;
let up: UploadHarness;
let sessionId: number;
let bikeId: number;
let trackId: number;
const ctx: Partial<Record<TeamRole, TeamContext>> = {};
let otherTeamEngineer: TeamContext;

async function status(p: Promise<unknown>): Promise<number> {
  try {
    await p;
    return 200;
  } catch (e) {
    if (e instanceof HttpError) return e.status;
    throw e;
  }
}

beforeAll(async () => {
  initModels();
  a = await createTeamWithRoles("Findings team A");
  b = await createTeamWithRoles("Findings team B");
  up = await startUploadHarness();
  const { track, bike } = await createSampleTrackAndBike(a.teamId);
  bikeId = bike.id;
  trackId = track.id;
  sessionId = await ingestSampleFile(up, a.members.engineer.cookie, a.teamId, "three-laps-20hz.csv", { trackId, bikeId });
  for (const role of ["owner", "engineer", "rider", "viewer"] as const) ctx[role] = await requireTeam(new Headers({ cookie: a.members[role].cookie }));
  otherTeamEngineer = await requireTeam(new Headers({ cookie: b.members.engineer.cookie }));
}, 240_000);
afterAll(async () => {
  await up?.close();
});

describe("session findings", () => {
  it("the ingest stored the planted findings: brake on the straight, a rev-ceiling touch, pit overspeed", async () => {
    const { findings, outline } = await listSessionFindings(ctx.engineer!, sessionId);
    const kinds = new Set(findings.map((f) => f.kind));
    for (const k of ["brake_on_straight", "rev_ceiling", "pit_overspeed"]) expect(kinds.has(k), k).toBe(true);
    expect(outline!.points.length).toBeGreaterThan(100);
    expect(findings.every((f) => f.acknowledgedAt === null)).toBe(true);
  });

  it("a rider does not see findings of a session that is neither theirs nor shared (404)", async () => {
    expect(await status(listSessionFindings(ctx.rider!, sessionId))).toBe(404);
    expect(await listFindingsToReview(ctx.rider!)).toEqual([]);
  });

  it("another team gets 404 for the session", async () => {
    expect(await status(listSessionFindings(otherTeamEngineer, sessionId))).toBe(404);
  });
});

describe("acknowledging a finding", () => {
  let ids: number[];
  beforeAll(async () => {
    ids = (await Finding.findAll({ where: { sessionId }, order: [["id", "ASC"]] })).map((f) => f.id);
  });

  it("an engineer acknowledges with a note: who, when and the note are stored", async () => {
    const before = Date.now();
    const f = await acknowledgeFinding(ctx.engineer!, at(ids, 0), "  Lever checked in the box, guard bent; replaced.  ");
    expect(f.acknowledgedByName).toBe(ctx.engineer!.userName);
    const row = await Finding.findByPk(ids[0]);
    expect(row!.acknowledgedBy).toBe(a.members.engineer.userId);
    expect(row!.acknowledgedAt!.getTime()).toBeGreaterThanOrEqual(before - 1000);
    expect(row!.note).toBe("Lever checked in the box, guard bent; replaced.");
  });

  it("an owner may acknowledge too", async () => {
    await acknowledgeFinding(ctx.owner!, at(ids, 1), "Seen.");
    expect((await Finding.findByPk(ids[1]))!.acknowledgedBy).toBe(a.members.owner.userId);
  });

  it.each(["rider", "viewer"] as const)("a %s is refused with 403 and nothing changes", async (role) => {
    expect(await status(acknowledgeFinding(ctx[role]!, at(ids, 2), "I think it is fine"))).toBe(403);
    expect((await Finding.findByPk(ids[2]))!.acknowledgedAt).toBeNull();
  });

  it("an engineer of another team gets 404 and nothing changes", async () => {
    expect(await status(acknowledgeFinding(otherTeamEngineer, at(ids, 2), "not mine"))).toBe(404);
    expect((await Finding.findByPk(ids[2]))!.acknowledgedAt).toBeNull();
  });

  it("Findings to review lists the unacknowledged ones only, worst first, and a rider sees them once the session is theirs", async () => {
    const list = await listFindingsToReview(ctx.viewer!, { limit: 100 });
    expect(list.map((f) => f.id).sort()).toEqual(ids.slice(2).sort());
    expect(list.every((f) => f.sessionTitle.length > 0)).toBe(true);
    const rank = { critical: 0, warning: 1, info: 2 };
    for (let i = 1; i < list.length; i++) expect(at(rank, at(list, i).severity)).toBeGreaterThanOrEqual(at(rank, at(list, i - 1).severity));
    const rider = await createRider(a.teamId, a.members.rider.userId);
    await RideSession.update({ riderId: rider.id }, { where: { id: sessionId } });
    expect((await listFindingsToReview(ctx.rider!, { limit: 100 })).length).toBe(list.length);
    expect((await listSessionFindings(ctx.rider!, sessionId)).findings.length).toBe(ids.length);
  });
});

describe("thresholds per bike and track", () => {
  it("shows no overrides at first; riders and viewers cannot save (403); another team's bike is 404", async () => {
    const s = await getThresholdSettings(ctx.engineer!);
    expect(s.bikes.find((x) => x.id === bikeId)!.overrides).toEqual({});
    for (const role of ["rider", "viewer"] as const) expect(await status(saveBikeThresholds(ctx[role]!, bikeId, { wheelSpinTargetSlip: 0.03 }))).toBe(403);
    expect(await status(saveBikeThresholds(otherTeamEngineer, bikeId, { wheelSpinTargetSlip: 0.03 }))).toBe(404);
    expect(await status(saveTrackThresholds(otherTeamEngineer, trackId, { gpsDropoutS: 2 }))).toBe(404);
    expect(await status(saveBikeThresholds(ctx.engineer!, bikeId, { wheelSpinTargetSlip: 5 }))).toBe(422);
  });

  it("lowering the bike's spin target reanalyses its sessions: wheel-spin findings appear, acknowledgements stay", async () => {
    const spinBefore = await Finding.count({ where: { sessionId, kind: "wheel_spin" } });
    const acked = await Finding.findAll({ where: { sessionId }, order: [["id", "ASC"]] }).then((r) => r.filter((f) => f.acknowledgedAt));
    const res = await saveBikeThresholds(ctx.engineer!, bikeId, { wheelSpinTargetSlip: 0.03, wheelSpinMinDurationS: 0.1 });
    expect(res.reanalysed).toBe(1);
    const spinAfter = await Finding.count({ where: { sessionId, kind: "wheel_spin" } });
    expect(spinAfter).toBeGreaterThan(spinBefore);
    const spin = await Finding.findOne({ where: { sessionId, kind: "wheel_spin" } });
    expect(spin!.thresholdValue).toBeCloseTo(0.03, 9);
    expect((await getThresholdSettings(ctx.owner!)).bikes.find((x) => x.id === bikeId)!.overrides).toEqual({ wheelSpinTargetSlip: 0.03, wheelSpinMinDurationS: 0.1 });
    const ackedKinds = acked.map((f) => f.kind).sort();
    const stillAcked = (await Finding.findAll({ where: { sessionId } })).filter((f) => f.acknowledgedAt).map((f) => f.kind).sort();
    expect(stillAcked).toEqual(ackedKinds);
  });

  it("a track's pit-lane limit raised above the overspeed reanalyses the track's sessions: the overspeed goes", async () => {
    expect(await Finding.count({ where: { sessionId, kind: "pit_overspeed" } })).toBeGreaterThan(0);
    // The track row's own limit (60 km/h) wins over a threshold, so clear it like the Tracks screen would.
    const { Track } = await import("@/models");
    await Track.update({ pitSpeedLimitKmh: null }, { where: { id: trackId } });
    const res = await saveTrackThresholds(ctx.owner!, trackId, { pitSpeedLimitMps: 120 / 3.6, gpsDropoutS: 2 });
    expect(res.reanalysed).toBe(1);
    expect(await Finding.count({ where: { sessionId, kind: "pit_overspeed" } })).toBe(0);
  });
});
