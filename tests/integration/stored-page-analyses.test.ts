/**
 * Drive slip, Suspension use, Gears and Rider brief computed at ingest and stored: on
 * three-laps-20hz.csv taken through the real upload and ingest path, what the data functions
 * read back from session_analysis_parts must be exactly what they compute on request from the
 * stored samples (the only source before this was stored), for every lap; a changed setting, a lap
 * marked invalid or renamed corners must fall back to the computation; re-analysis stores again.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import { initModels, Lap, RideSession, Track } from "@/models";
import { slipAnalysis, suspensionAnalysis, gearAnalysis, riderBrief, loadAnalysisBase } from "@/lib/data/analysis";
import { reanalyseSession } from "@/lib/data/reanalyse";
import { PAGE_ROLES } from "@/lib/analysis/analysis-base";
import { computeSlip } from "@/lib/analysis/slip-page";
import { computeSuspension } from "@/lib/analysis/suspension-page";
import { computeGears } from "@/lib/analysis/gears-page";
import { computeBrief } from "@/lib/analysis/brief-page";
import type { SessionAnalysisSummary } from "@/lib/analysis/analyse-series";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";
import { createSampleTrackAndBike, ingestSampleFile } from "./helpers/demo-track";
import { at } from "../fixtures/at";

let team: TestTeam;
let up: UploadHarness;
let sessionId: number;
let trackId: number;
const sq = () => getSequelize();

async function parts(): Promise<{ part: string; basis: string; bytes: number }[]> {
  return sq().query<{ part: string; basis: string; bytes: number }>(
    "SELECT part, basis, LENGTH(data) AS bytes FROM session_analysis_parts WHERE session_id = ? ORDER BY part",
    { replacements: [sessionId], type: QueryTypes.SELECT },
  );
}

/** Every page, every lap, with the default settings: stored (data function) against on request (the pure functions on the stored samples). */
async function expectStoredEqualsComputed(): Promise<number> {
  const [slipBase, suspBase, gearBase, briefBase] = await Promise.all([
    loadAnalysisBase(sq(), sessionId, PAGE_ROLES.slip),
    loadAnalysisBase(sq(), sessionId, PAGE_ROLES.suspension),
    loadAnalysisBase(sq(), sessionId, PAGE_ROLES.gears),
    loadAnalysisBase(sq(), sessionId, PAGE_ROLES.brief),
  ]);
  const lapNumbers = [null, ...slipBase.laps.map((l) => l.number), 999];
  let compared = 0;
  for (const lap of lapNumbers) {
    expect(await slipAnalysis(sq(), sessionId, { lap }), `slip, lap ${lap}`).toEqual(computeSlip(slipBase, { lap }));
    expect(await suspensionAnalysis(sq(), sessionId, { lap }), `suspension, lap ${lap}`).toEqual(computeSuspension(suspBase, { lap }));
    expect(await riderBrief(sq(), sessionId, { lap }), `brief, lap ${lap}`).toEqual(computeBrief(briefBase, { lap }));
    compared += 3;
  }
  // The page passes the defaults explicitly: window 70 ms, 100 mm/s as 100 / 1000 m/s.
  expect(await suspensionAnalysis(sq(), sessionId, { window: 70, boundaryMs: 100 / 1000, lap: null })).toEqual(computeSuspension(suspBase, {}));
  expect(await gearAnalysis(sq(), sessionId)).toEqual(computeGears(gearBase));
  return compared + 2;
}

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Stored analysis team");
  up = await startUploadHarness();
  const { track, bike } = await createSampleTrackAndBike(team.teamId);
  trackId = track.id;
  sessionId = await ingestSampleFile(up, team.members.engineer.cookie, team.teamId, "three-laps-20hz.csv", { trackId: track.id, bikeId: bike.id });
}, 240_000);
afterAll(async () => {
  await up?.close();
});

describe("page analyses stored at ingest (three-laps-20hz.csv)", () => {
  it("stores slip, suspension, gears and brief, and one slip trace per lap, all of one basis", async () => {
    const rows = await parts();
    const laps = await Lap.findAll({ where: { sessionId }, order: [["number", "ASC"]] });
    expect(laps.length).toBeGreaterThanOrEqual(5); // out-lap, 3 flying laps, in-lap
    expect(rows.map((r) => r.part).sort()).toEqual(["brief", "gears", ...laps.map((l) => `slip-trace:${l.number}`), "slip", "suspension"].sort());
    expect(new Set(rows.map((r) => r.basis)).size).toBe(1);
    const summary = (await RideSession.findByPk(sessionId))!.summary as SessionAnalysisSummary & { preview?: unknown };
    expect(summary.pages!.parts).toBe(rows.length);
    expect(summary.pages!.bytes).toBe(rows.reduce((n, r) => n + Number(r.bytes), 0));
    expect(summary.lapCount).toBe(laps.length);
  });

  it("what the pages read back equals what they compute on request, for every lap", async () => {
    expect(await expectStoredEqualsComputed()).toBeGreaterThan(15);
  }, 120_000);

  it("the stored contents carry what was asked: spins with lap and corner, exits per flying lap, histograms per lap, braking per lap, time in gear", async () => {
    const slip = await slipAnalysis(sq(), sessionId);
    expect(slip.zero.applied).toBe(true);
    expect(slip.exits.length).toBe(3);
    const susp = await suspensionAnalysis(sq(), sessionId, { lap: at(slip.exits, 0).lap });
    expect(susp.fork!.position.timePct.reduce((a, b) => a + b, 0)).toBeCloseTo(100, 6);
    expect(susp.shock!.velocity.timePct.reduce((a, b) => a + b, 0)).toBeCloseTo(100, 6);
    const brief = await riderBrief(sq(), sessionId);
    expect(brief.corners.length).toBeGreaterThan(5);
    const gears = await gearAnalysis(sq(), sessionId);
    expect(gears.source).toBe("logged");
    expect(gears.rows.reduce((a, r) => a + r.pct, 0)).toBeCloseTo(100, 6);
  });

  it("reads the stored parts (a part changed in the table is what the page gets)", async () => {
    const lap = (await Lap.findOne({ where: { sessionId }, order: [["number", "ASC"]] }))!.number;
    const cases: { part: string; mark: (d: Record<string, unknown>) => void; read: () => Promise<unknown> }[] = [
      { part: "gears", mark: (d) => (d.upshifts = -1), read: async () => (await gearAnalysis(sq(), sessionId)).upshifts },
      { part: "slip", mark: (d) => (d.cornerSource = -1), read: async () => (await slipAnalysis(sq(), sessionId)).cornerSource },
      { part: `slip-trace:${lap}`, mark: (d) => (d.distanceM = [-1]), read: async () => (await slipAnalysis(sq(), sessionId, { lap })).trace!.distanceM[0] },
      { part: "suspension", mark: (d) => (d.sampleRateHz = -1), read: async () => (await suspensionAnalysis(sq(), sessionId)).sampleRateHz },
      { part: "brief", mark: (d) => ((d.brief as Record<string, unknown>).outline = -1), read: async () => (await riderBrief(sq(), sessionId)).outline },
    ];
    for (const c of cases) {
      const row = at(await sq().query<{ data: string }>("SELECT data FROM session_analysis_parts WHERE session_id = ? AND part = ?", { replacements: [sessionId, c.part], type: QueryTypes.SELECT }), 0);
      const marked = JSON.parse(row.data) as Record<string, unknown>;
      c.mark(marked);
      await sq().query("UPDATE session_analysis_parts SET data = ? WHERE session_id = ? AND part = ?", { replacements: [JSON.stringify(marked), sessionId, c.part] });
      try {
        expect(await c.read(), c.part).toBe(-1);
      } finally {
        await sq().query("UPDATE session_analysis_parts SET data = ? WHERE session_id = ? AND part = ?", { replacements: [row.data, sessionId, c.part] });
      }
      expect(await c.read(), c.part).not.toBe(-1);
    }
  });

  it("a person's setting is computed on request: lean correction, another velocity window or low/high split", async () => {
    const slipBase = await loadAnalysisBase(sq(), sessionId, PAGE_ROLES.slip);
    const lean = await slipAnalysis(sq(), sessionId, { lean: true });
    expect(lean.lean.applied).toBe(true);
    expect(lean).toEqual(computeSlip(slipBase, { lean: true }));
    const suspBase = await loadAnalysisBase(sq(), sessionId, PAGE_ROLES.suspension);
    const w9 = await suspensionAnalysis(sq(), sessionId, { window: 90 });
    expect(w9.window).toBe(90);
    expect(w9).toEqual(computeSuspension(suspBase, { window: 90 }));
    expect(w9.fork!.velocity.timePct).not.toEqual((await suspensionAnalysis(sq(), sessionId)).fork!.velocity.timePct);
    const split = await suspensionAnalysis(sq(), sessionId, { boundaryMs: 0.05 });
    expect(split.fork!.split.boundaryMs).toBe(0.05);
    expect(split).toEqual(computeSuspension(suspBase, { boundaryMs: 0.05 }));
  });

  it("a lap marked invalid makes the stored parts stale (the best lap moves); re-analysis stores them again", async () => {
    const before = await riderBrief(sq(), sessionId);
    const best = before.bestLap!;
    await Lap.update({ isInvalid: true }, { where: { sessionId, number: best } });
    const stale = await riderBrief(sq(), sessionId);
    expect(stale.bestLap).not.toBe(best);
    const briefBase = await loadAnalysisBase(sq(), sessionId, PAGE_ROLES.brief);
    expect(stale).toEqual(computeBrief(briefBase));

    const oldBasis = at((await parts()), 0).basis;
    await reanalyseSession(sq(), sessionId);
    const rows = await parts();
    expect(new Set(rows.map((r) => r.basis)).size).toBe(1);
    expect(at(rows, 0).basis).not.toBe(oldBasis);
    expect((await riderBrief(sq(), sessionId)).bestLap).toBe(stale.bestLap);
    await expectStoredEqualsComputed();
  }, 120_000);

  it("without named corners the corners found on the best lap are stored alike", async () => {
    await Track.update({ corners: null }, { where: { id: trackId } });
    // Stale until re-analysed: computed on request, with found corners.
    expect((await slipAnalysis(sq(), sessionId)).cornerSource).toBe("found");
    await reanalyseSession(sq(), sessionId);
    const slip = await slipAnalysis(sq(), sessionId);
    expect(slip.cornerSource).toBe("found");
    expect(at(at(slip.exits, 0).exits, 0).name).toBe("Corner 1");
    await expectStoredEqualsComputed();
  }, 120_000);
});
