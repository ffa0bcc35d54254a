/**
 * A real logger's faults on our own generator's log (invented data, sample-logs/): a dead front
 * wheel sensor, a GPS gap at the start/finish line, a missed pit-exit crossing, (0, 0) fixes and a
 * GPS path far off the wheel distance. Expected values come from the generator's ground truth.
 */
import { beforeAll, describe, expect, it } from "vitest";
import type { SessionSeries } from "@/lib/channels/roles";
import { generateSession, type GeneratedSession } from "@/sample-logs/generate-session";
import { analyseSeries, pitLaneTimes } from "@/lib/analysis/analyse-series";
import { distanceChannel, MAX_RESCALE } from "@/lib/laps/distance-channel";
import { extractFixes, validFix } from "@/lib/laps/extract-fixes";
import { markSuspectLaps } from "@/lib/laps/mark-suspect-laps";
import { runFindings } from "@/lib/findings/run-findings";
import { trackGatesForAnalysis } from "@/lib/data/tracks";
import { demoTrackInput } from "@/workers/demo-track";
import type { Lap, TrackGates } from "@/lib/laps/types";
import { at as elementAt } from "../../fixtures/at";

function seriesOf(g: GeneratedSession): SessionSeries {
  const channels: Record<string, Float32Array | Float64Array> = {};
  for (const c of g.channels) {
    if (c.role === "time" || c.role === "other" || c.role in channels) continue;
    channels[c.role] = c.role === "gps_lat" || c.role === "gps_lon" ? Float64Array.from(c.data as ArrayLike<number>) : Float32Array.from(c.data as ArrayLike<number>);
  }
  return { timeS: g.timeS, channels: channels as SessionSeries["channels"] };
}

let g: GeneratedSession;
let gates: TrackGates;
beforeAll(() => {
  g = generateSession({ seed: 7, flyingLaps: 4, brakeOnStraightLaps: [], revCeilingLap: null, pitOverspeed: "in" });
  const t = demoTrackInput();
  gates = trackGatesForAnalysis({ gates: t.gates, lengthM: t.lengthM, thresholds: null })!;
});

describe("a dead front wheel sensor (reads 0 while GPS says the bike moves)", () => {
  it("is one finding; distance, ground speed, GPS-jump and pit-overspeed checks fall back to GPS / the rear wheel", () => {
    const good = seriesOf(g);
    const dead = seriesOf(g);
    dead.channels.speed_front!.fill(0);

    const dGood = distanceChannel(good, []);
    const dDead = distanceChannel(dead, []);
    expect(dDead.source).toBe("gps");
    const n = good.timeS.length;
    // The GPS path length of the session is within 1 % of the wheel distance (the generator's laps
    // are ~4.2 km with 0.3 m GPS noise); before the fallback it was 0.
    expect(elementAt(dDead.distanceM, n - 1) / elementAt(dGood.distanceM, n - 1)).toBeGreaterThan(0.99);
    expect(elementAt(dDead.distanceM, n - 1) / elementAt(dGood.distanceM, n - 1)).toBeLessThan(1.01);

    const pit = g.truth.pitLane.map((p) => ({ startTimeS: p.fromS, endTimeS: p.toS }));
    const ctx = { laps: g.truth.laps.map((l) => ({ number: l.number, startTimeS: l.startS, endTimeS: l.endS })), track: { pitLaneTimes: pit, pitSpeedLimitMps: g.truth.pitLaneLimitMps } };
    const fGood = runFindings(good, ctx);
    const fDead = runFindings(dead, ctx);
    const flat = fDead.filter((f) => f.kind === "sensor_flat" && f.channel === "speed_front");
    expect(flat).toHaveLength(1);
    expect(elementAt(flat, 0).message).toMatch(/Front wheel speed reads 0 km\/h .* GPS says the bike moved/);
    // No GPS step turns into a "jump" because the front reads 0.
    expect(fDead.filter((f) => f.kind === "gps_jump").length).toBe(fGood.filter((f) => f.kind === "gps_jump").length);
    // Pit overspeed (planted on the in-lap, generator truth) is still found from the rear wheel.
    const planted = g.truth.events.filter((e) => e.kind === "pit_overspeed");
    expect(planted.length).toBeGreaterThan(0);
    expect(fDead.filter((f) => f.kind === "pit_overspeed").length).toBe(planted.length);
  });
});

describe("a GPS gap at the start/finish line", () => {
  it("the merged double lap is suspect and kept out of the best lap; the note says why", () => {
    const s = seriesOf(g);
    // Lose the fixes for 4 s around lap 2's end (generator truth: the line crossing at its end).
    const lap2 = g.truth.laps.find((l) => l.number === 2)!;
    const lat = s.channels.gps_lat!;
    const lon = s.channels.gps_lon!;
    for (let i = 0; i < s.timeS.length; i++) if (Math.abs(elementAt(s.timeS, i) - lap2.endS) < 2) lat[i] = lon[i] = NaN;
    const a = analyseSeries(s, { gates }, null);
    const long = a.laps.filter((l) => l.suspect);
    expect(long).toHaveLength(1);
    // Laps 2 and 3 of the truth merged: about their summed time.
    const lap3 = g.truth.laps.find((l) => l.number === 3)!;
    expect(elementAt(long, 0).lapTimeMs / 1000).toBeCloseTo(lap3.endS - lap2.startS, 0);
    expect(a.summary.bestLap!.lapTimeMs).toBeLessThan(elementAt(long, 0).lapTimeMs / 1.5);
    expect(a.summary.bestSectorLap?.sectors.every((x) => x.lapNumber !== elementAt(long, 0).number)).toBe(true);
    expect(a.summary.analysisNotes?.join(" ")).toMatch(/missed line crossing/);
  });

  it("markSuspectLaps: over 1.5 × the median flying lap", () => {
    const lap = (number: number, s: number): Lap => ({ number, startTimeS: 0, endTimeS: s, lapTimeMs: s * 1000, sectorTimesMs: [], outLap: false, inLap: false, pitPass: false, complete: true });
    const laps = [lap(1, 100), lap(2, 101), lap(3, 202), lap(4, 99), lap(5, 149)];
    // median 101 s → limit 151.5 s (arithmetic): only the 202 s lap.
    expect(markSuspectLaps(laps).map((l) => l.number)).toEqual([3]);
  });
});

describe("a missed pit-exit crossing", () => {
  it("does not keep the bike in the pit lane for a lap at racing speed", () => {
    // An invented circular track, radius 700 m around (45°N, 7°E), ridden anticlockwise twice at
    // 10 Hz: through the pit lane from 10° to 40° at 15 m/s (54 km/h), the rest at 60 m/s. Gates
    // are radial segments ±20 m across the path. The fixes for ±2 s around the first pit-exit
    // crossing are lost (a GPS gap at the gate).
    const R = 700;
    const M_PER_DEG = 6371008.8 * (Math.PI / 180); // IUGG mean sphere
    const lat0 = 45;
    const lon0 = 7;
    const at = (deg: number, r = R) => {
      const a = (deg * Math.PI) / 180;
      return { lat: lat0 + (r * Math.sin(a)) / M_PER_DEG, lon: lon0 + (r * Math.cos(a)) / (M_PER_DEG * Math.cos((lat0 * Math.PI) / 180)) };
    };
    // Anticlockwise travel: a gate forward when passing from its left (a) to right (b) side — a on the outside.
    const gate = (deg: number) => ({ a: at(deg, R + 20), b: at(deg, R - 20) });
    const times: number[] = [];
    const lats: number[] = [];
    const lons: number[] = [];
    let ang = 0;
    let t = 0;
    let exitTime = NaN;
    while (ang < 720) {
      const inPit = ang % 360 >= 10 && ang % 360 < 40;
      const v = inPit ? 15 : 60;
      if (Number.isNaN(exitTime) && ang >= 40) exitTime = t;
      times.push(t);
      const p = at(ang);
      lats.push(p.lat);
      lons.push(p.lon);
      ang += ((v * 0.1) / R) * (180 / Math.PI);
      t = Math.round((t + 0.1) * 10) / 10;
    }
    const n = times.length;
    const timeS = Float64Array.from(times);
    const lat = Float64Array.from(lats);
    const lon = Float64Array.from(lons);
    const speed = new Float32Array(n);
    for (let i = 0; i < n; i++) {
      const a = (((i === 0 ? 0 : 1) * 0 + ((Math.atan2((elementAt(lat, i) - lat0) * M_PER_DEG, (elementAt(lon, i) - lon0) * M_PER_DEG * Math.cos((lat0 * Math.PI) / 180)) * 180) / Math.PI)) + 360) % 360;
      speed[i] = a >= 10 && a < 40 ? 15 : 60;
      if (Math.abs(elementAt(timeS, i) - exitTime) < 2) lat[i] = lon[i] = NaN;
    }
    const series = { timeS, channels: { gps_lat: lat, gps_lon: lon, speed_front: speed } };
    const gates: TrackGates = { startFinish: gate(180), sectors: [], pitEntry: gate(10), pitExit: gate(40) };
    const ranges = pitLaneTimes(series, gates);
    // Before: entry of lap 1 → exit of lap 2, a whole lap at 216 km/h "in the pit lane".
    expect(ranges.length).toBeGreaterThan(0);
    expect(elementAt(ranges, 0).endTimeS).toBeLessThan(exitTime + 3);
    const f = runFindings(series, { track: { pitLaneTimes: ranges, pitSpeedLimitMps: 60 / 3.6 } });
    expect(f.filter((x) => x.kind === "pit_overspeed" && x.measuredValue > 150 / 3.6)).toHaveLength(0);
  });
});

describe("GPS sanity", () => {
  it("(0, 0) and out-of-range fixes are dropped everywhere", () => {
    expect(validFix(0, 0)).toBe(false);
    expect(validFix(91, 10)).toBe(false);
    expect(validFix(45, 181)).toBe(false);
    expect(validFix(45.1, 7.2)).toBe(true);
    const s = seriesOf(g);
    const before = extractFixes(s).timeS.length;
    const lat = s.channels.gps_lat!;
    const lon = s.channels.gps_lon!;
    let zeroed = 0;
    for (let i = 0; i < lat.length && zeroed < 5; i++) if (Number.isFinite(elementAt(lat, i)) && elementAt(s.timeS, i) > 200) {
      lat[i] = lon[i] = 0;
      zeroed++;
    }
    expect(extractFixes(s).timeS.length).toBe(before - 5);
    // No jump to the Gulf of Guinea and back.
    expect(runFindings(s, {}).filter((x) => x.kind === "gps_jump")).toHaveLength(0);
  });

  it("a per-lap rescale beyond ±5 % keeps the wheel distance and says why", () => {
    const s = seriesOf(g);
    const front = s.channels.speed_front!;
    // A wheel circumference entered 20 % too large: the wheel distance reads 20 % long.
    for (let i = 0; i < front.length; i++) front[i]! *= 1.2;
    const a = analyseSeries(s, { gates }, null);
    expect(MAX_RESCALE).toBe(0.05);
    const flying = a.laps.filter((l) => l.complete && !l.outLap && !l.inLap);
    // Kept: the wheel length, 1.2 × the truth's lap length (generator truth), not rescaled to GPS.
    for (const l of flying) expect(l.distanceM! / g.truth.trackLengthM).toBeCloseTo(1.2, 1);
    expect(a.summary.analysisNotes?.join(" ")).toMatch(/beyond ±5 %; the wheel distance is kept/);
  });
});
