/**
 * The data behind Drive slip, Suspension use, Gears and the Rider brief, on the sample file
 * three-laps-20hz.csv taken through the real upload and ingest path. Ground truth:
 * sample-logs/files/three-laps-20hz.truth.json (the generator's own record of the ride).
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { getSequelize } from "@/models/db";
import { initModels, RideSession } from "@/models";
import { slipForViewer, suspensionForViewer, gearsForViewer, briefForViewer } from "@/lib/data/viewer-analyses";
import { HttpError } from "@/lib/http/http-error";
import type { TeamContext } from "@/lib/auth/guard";
import type { TeamRole } from "@/lib/auth/permissions";
import { slipAnalysis, suspensionAnalysis, gearAnalysis, riderBrief, BRIEF_BRAKE_THRESHOLD_PA } from "@/lib/data/analysis";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";
import { createSampleTrackAndBike, ingestSampleFile } from "./helpers/demo-track";
import { at } from "../fixtures/at";

interface TruthCorner { name: string; brakeOnsetDistanceM: number | null }
interface TruthLap { number: number; kind: string; corners: TruthCorner[] }
const truth = JSON.parse(fs.readFileSync(path.resolve(__dirname, "../../sample-logs/files/three-laps-20hz.truth.json"), "utf8")) as {
  laps: TruthLap[];
  brakeOnsetThresholdBar: number;
};

let team: TestTeam;
let up: UploadHarness;
let sessionId: number;

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Analysis team");
  up = await startUploadHarness();
  const { track, bike } = await createSampleTrackAndBike(team.teamId);
  sessionId = await ingestSampleFile(up, team.members.engineer.cookie, team.teamId, "three-laps-20hz.csv", { trackId: track.id, bikeId: bike.id });
}, 240_000);
afterAll(async () => {
  await up?.close();
});

describe("Rider brief on three-laps-20hz.csv", () => {
  it("uses the same 2 bar onset as the truth file", () => {
    expect(BRIEF_BRAKE_THRESHOLD_PA).toBe(truth.brakeOnsetThresholdBar * 1e5);
  });

  it("braking differences against the best lap agree with the truth's per-lap brake onsets within 2 m", async () => {
    const first = await riderBrief(getSequelize(), sessionId);
    expect(first.available).toBe(true);
    const flying = first.laps.filter((l) => l.flying).map((l) => l.number);
    expect(flying.length).toBe(3);
    const best = first.bestLap!;
    // Lap numbers: ours count the out-lap as lap 1, the truth file as lap 0.
    const offset = at(first.laps, 0).number - at(truth.laps, 0).number;
    const truthLap = (n: number) => truth.laps.find((l) => l.number === n - offset)!;
    let checked = 0;
    for (const lap of flying.filter((n) => n !== best)) {
      const brief = await riderBrief(getSequelize(), sessionId, { lap });
      expect(brief.lap).toBe(lap);
      for (const c of brief.corners) {
        const tb = truthLap(best).corners.find((x) => x.name === c.name);
        const tl = truthLap(lap).corners.find((x) => x.name === c.name);
        if (!tb?.brakeOnsetDistanceM || !tl?.brakeOnsetDistanceM || c.earlierM === null) continue;
        const truthEarlier = tb.brakeOnsetDistanceM - tl.brakeOnsetDistanceM;
        expect(Math.abs(c.earlierM - truthEarlier), `${c.name}, lap ${lap} vs best lap ${best}`).toBeLessThanOrEqual(2);
        expect(c.text).toMatch(new RegExp(`^${c.name}: you braked (\\d+ m (earlier|later) than|at about the same point as) on your best lap\\.$`));
        checked++;
      }
    }
    expect(checked).toBeGreaterThanOrEqual(10);
  });

  it("gives peak pressure, minimum speed and a place on the outline for each corner", async () => {
    const brief = await riderBrief(getSequelize(), sessionId);
    expect(brief.outline!.points.length).toBeGreaterThan(100);
    const t1 = brief.corners.find((c) => c.name === "Turn 1")!;
    expect(t1.peakBar!).toBeGreaterThan(5);
    // Turn 6 is the hairpin, ~55 km/h at the apex (sample-logs/README.md).
    const hairpin = brief.corners.find((c) => c.name === "Turn 6")!;
    expect(hairpin.minSpeedKmh!).toBeGreaterThan(40);
    expect(hairpin.minSpeedKmh!).toBeLessThan(70);
    for (const c of brief.corners) expect(c.at).not.toBeNull();
  });
});

describe("Drive slip", () => {
  it("peaks on corner exits sit in the generator's 5–12 % spec, with the convention's zero found on straights", async () => {
    const s = await slipAnalysis(getSequelize(), sessionId);
    expect(s.available).toBe(true);
    expect(s.zero.applied).toBe(true);
    // Rolling circumferences 1960/1850 mm are both the logger's, so the straight-line ratio is ~1 (+1–2 % drive slip).
    expect(s.zero.ratio).toBeGreaterThan(0.99);
    expect(s.zero.ratio).toBeLessThan(1.03);
    const peaks = s.exits.flatMap((l) => l.exits.map((e) => e.peakSlip)).filter(Number.isFinite);
    expect(peaks.length).toBeGreaterThanOrEqual(20);
    const max = Math.max(...peaks);
    expect(max).toBeGreaterThanOrEqual(0.05);
    expect(max).toBeLessThanOrEqual(0.12 + 0.01);
    const sorted = [...peaks].sort((a, b) => a - b);
    const median = sorted[sorted.length >> 1];
    expect(median).toBeGreaterThan(0.03);
    expect(s.trace!.distanceM.length).toBeGreaterThan(1000);
    expect(s.scatter.slip.length).toBeGreaterThan(500);
  });

  it("spin events above the 8 % default target carry their lap and corner", async () => {
    const s = await slipAnalysis(getSequelize(), sessionId);
    expect(s.targetSlip).toBe(0.08);
    expect(s.targetSource).toBe("default");
    for (const e of s.spins) {
      expect(e.peakSlip).toBeGreaterThan(0.08);
      expect(e.durationS).toBeGreaterThan(0);
    }
    const onLaps = s.spins.filter((e) => e.lap !== null);
    expect(onLaps.every((e) => e.corner !== null)).toBe(true);
  });

  it("the lean correction uses both tyres' crown radii and only lowers the slip on leaned exits", async () => {
    const plain = await slipAnalysis(getSequelize(), sessionId);
    const lean = await slipAnalysis(getSequelize(), sessionId, { lean: true });
    expect(lean.lean).toEqual({ possible: true, applied: true, crownRadiusMm: 95, frontCrownRadiusMm: 80 });
    const a = plain.exits.flatMap((l) => l.exits.map((e) => e.meanSlip));
    const b = lean.exits.flatMap((l) => l.exits.map((e) => e.meanSlip));
    expect(b.length).toBe(a.length);
    // r_eff = r0 − rc·(1 − cos φ) per tyre: the rear (r0 1960/2π = 312 mm, rc 95 mm) shrinks by
    // 0.305·(1 − cos φ), the front (r0 1850/2π = 294 mm, rc 80 mm) by 0.272·(1 − cos φ), so the rear
    // scales down more and the corrected slip is never higher (geometry of the crown model).
    for (let i = 0; i < a.length; i++) if (Number.isFinite(at(a, i))) expect(at(b, i)).toBeLessThanOrEqual(at(a, i) + 1e-6);
  });
});

describe("Suspension use", () => {
  it("fork and shock: histograms sum to 100 %, sag near the generator's ~30 / ~20 mm, no bottoming", async () => {
    const s = await suspensionAnalysis(getSequelize(), sessionId);
    for (const side of [s.fork!, s.shock!]) {
      expect(side.position.timePct.reduce((x, y) => x + y, 0)).toBeCloseTo(100, 6);
      expect(side.velocity.timePct.reduce((x, y) => x + y, 0)).toBeCloseTo(100, 6);
      const q = side.split;
      expect(q.compressionLowPct + q.compressionHighPct + q.reboundLowPct + q.reboundHighPct).toBeCloseTo(100, 6);
      expect(side.maxTravelMm!).toBeLessThanOrEqual(side.strokeMm);
    }
    expect(s.fork!.strokeMm).toBe(120);
    expect(s.shock!.strokeMm).toBe(65);
    expect(s.fork!.sagMm.rolling!).toBeGreaterThan(15);
    expect(s.fork!.sagMm.rolling!).toBeLessThan(45);
    expect(s.shock!.sagMm.rolling!).toBeGreaterThan(10);
    expect(s.shock!.sagMm.rolling!).toBeLessThan(30);
    expect(s.boundaryMs).toBe(0.1);
  });

  it("a lap and the Savitzky–Golay window are applied (velocity histogram changes, positions do not)", async () => {
    const lap = (await riderBrief(getSequelize(), sessionId)).bestLap!;
    const narrow = await suspensionAnalysis(getSequelize(), sessionId, { lap, window: 50 });
    const wide = await suspensionAnalysis(getSequelize(), sessionId, { lap, window: 210 });
    expect(narrow.scope).toBe(`Lap ${lap}`);
    expect(wide.window).toBe(210);
    expect(wide.fork!.position.timePct).toEqual(narrow.fork!.position.timePct);
    expect(wide.fork!.velocity.timePct).not.toEqual(narrow.fork!.velocity.timePct);
    const session = await suspensionAnalysis(getSequelize(), sessionId, { window: 50 });
    expect(session.scope).toBe("Whole session");
    expect(session.fork!.position.timePct).not.toEqual(narrow.fork!.position.timePct);
  });
});

describe("Gears", () => {
  it("time in gear covers the session and upshifts are clutchless under throttle", async () => {
    const g = await gearAnalysis(getSequelize(), sessionId);
    expect(g.source).toBe("logged");
    expect(g.rows.reduce((x, r) => x + r.pct, 0)).toBeCloseTo(100, 6);
    expect(g.rows.filter((r) => r.gear >= 1 && r.timeS > 0).length).toBeGreaterThanOrEqual(5);
    expect(g.upshifts).toBeGreaterThan(20);
    expect(g.clutchlessUpshifts).toBeGreaterThan(0);
  });
});

describe("the analyses as the caller sees them", () => {
  const ctxOf = (t: TestTeam, role: TeamRole): TeamContext => {
    const m = t.members[role];
    return { teamId: t.teamId, teamName: "t", teamSlug: "t", role, userId: m.userId, userName: role, email: m.email, memberships: [] };
  };
  const status = (p: Promise<unknown>) => p.then(() => 200, (e: unknown) => (e instanceof HttpError ? e.status : -1));
  const all = (ctx: TeamContext) => [slipForViewer(ctx, sessionId), suspensionForViewer(ctx, sessionId), gearsForViewer(ctx, sessionId), briefForViewer(ctx, sessionId)];

  it("a member who may see the session gets the same result as the stored analysis", async () => {
    const [slip, susp, gears, brief] = await Promise.all(all(ctxOf(team, "viewer")));
    expect(slip).toEqual(await slipAnalysis(getSequelize(), sessionId));
    expect(susp).toEqual(await suspensionAnalysis(getSequelize(), sessionId));
    expect(gears).toEqual(await gearAnalysis(getSequelize(), sessionId));
    expect(brief).toEqual(await riderBrief(getSequelize(), sessionId));
  });

  it("another team's member and a rider the session is neither about nor shared with get 404", async () => {
    const other = await createTeamWithRoles("Other analysis team");
    expect(await Promise.all(all(ctxOf(other, "owner")).map(status))).toEqual([404, 404, 404, 404]);
    const row = await RideSession.findByPk(sessionId);
    expect(row!.riderId).toBeNull();
    await row!.update({ sharedWithRiders: false });
    expect(await Promise.all(all(ctxOf(team, "rider")).map(status))).toEqual([404, 404, 404, 404]);
    // Shared with riders: the rider sees it.
    await row!.update({ sharedWithRiders: true });
    expect(await Promise.all(all(ctxOf(team, "rider")).map(status))).toEqual([200, 200, 200, 200]);
    await row!.update({ sharedWithRiders: false });
  });
});
