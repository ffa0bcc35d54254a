/**
 * Laps and Compare, read side, through the route handlers against the real MariaDB: a sample log
 * (sample-logs/files/three-laps-20hz.csv) uploaded and ingested for real on the invented circuit,
 * then the series API, the lap-table CSV and the lap GPX as each role sees them.
 */
import { ingestNow } from "@/workers/ingest/ingest-now";
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { XMLValidator, XMLParser } from "fast-xml-parser";
import Papa from "papaparse";
import { getSequelize } from "@/models/db";
import { initModels, Lap, RideSession, Rider } from "@/models";
import { confirmMapping, heldDuplicate, resolveDuplicate } from "@/lib/data/imports";
import { ensureTrack } from "@/lib/data/tracks";
import { listChannels, readChannels, readChannelRange, CHUNK_SAMPLES } from "@/lib/data/samples";
import type { Mapping } from "@/lib/ingest/mapping";
import { decodeSeries } from "@/lib/series/binary";
import type { LapSeriesMeta } from "@/lib/series/lap-series-meta";
import { CIRCUIT } from "@/sample-logs/circuit";
import { createTeamWithRoles, req, params, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";
import * as seriesRoute from "@/app/api/series/route";
import * as csvRoute from "@/app/api/sessions/[id]/laps.csv/route";
import * as gpxRoute from "@/app/api/sessions/[id]/laps/[lap]/gpx/route";
import * as lapsRoute from "@/app/api/sessions/[id]/laps/route";
import { SERIES_LIMITS, clearLapSeriesCaches } from "@/lib/data/lap-series";
import { reanalyseSession } from "@/lib/data/reanalyse";
import { QueryTypes } from "sequelize";
import { at } from "../fixtures/at";

const FILE = path.resolve("sample-logs/files/three-laps-20hz.csv");
const TRUTH = JSON.parse(fs.readFileSync(path.resolve("sample-logs/files/three-laps-20hz.truth.json"), "utf8")) as {
  laps: { number: number; kind: string; startS: number; endS: number; lapTimeMs: number; sectorTimesMs: number[] | null; distanceM: number; topSpeedMps: number; flags: { outLap: boolean; inLap: boolean } }[];
};

let a: TestTeam;
let b: TestTeam;
let up: UploadHarness;
let riderSession: number; // ridden by A's rider user
let otherSession: number; // another rider's, not shared
let lapsFromTruth = false;
let flying: { number: number; lapTimeMs: number; startTimeS: number; endTimeS: number }[] = [];

async function ingest(cookie: string, title: string): Promise<number> {
  const { sessionId } = await up.upload(new File([fs.readFileSync(FILE)], "three-laps-20hz.csv", { type: "text/csv" }), cookie);
  let s = await RideSession.findByPk(sessionId);
  // Both sessions read the same file: the second is imported again on purpose.
  if (heldDuplicate(s!)) {
    await resolveDuplicate(getSequelize(), a.teamId, sessionId, "import");
    s = await RideSession.findByPk(sessionId);
  }
  if (s!.status === "mapping") await confirmMapping(getSequelize(), a.teamId, sessionId, s!.mapping as Mapping, "Demo logger");
  // This session's own job: other test files may have left jobs in the shared queue.
  expect(await ingestNow(getSequelize(), sessionId, "series-test")).toBe("ready");
  await RideSession.update({ title }, { where: { id: sessionId } });
  return sessionId;
}

/** If the ingest analysis stored no laps (no track matched), the ground truth's laps stand in. */
async function ensureLaps(sessionId: number) {
  if ((await Lap.count({ where: { sessionId } })) > 0) return;
  lapsFromTruth = true;
  await Lap.bulkCreate(
    TRUTH.laps.map((l) => ({
      sessionId, number: l.number + 1, startTimeS: l.startS, endTimeS: l.endS, lapTimeMs: Math.round(l.lapTimeMs), distanceM: l.distanceM,
      isOutLap: l.flags.outLap, isInLap: l.flags.inLap, isInvalid: false, pitPass: false,
      sectorTimesMs: l.sectorTimesMs ? l.sectorTimesMs.map(Math.round) : [], topSpeedMps: l.topSpeedMps, stats: { complete: l.kind === "flying" },
    })),
  );
}

const seriesUrl = (laps: string, roles: string, x = "distance", width = 1200) => `/api/series?laps=${laps}&roles=${roles}&x=${x}&width=${width}`;
async function series(cookie: string | undefined, laps: string, roles: string, x = "distance", width = 1200) {
  const res = await seriesRoute.GET(req(seriesUrl(laps, roles, x, width), cookie), params({}));
  return res;
}
async function decoded(res: Response) {
  expect(res.status).toBe(200);
  expect(res.headers.get("content-type")).toBe("application/octet-stream");
  return decodeSeries<LapSeriesMeta>(await res.arrayBuffer());
}

beforeAll(async () => {
  initModels();
  [a, b] = await Promise.all([createTeamWithRoles("Series team A"), createTeamWithRoles("Series team B")]);
  await ensureTrack(getSequelize(), a.teamId, {
    name: CIRCUIT.name,
    gates: {
      startFinish: CIRCUIT.gates.find((g) => g.name === "start_finish")!,
      sectors: CIRCUIT.gates.filter((g) => g.name.startsWith("sector_")),
      pitEntry: CIRCUIT.gates.find((g) => g.name === "pit_entry") ?? null,
      pitExit: CIRCUIT.gates.find((g) => g.name === "pit_exit") ?? null,
    },
    corners: CIRCUIT.corners.map((c) => ({ name: c.name, distanceM: c.apexDistanceM })),
    outline: CIRCUIT.centreline.map((p) => [p.lat, p.lon] as [number, number]),
    lengthM: CIRCUIT.lengthM,
    pitSpeedLimitKmh: CIRCUIT.pitLane.speedLimitKmh,
  });
  up = await startUploadHarness();
  riderSession = await ingest(a.members.engineer.cookie, "FP1 own");
  otherSession = await ingest(a.members.engineer.cookie, "FP1 other");
  const mine = await Rider.create({ teamId: a.teamId, name: "Rider user", raceNumber: "27", userId: a.members.rider.userId });
  const other = await Rider.create({ teamId: a.teamId, name: "Other rider", raceNumber: "64", userId: null });
  await RideSession.update({ riderId: mine.id }, { where: { id: riderSession } });
  await RideSession.update({ riderId: other.id, sharedWithRiders: false }, { where: { id: otherSession } });
  await ensureLaps(riderSession);
  await ensureLaps(otherSession);
  const laps = await Lap.findAll({ where: { sessionId: riderSession }, order: [["number", "ASC"]] });
  flying = laps.filter((l) => !l.isOutLap && !l.isInLap).map((l) => ({ number: l.number, lapTimeMs: l.lapTimeMs, startTimeS: l.startTimeS, endTimeS: l.endTimeS }));
  console.log(`[series-api] laps ${lapsFromTruth ? "inserted from the ground truth (ingest stored none)" : "stored by the ingest analysis"}: ${laps.length}`);
}, 300_000);
afterAll(async () => {
  await up?.close();
});

describe("readChannelRange", () => {
  it("returns exactly the samples of the range, across chunk boundaries, as readChannels does", async () => {
    const channels = (await listChannels(getSequelize(), riderSession)).filter((c) => ["time", "speed_front", "gps_lat"].includes(c.role));
    const whole = await readChannels(getSequelize(), channels);
    for (const [s, e] of [[0, 10], [CHUNK_SAMPLES - 3, CHUNK_SAMPLES + 5], [12_345, 31_000], [48_000, 10_000_000]] as const) {
      const part = await readChannelRange(getSequelize(), channels, s, e);
      for (const c of channels) {
        const w = whole.get(c.id)!;
        expect(Array.from(part.get(c.id)!)).toEqual(Array.from(w.subarray(s, Math.min(e, w.length))));
      }
    }
  });
});

describe("the lap list", () => {
  it("has the out-lap, three flying laps and the in-lap, matching the ground truth within 20 ms", async () => {
    const res = await lapsRoute.GET(req(`/api/sessions/${riderSession}/laps`, a.members.viewer.cookie), params({ id: String(riderSession) }));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.laps.length).toBe(TRUTH.laps.length);
    const truthFlying = TRUTH.laps.filter((l) => l.kind === "flying");
    expect(flying.length).toBe(truthFlying.length);
    // GPS at 20 Hz and the interpolated gate crossing: the generator's model path is the reference.
    flying.forEach((l, i) => expect(Math.abs(l.lapTimeMs - at(truthFlying, i).lapTimeMs)).toBeLessThan(20));
  });
});

describe("GET /api/series: who gets what", () => {
  const pair = () => `${riderSession}:${at(flying, 0).number},${riderSession}:${at(flying, 1).number}`;

  it("refuses a request without a session (401)", async () => {
    expect((await series(undefined, pair(), "speed_front")).status).toBe(401);
  });

  it.each(["owner", "engineer", "viewer", "rider"] as const)("%s reads two laps of the rider's session", async (role) => {
    const { meta, arrays } = await decoded(await series(a.members[role].cookie, pair(), "speed_front,throttle"));
    expect(meta.laps.map((l) => l.lap)).toEqual([at(flying, 0).number, at(flying, 1).number]);
    expect(meta.panes.map((p) => p.role)).toEqual(["speed_front", "throttle"]);
    for (const p of meta.panes) for (const s of p.series) expect(at(arrays, s!).length).toBe(at(arrays, p.x).length);
  });

  it("laps from two sessions of the team compare together (owner)", async () => {
    const { meta } = await decoded(await series(a.members.owner.cookie, `${riderSession}:${at(flying, 0).number},${otherSession}:${at(flying, 2).number}`, "speed_front"));
    expect(meta.laps.map((l) => l.sessionTitle)).toEqual(["FP1 own", "FP1 other"]);
  });

  it("a rider gets 404 for another rider's unshared session, and sees it once shared", async () => {
    const mixed = `${riderSession}:${at(flying, 0).number},${otherSession}:${at(flying, 0).number}`;
    expect((await series(a.members.rider.cookie, mixed, "speed_front")).status).toBe(404);
    await RideSession.update({ sharedWithRiders: true }, { where: { id: otherSession } });
    expect((await series(a.members.rider.cookie, mixed, "speed_front")).status).toBe(200);
    await RideSession.update({ sharedWithRiders: false }, { where: { id: otherSession } });
  });

  it.each(["owner", "engineer", "rider", "viewer"] as const)("%s of another team gets 404, with nothing of the data", async (role) => {
    const res = await series(b.members[role].cookie, pair(), "speed_front");
    expect(res.status).toBe(404);
    expect(JSON.stringify(await res.json())).not.toContain("FP1");
  });

  it("a lap that does not exist is a 404; a malformed request is a 422", async () => {
    expect((await series(a.members.owner.cookie, `${riderSession}:999`, "speed_front")).status).toBe(404);
    expect((await series(a.members.owner.cookie, `x:1`, "speed_front")).status).toBe(422);
    expect((await series(a.members.owner.cookie, pair(), "not_a_role")).status).toBe(422);
    expect((await series(a.members.owner.cookie, pair(), "speed_front", "sideways")).status).toBe(422);
  });
});

describe("series values", () => {
  it("the running gap at the line equals lapTime(B) − lapTime(A) within 1 ms", async () => {
    const laps = `${riderSession}:${at(flying, 0).number},${riderSession}:${at(flying, 1).number},${riderSession}:${at(flying, 2).number}`;
    const { meta, arrays } = await decoded(await series(a.members.engineer.cookie, laps, "speed_front", "distance", 8000));
    expect(meta.gap).not.toBeNull();
    expect(meta.gap!.series[0]).toBeNull();
    const x = at(arrays, meta.gap!.x);
    // The grid runs 0 … reference lap length at 1 m, ending exactly on the line.
    expect(at(x, 0)).toBe(0);
    expect(at(x, 1)).toBe(1);
    expect(at(x, x.length - 1)).toBeCloseTo(at(meta.laps, 0).lengthM, 6);
    for (const i of [1, 2]) {
      const g = at(arrays, meta.gap!.series[i]!);
      // Running gap = time(B) − time(A) at equal distance; at the full lap both
      // have covered it, so by definition it is the lap-time difference. Float32 storage: µs.
      expect(Math.abs(at(g, g.length - 1) * 1000 - (at(flying, i).lapTimeMs - at(flying, 0).lapTimeMs))).toBeLessThan(1);
      expect(at(g, 0)).toBeCloseTo(0, 6);
    }
  });

  it("by time, each lap's values are the stored samples interpolated at lap-relative times", async () => {
    const lap = at(flying, 1);
    const { meta, arrays } = await decoded(await series(a.members.engineer.cookie, `${riderSession}:${lap.number}`, "speed_front,engine_rpm", "time", 10_000));
    const channels = await listChannels(getSequelize(), riderSession);
    const whole = await readChannels(getSequelize(), channels);
    const t = whole.get(channels.find((c) => c.role === "time")!.id)!;
    const v = whole.get(channels.find((c) => c.role === "speed_front")!.id)!;
    const pane = meta.panes.find((p) => p.role === "speed_front")!;
    expect(pane.decimated).toBe(false);
    const xs = at(arrays, pane.x);
    const ys = at(arrays, pane.series[0]!);
    expect(at(xs, xs.length - 1)).toBeLessThanOrEqual(lap.lapTimeMs / 1000 + 1e-6);
    for (const k of [0, 1, 777, 4000, xs.length - 2]) {
      const abs = lap.startTimeS + at(xs, k);
      // Independent linear interpolation between the two stored samples around `abs`.
      let i = 0;
      while (at(t, i + 1) < abs) i++;
      const expected = at(v, i) + ((at(v, i + 1) - at(v, i)) * (abs - at(t, i))) / (at(t, i + 1) - at(t, i));
      expect(at(ys, k)).toBeCloseTo(expected, 3);
    }
  });

  it("lap length comes from GPS-rescaled wheel distance: within 1 % of the model path length", async () => {
    const { meta } = await decoded(await series(a.members.engineer.cookie, `${riderSession}:${at(flying, 0).number}`, "speed_front"));
    const truth = at(TRUTH.laps.filter((l) => l.kind === "flying"), 0);
    expect(Math.abs(at(meta.laps, 0).lengthM - truth.distanceM) / truth.distanceM).toBeLessThan(0.01);
    expect(meta.track).not.toBeNull();
  });

  it("decimation to a narrow chart keeps every pixel column's min and max of each lap", async () => {
    const laps = `${riderSession}:${at(flying, 0).number},${riderSession}:${at(flying, 1).number}`;
    const full = await decoded(await series(a.members.engineer.cookie, laps, "engine_rpm", "distance", 10_000));
    const width = 300;
    const small = await decoded(await series(a.members.engineer.cookie, laps, "engine_rpm", "distance", width));
    const fp = at(full.meta.panes, 0);
    const sp = at(small.meta.panes, 0);
    expect(fp.decimated).toBe(false);
    expect(sp.decimated).toBe(true);
    const fx = at(full.arrays, fp.x);
    const sx = at(small.arrays, sp.x);
    expect(sx.length).toBeLessThan(fx.length);
    expect(sx.length).toBeLessThanOrEqual(2 * (3 * width + 2));
    const x0 = at(fx, 0);
    const perX = width / (at(fx, fx.length - 1) - x0);
    const col = (xv: number) => Math.min(width - 1, Math.floor((xv - x0) * perX));
    for (let s = 0; s < 2; s++) {
      const fy = at(full.arrays, fp.series[s]!);
      const sy = at(small.arrays, sp.series[s]!);
      const fMin = new Float64Array(width).fill(Infinity), fMax = new Float64Array(width).fill(-Infinity);
      const sMin = new Float64Array(width).fill(Infinity), sMax = new Float64Array(width).fill(-Infinity);
      for (let i = 0; i < fx.length; i++) if (Number.isFinite(at(fy, i))) { const c = col(at(fx, i)); fMin[c] = Math.min(at(fMin, c), at(fy, i)); fMax[c] = Math.max(at(fMax, c), at(fy, i)); }
      for (let i = 0; i < sx.length; i++) if (Number.isFinite(at(sy, i))) { const c = col(at(sx, i)); sMin[c] = Math.min(at(sMin, c), at(sy, i)); sMax[c] = Math.max(at(sMax, c), at(sy, i)); }
      expect(Array.from(sMin)).toEqual(Array.from(fMin));
      expect(Array.from(sMax)).toEqual(Array.from(fMax));
    }
  });
});

describe("heavy requests, windows, corners and sectors", () => {
  const two = () => `${riderSession}:${at(flying, 0).number},${riderSession}:${at(flying, 1).number}`;

  it("the same lap asked twice is compared once, in first-mention order", async () => {
    const { meta } = await decoded(await series(a.members.engineer.cookie, `${riderSession}:${at(flying, 1).number},${riderSession}:${at(flying, 0).number},${riderSession}:${at(flying, 1).number}`, "speed_front"));
    expect(meta.laps.map((l) => l.lap)).toEqual([at(flying, 1).number, at(flying, 0).number]);
    expect(at(meta.panes, 0).series).toHaveLength(2);
  });

  it("answers 413 with a clear message above the samples-read cap and above the grid-points cap", async () => {
    const saved = { ...SERIES_LIMITS };
    try {
      // One 20 Hz flying lap of ~90 s with 2 channels is a few thousand samples: a cap of 1000 refuses it.
      SERIES_LIMITS.maxSamplesRead = 1000;
      const res = await series(a.members.engineer.cookie, two(), "speed_front,throttle");
      expect(res.status).toBe(413);
      expect((await res.json()).error).toMatch(/would read about [\d,]+ samples; the limit is 1,000/);
      SERIES_LIMITS.maxSamplesRead = saved.maxSamplesRead;
      // By time at 20 Hz a ~90 s lap is ~1800 grid points; by distance ~ the lap length in metres.
      SERIES_LIMITS.maxGridPoints = 500;
      const byTime = await series(a.members.engineer.cookie, two(), "speed_front", "time");
      expect(byTime.status).toBe(413);
      expect((await byTime.json()).error).toMatch(/grid points; the limit is 500/);
    } finally {
      Object.assign(SERIES_LIMITS, saved);
    }
    expect((await series(a.members.engineer.cookie, two(), "speed_front")).status).toBe(200);
  });

  it("a window returns only that stretch, at full resolution, with the same values as the whole lap", async () => {
    const whole = await decoded(await series(a.members.engineer.cookie, two(), "speed_front", "distance", 10_000));
    const res = await seriesRoute.GET(req(`${seriesUrl(two(), "speed_front", "distance", 300)}&from=1000&to=1400`, a.members.engineer.cookie), params({}));
    const part = await decoded(res);
    expect(part.meta.window).toEqual([1000, 1400]);
    expect(at(part.meta.fullX, 1)).toBeCloseTo(at(whole.meta.laps, 0).lengthM, 6);
    const p = at(part.meta.panes, 0);
    const xs = at(part.arrays, p.x);
    // 401 points at 1 m and 300 px: below four points per column, so nothing is thinned.
    expect(p.decimated).toBe(false);
    expect(xs.length).toBe(401);
    const wx = at(whole.arrays, at(whole.meta.panes, 0).x);
    for (const k of [0, 123, 400]) {
      const g = Array.from(wx).indexOf(at(xs, k));
      expect(g).toBeGreaterThan(0);
      for (let s = 0; s < 2; s++) expect(at(part.arrays, p.series[s]!)[k]).toBe(at(whole.arrays, at(whole.meta.panes, 0).series[s]!)[g]);
      expect(at(part.arrays, part.meta.gap!.series[1]!)[k]).toBe(at(whole.arrays, whole.meta.gap!.series[1]!)[g]);
    }
    const bad = await seriesRoute.GET(req(`${seriesUrl(two(), "speed_front")}&from=500`, a.members.engineer.cookie), params({}));
    expect(bad.status).toBe(422);
  });

  it("the x axis carries the track's named corners and the reference lap's sector bands", async () => {
    const { meta } = await decoded(await series(a.members.engineer.cookie, two(), "speed_front,brake_front"));
    expect(meta.cornerSource).toBe("track");
    expect(meta.corners.map((c) => c.name)).toEqual(CIRCUIT.corners.map((c) => c.name));
    for (const [k, c] of meta.corners.entries()) {
      expect(c.x).toBeCloseTo(at(CIRCUIT.corners, k).apexDistanceM, 6);
      expect(c.fromX).toBeLessThan(c.x);
      expect(c.toX).toBeGreaterThan(c.x);
    }
    // Sector bands: one per sector time, end to end over the lap, each as long as the ground truth's
    // sector distance is not known, so check they tile the lap and follow the sector times.
    const ref = (await Lap.findOne({ where: { sessionId: riderSession, number: at(flying, 0).number } }))!;
    const times = (ref.sectorTimesMs as number[] | null) ?? [];
    if (times.length > 1) {
      expect(meta.sectors).toHaveLength(times.length);
      expect(at(meta.sectors, 0).fromX).toBe(0);
      expect(meta.sectors.at(-1)!.toX).toBeCloseTo(at(meta.laps, 0).lengthM, 6);
      for (let i = 1; i < meta.sectors.length; i++) expect(at(meta.sectors, i).fromX).toBe(at(meta.sectors, i - 1).toX);
    }
  });

  it("corner figures: the reference gains nothing, the time gained over all corners is the lap-time difference", async () => {
    const { meta } = await decoded(await series(a.members.engineer.cookie, two(), "speed_front,brake_front"));
    const sum = meta.corners.reduce((n, c) => n + c.laps[1]!.gainedS, 0);
    // The corner stretches tile the lap, so their gains add up to time(A) − time(B) at the line.
    expect(sum).toBeCloseTo((at(flying, 0).lapTimeMs - at(flying, 1).lapTimeMs) / 1000, 3);
    for (const c of meta.corners) {
      expect(c.laps[0]!.gainedS).toBe(0);
      const l = c.laps[1]!;
      expect(l.minSpeedMps).toBeLessThanOrEqual(Math.min(l.entrySpeedMps, l.exitSpeedMps) + 1e-6);
      expect(l.apexM).toBeGreaterThanOrEqual(c.fromM);
      expect(l.apexM).toBeLessThanOrEqual(c.toM);
    }
    // The generator brakes before its slow corners (common practice on any circuit): some corner has a braking point before its apex.
    expect(meta.corners.some((c) => c.laps[0]!.brakingPointM != null && c.laps[0]!.brakingPointM < c.laps[0]!.apexM)).toBe(true);
  });

  it("a cached lap answers the same bytes, and re-analysis raises the session's analysis version", async () => {
    clearLapSeriesCaches();
    const first = new Uint8Array(await (await series(a.members.engineer.cookie, two(), "speed_front,throttle")).arrayBuffer());
    const again = new Uint8Array(await (await series(a.members.engineer.cookie, two(), "speed_front,throttle")).arrayBuffer());
    expect(Buffer.compare(Buffer.from(first), Buffer.from(again))).toBe(0);
    const version = async () => Number(at((await getSequelize().query<{ v: number }>("SELECT analysis_version AS v FROM ride_sessions WHERE id = ?", { replacements: [riderSession], type: QueryTypes.SELECT })), 0).v);
    const before = await version();
    if (!lapsFromTruth) {
      await reanalyseSession(getSequelize(), riderSession);
      expect(await version()).toBe(before + 1);
    } else expect(before).toBeGreaterThanOrEqual(1);
  });
});

describe("exports", () => {
  it("the lap table CSV has one row per lap and neutralises a formula-looking session title", async () => {
    await RideSession.update({ title: '=HYPERLINK("http://example.com","x")' }, { where: { id: riderSession } });
    const res = await csvRoute.GET(req(`/api/sessions/${riderSession}/laps.csv`, a.members.rider.cookie), params({ id: String(riderSession) }));
    await RideSession.update({ title: "FP1 own" }, { where: { id: riderSession } });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename="[A-Za-z0-9._-]+\.csv"/);
    const parsed = Papa.parse<string[]>(await res.text(), { skipEmptyLines: true });
    expect(parsed.data.length).toBe(TRUTH.laps.length + 1);
    expect(at(parsed.data, 0)[0]).toBe("Session");
    // OWASP CSV injection guidance: a leading quote makes the spreadsheet read it as text.
    for (const row of parsed.data.slice(1)) expect(row[0]).toBe(`'=HYPERLINK("http://example.com","x")`);
    expect(at(parsed.data, 2)[2]).toMatch(/^1:2\d\.\d{3}$/);
  });

  it("the CSV of another rider's unshared session is a 404 for a rider, and of another team for everyone", async () => {
    expect((await csvRoute.GET(req(`/api/sessions/${otherSession}/laps.csv`, a.members.rider.cookie), params({ id: String(otherSession) }))).status).toBe(404);
    expect((await csvRoute.GET(req(`/api/sessions/${riderSession}/laps.csv`, b.members.owner.cookie), params({ id: String(riderSession) }))).status).toBe(404);
    expect((await csvRoute.GET(req(`/api/sessions/${riderSession}/laps.csv`), params({ id: String(riderSession) }))).status).toBe(401);
  });

  it("a lap as GPX validates as XML and holds the lap's 20 Hz fixes, in time order, inside the lap", async () => {
    const lap = at(flying, 0);
    const res = await gpxRoute.GET(req(`/api/sessions/${riderSession}/laps/${lap.number}/gpx`, a.members.viewer.cookie), params({ id: String(riderSession), lap: String(lap.number) }));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^application\/gpx\+xml/);
    const text = await res.text();
    expect(XMLValidator.validate(text)).toBe(true);
    const doc = new XMLParser({ ignoreAttributes: false }).parse(text);
    expect(doc.gpx["@_version"]).toBe("1.1");
    const pts = doc.gpx.trk.trkseg.trkpt as { "@_lat": string; time: string }[];
    const expected = ((lap.endTimeS - lap.startTimeS) * 20);
    expect(Math.abs(pts.length - expected)).toBeLessThanOrEqual(2);
    const times = pts.map((p) => Date.parse(p.time));
    for (let i = 1; i < times.length; i++) expect(at(times, i)).toBeGreaterThan(at(times, i - 1));
    // Session time 0 is the log's start, or the upload time when the log names none.
    const row = (await RideSession.findByPk(riderSession))!;
    const started = (row.startedAt ?? row.createdAt).getTime();
    expect(at(times, 0)).toBeGreaterThanOrEqual(started + lap.startTimeS * 1000 - 1);
    expect(at(times, times.length - 1)).toBeLessThanOrEqual(started + lap.endTimeS * 1000 + 1);
  });

  it("GPX of an unknown lap is a 404; of another team's session a 404", async () => {
    expect((await gpxRoute.GET(req(`/api/sessions/${riderSession}/laps/999/gpx`, a.members.owner.cookie), params({ id: String(riderSession), lap: "999" }))).status).toBe(404);
    expect((await gpxRoute.GET(req(`/api/sessions/${riderSession}/laps/2/gpx`, b.members.engineer.cookie), params({ id: String(riderSession), lap: "2" }))).status).toBe(404);
  });
});
