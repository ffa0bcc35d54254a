/**
 * The analysis that runs at ingest, through the real path: upload (SDK + local upload fake + our
 * route), Import profile, ingest job, MariaDB. Every expected value comes from the sample-log
 * generator's ground truth (sample-logs/files/*.truth.json: lap and gate times from the model's
 * continuous path, planted events with their rule) — invented data on the invented circuit of
 * sample-logs/circuit.ts, whose gates the test team's track is made from.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { readFileSync } from "node:fs";
import path from "node:path";
import { getSequelize } from "@/models/db";
import { initModels, Bike, Finding, Lap, RideSession, Track } from "@/models";
import { confirmMapping } from "@/lib/data/imports";
import { ensureTrack, guessTrack } from "@/lib/data/tracks";
import { reanalyseSession, reanalyseTrackSessions } from "@/lib/data/reanalyse";
import { CAUTION_TEXT } from "@/lib/findings/caution";
import { haversineM } from "@/lib/geo/haversine-m";
import type { Mapping } from "@/lib/ingest/mapping";
import type { SessionAnalysisSummary } from "@/lib/analysis/analyse-series";
import { ingestNow } from "@/workers/ingest/ingest-now";
import { demoTrackInput } from "@/workers/demo-track";
import { BIKE } from "@/sample-logs/bike-model";
import { toLatLon, trackPointAt } from "@/sample-logs/circuit";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";
import { at } from "../fixtures/at";

const DIR = path.resolve(__dirname, "../../sample-logs/files");

interface TruthLap {
  number: number;
  kind: "out" | "flying" | "in";
  flags: { outLap: boolean; inLap: boolean };
  startS: number;
  endS: number;
  lapTimeMs: number;
  sectorTimesMs: number[] | null;
  distanceM: number;
  topSpeedMps: number;
}
interface TruthEvent {
  kind: string;
  lap: number;
  startS: number;
  endS: number;
  measured: { value: number };
  limit: { value: number };
  trackDistanceM: number;
  rule: string;
}
interface Truth {
  gpsRateHz: number;
  revCeilingRpm: number;
  stoppedAtS: number;
  laps: TruthLap[];
  events: TruthEvent[];
}
const truthOf = (name: string): Truth => JSON.parse(readFileSync(path.join(DIR, name), "utf8"));

/** The generator numbers the out-lap 0; Lapbench numbers laps from 1 with the out-lap first. */
const ours = (truthLap: number) => truthLap + 1;

let team: TestTeam;
let up: UploadHarness;
let track: Track;
let bikeId: number;
const sequelize = () => getSequelize();
const sessions: Record<string, number> = {};

async function uploadSample(file: string): Promise<number> {
  const { sessionId } = await up.upload(new File([readFileSync(path.join(DIR, file))], file), team.members.engineer.cookie);
  await RideSession.update({ bikeId }, { where: { id: sessionId } });
  return sessionId;
}

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Analysis team");
  up = await startUploadHarness();
  const truth = truthOf("three-laps-20hz.truth.json");
  const brake = truth.events.find((e) => e.kind === "brake_on_straight")!;
  // The truth states its own brake-on-straight rule ("front brake ≥ 1 bar while throttle > 80 %");
  // the track carries it as its thresholds so start times compare like for like.
  // The margin over the resting pressure is set out of reach: the truth's rule is the absolute one.
  const thresholds = { brakeOnStraightPressurePa: brake.limit.value, brakeOnStraightThrottlePct: Number(/throttle > (\d+)/.exec(brake.rule)![1]), brakeOnStraightRestMarginPa: 1e9 };
  ({ track } = await ensureTrack(sequelize(), team.teamId, { ...demoTrackInput(), thresholds }));
  // The generator's bike (sample-logs/bike-model.ts): its rev ceiling and strokes.
  const bike = await Bike.create({
    teamId: team.teamId, name: "Sample bike", className: null, wheelCircFrontMm: BIKE.frontCircumferenceM * 1000, wheelCircRearMm: BIKE.rearCircumferenceM * 1000,
    primaryRatio: BIKE.primaryRatio, gearboxRatios: [...BIKE.gearRatios], sprocketFront: BIKE.frontSprocket, sprocketRear: BIKE.rearSprocket,
    revCeilingRpm: BIKE.revCeilingRpm, forkStrokeMm: BIKE.forkStrokeMm, shockStrokeMm: BIKE.shockStrokeMm, tyreCrownRadiusMm: null, calibrations: null, thresholds: null,
  });
  bikeId = bike.id;
});
afterAll(async () => {
  await up?.close();
});

/** Lap and sector checks shared by every file of the same ride. */
async function checkLaps(sessionId: number, truth: Truth, lapTolMs: number) {
  const laps = await Lap.findAll({ where: { sessionId }, order: [["number", "ASC"]] });
  expect(laps.map((l) => l.number)).toEqual(truth.laps.map((l) => ours(l.number)));
  for (const tl of truth.laps) {
    const l = at(laps, tl.number);
    expect(l.isOutLap, `lap ${l.number} out`).toBe(tl.flags.outLap);
    expect(l.isInLap, `lap ${l.number} in`).toBe(tl.flags.inLap);
    expect(l.pitPass).toBe(false);
    expect(l.isInvalid).toBe(false);
    if (tl.kind !== "flying") continue;
    expect(Math.abs(l.lapTimeMs - tl.lapTimeMs), `lap ${l.number} time`).toBeLessThanOrEqual(lapTolMs);
    // Sector gates sit where the bike is slower than at the line, so the generator's 0.3 m
    // (1 σ, correlated) GPS position noise moves their crossings more: ~7 ms per crossing at
    // 40 m/s, two crossings per sector. 25 ms is about 2.5 σ of the difference.
    const st = l.sectorTimesMs!;
    expect(st.reduce((a, b) => a + b, 0)).toBe(l.lapTimeMs);
    tl.sectorTimesMs!.forEach((ms, k) => expect(Math.abs(at(st, k) - ms), `lap ${l.number} sector ${k + 1}`).toBeLessThanOrEqual(25));
  }
  // The in-lap ends where the log ends, after the bike stopped in the box (truth.stoppedAtS).
  expect(at(laps, laps.length - 1).endTimeS).toBeGreaterThanOrEqual(truth.stoppedAtS);
  return laps;
}

describe("three-lap sample logs: laps, sectors and findings at ingest", () => {
  it.each([
    // 20 Hz GPS: fixes every ~4 m at the line; interpolated crossings land within a few ms.
    ["three-laps-20hz.csv", 5],
    // 10 Hz GPS (plain arithmetic: 200 km/h = 55.556 m/s, fixes 5.6 m apart): within 20 ms.
    ["three-laps-10hz.csv", 20],
  ] as const)("%s: laps, flags and times as the generator's truth (lap time ±%d ms)", async (file, tolMs) => {
    const truth = truthOf(file.replace(/\.csv$/, ".truth.json"));
    const sessionId = await uploadSample(file);
    sessions[file] = sessionId;
    const s = await RideSession.findByPk(sessionId);
    if (s!.status === "mapping") await confirmMapping(sequelize(), team.teamId, sessionId, s!.mapping as Mapping, "Team logger CSV");
    expect(await ingestNow(sequelize(), sessionId, "analysis-test")).toBe("ready");
    const ready = await RideSession.findByPk(sessionId);
    expect(ready!.status).toBe("ready");
    // No track was chosen: the nearest team track to the log's median position was.
    expect(ready!.trackId).toBe(track.id);
    const laps = await checkLaps(sessionId, truth, tolMs);

    // Distance: front wheel rescaled to GPS length per lap; truth distanceM is the path length
    // of the model (4245.4 m centreline). The 0.3 m GPS noise lengthens the fix-to-fix path a
    // little and chords cut corners a little (measured: +1 to +4 m); 0.2 % is 8.5 m.
    for (const tl of truth.laps.filter((l) => l.kind === "flying")) {
      expect(Math.abs(at(laps, tl.number).distanceM! - tl.distanceM) / tl.distanceM, `lap ${tl.number + 1} distance`).toBeLessThan(0.002);
      // Front wheel speed carries the model's small front slip and 0.02 m/s noise: within 0.2 %.
      expect(Math.abs(at(laps, tl.number).topSpeedMps! - tl.topSpeedMps) / tl.topSpeedMps).toBeLessThan(0.002);
    }

    const summary = ready!.summary as SessionAnalysisSummary & { preview?: { format: string } };
    expect(summary.preview?.format).toBe("csv");
    expect(summary.lapCount).toBe(truth.laps.length);
    const flying = truth.laps.filter((l) => l.kind === "flying");
    const best = flying.reduce((a, b) => (b.lapTimeMs < a.lapTimeMs ? b : a));
    expect(summary.bestLap?.number).toBe(ours(best.number));
    const bestSectors = [0, 1, 2].reduce((sum, k) => sum + Math.min(...flying.map((l) => at(l.sectorTimesMs!, k))), 0);
    expect(Math.abs(summary.bestSectorLap!.timeMs - bestSectors)).toBeLessThanOrEqual(3 * 25);
    expect(summary.engine?.ceilingExceedances).toBe(truth.events.filter((e) => e.kind === "rev_ceiling").length);
    expect(summary.engine?.ceilingRpm).toBe(truth.revCeilingRpm);
    // The engine idles (1350 rpm, above the 500 rpm "running" line) for the whole log.
    expect(summary.engine!.runningS).toBeCloseTo(ready!.durationS!, 1);
    console.log(`[analysis-at-ingest] ${file}: analysis ${summary.analysisMs} ms for ${ready!.durationS!.toFixed(0)} s of log`);
  });

  it.each(["three-laps-20hz.csv", "three-laps-10hz.csv"])("%s: every planted event is one Finding (kind, lap, start ±50 ms), nothing else", async (file) => {
    const truth = truthOf(file.replace(/\.csv$/, ".truth.json"));
    const sessionId = sessions[file];
    const findings = await Finding.findAll({ where: { sessionId }, order: [["startTimeS", "ASC"]] });
    for (const e of truth.events) {
      const mine = findings.filter((f) => f.kind === e.kind && f.lapNumber === ours(e.lap) && Math.abs(f.startTimeS! - e.startS) <= 0.05);
      expect(mine, `${e.kind} on lap ${ours(e.lap)}`).toHaveLength(1);
      const f = at(mine, 0);
      expect(f.teamId).toBe(team.teamId);
      // Distance along the lap from the line vs the generator's track distance of the event
      // (measured within 3 m; the pit lane runs 25 m inside the straight and its ramps make the
      // in-lap longer than the centreline: measured +10 to +16 m there).
      expect(Math.abs(f.distanceM! - e.trackDistanceM), `${e.kind} distance`).toBeLessThan(e.kind === "pit_overspeed" ? 25 : 6);
      if (e.kind !== "pit_overspeed") {
        const p = trackPointAt(e.trackDistanceM);
        const ll = toLatLon(p.x, p.y);
        // The stored position is the nearest fix: at most one fix interval away (8.5 m at 85 m/s and 10 Hz).
        expect(haversineM(f.lat!, f.lon!, ll.lat, ll.lon), `${e.kind} position`).toBeLessThan(12);
      }
      expect(f.thresholdValue).toBeCloseTo(e.limit.value, 6);
      // Brake, suspension and engine findings carry the safety caution; pit speed does not.
      if (e.kind === "brake_on_straight" || e.kind === "rev_ceiling") expect(f.message.endsWith(CAUTION_TEXT)).toBe(true);
      else expect(f.message).not.toContain(CAUTION_TEXT);
    }
    // Clean laps stay clean: no finding that is not a planted event.
    const unplanted = findings.filter((f) => !truth.events.some((e) => e.kind === f.kind && ours(e.lap) === f.lapNumber && Math.abs(f.startTimeS! - e.startS) <= 0.05));
    expect(unplanted.map((f) => `${f.kind} lap ${f.lapNumber} at ${f.startTimeS}`)).toEqual([]);
  });

  it("reanalysing after a threshold change replaces the findings and keeps the acknowledgement of one found again", async () => {
    const sessionId = at(sessions, "three-laps-20hz.csv");
    const rev = await Finding.findOne({ where: { sessionId, kind: "rev_ceiling" } });
    const brake = await Finding.findOne({ where: { sessionId, kind: "brake_on_straight" } });
    const ackAt = new Date("2031-05-17T11:00:00.000Z");
    await rev!.update({ acknowledgedBy: team.members.engineer.userId, acknowledgedAt: ackAt, note: "Checked: shift light late" });
    await brake!.update({ acknowledgedBy: team.members.engineer.userId, acknowledgedAt: ackAt });

    // The planted brake peak is 4.69 bar (truth measured value): a 6 bar threshold no longer sees it.
    const peak = truthOf("three-laps-20hz.truth.json").events.find((e) => e.kind === "brake_on_straight")!.measured.value;
    expect(peak).toBeLessThan(6e5);
    await track.update({ thresholds: { ...track.thresholds, brakeOnStraightPressurePa: 6e5 } });
    const { sessionIds } = await reanalyseTrackSessions(sequelize(), track.id);
    expect(sessionIds).toEqual(expect.arrayContaining([sessions["three-laps-20hz.csv"], sessions["three-laps-10hz.csv"]]));

    const after = await Finding.findAll({ where: { sessionId } });
    expect(after.map((f) => f.kind).sort()).toEqual(["pit_overspeed", "rev_ceiling"]);
    const rev2 = after.find((f) => f.kind === "rev_ceiling")!;
    expect(rev2.id).not.toBe(rev!.id); // a new row …
    expect(rev2.acknowledgedBy).toBe(team.members.engineer.userId); // … with the acknowledgement kept
    expect(rev2.acknowledgedAt?.toISOString()).toBe(ackAt.toISOString());
    expect(rev2.note).toBe("Checked: shift light late");
    expect(after.find((f) => f.kind === "pit_overspeed")!.acknowledgedAt).toBeNull();
    // Laps are recomputed from the stored chunks to the same times (Float32 storage of channels
    // other than time and position does not move a gate crossing).
    await checkLaps(sessionId, truthOf("three-laps-20hz.truth.json"), 5);

    // Back to the truth's rule: the brake finding returns, unacknowledged (its old row was gone).
    await track.update({ thresholds: { ...track.thresholds, brakeOnStraightPressurePa: 1e5 } });
    const summary = await reanalyseSession(sequelize(), sessionId);
    expect(summary?.findingCounts).toEqual({ brake_on_straight: 1, rev_ceiling: 1, pit_overspeed: 1 });
    const back = await Finding.findOne({ where: { sessionId, kind: "brake_on_straight" } });
    expect(back!.acknowledgedAt).toBeNull();
    const s = await RideSession.findByPk(sessionId);
    expect((s!.summary as { preview?: { format: string } }).preview?.format).toBe("csv");
  });
});

describe("GPS-only files", () => {
  it.each(["three-laps.gpx", "three-laps.nmea"])("%s: laps, flags and times as three-laps.gps.truth.json (10 Hz: ±20 ms)", async (file) => {
    const truth = truthOf("three-laps.gps.truth.json");
    const sessionId = await uploadSample(file);
    expect((await RideSession.findByPk(sessionId))!.status).toBe("queued");
    expect(await ingestNow(sequelize(), sessionId, "analysis-test")).toBe("ready");
    const s = await RideSession.findByPk(sessionId);
    expect(s!.trackId).toBe(track.id);
    const laps = await checkLaps(sessionId, truth, 20);
    // No wheel speed: distance is the GPS path length, within 0.2 % of the model's path.
    for (const tl of truth.laps.filter((l) => l.kind === "flying")) {
      expect(Math.abs(at(laps, tl.number).distanceM! - tl.distanceM) / tl.distanceM).toBeLessThan(0.002);
      expect((at(laps, tl.number).stats as { distanceSource: string }).distanceSource).toBe("gps");
    }
    expect((s!.summary as SessionAnalysisSummary).engine).toBeNull();
  });

  it("a log ridden more than 5 km from every team track gets no track", async () => {
    // 0.1° of latitude is ~11.1 km (1° ≈ 111.1 km on the meridian).
    const far = { timeS: Float64Array.of(0, 1), channels: { gps_lat: Float64Array.of(46.1, 46.1), gps_lon: Float64Array.of(-35, -35) } };
    expect(await guessTrack(sequelize(), team.teamId, far)).toBeNull();
    const near = { timeS: Float64Array.of(0, 1), channels: { gps_lat: Float64Array.of(46.01, 46.01), gps_lon: Float64Array.of(-35, -35) } };
    expect((await guessTrack(sequelize(), team.teamId, near))?.id).toBe(track.id);
    // Another team's track is never guessed.
    expect(await guessTrack(sequelize(), "no-such-team", near)).toBeNull();
  });
});
