/**
 * A small team history written straight into the real MariaDB for the team-record tests: two
 * riders (one linked to the team's rider user), two bikes, one engine, one track, two events and
 * sessions with laps, findings and setup versions. Lap times are chosen by the test.
 */
import { initModels, Bike, Engine, Finding, Lap, RaceEvent, RideSession, Rider, SetupSheet, Track } from "@/models";
import type { TestTeam } from "./teams";
import { at } from "../../fixtures/at";

export interface WorldSession {
  title: string;
  event: "a" | "b" | null;
  rider: "own" | "other";
  bike: "one" | "two";
  startedAt: string;
  lapsMs: number[];
  /** Per lap sector times (same length as lapsMs), optional. */
  sectorsMs?: number[][];
  topSpeedsMs?: number[];
  conditions?: string;
  findings?: { open: number; acknowledged: number };
  setup?: Record<string, number | string | null>[];
}

export interface World {
  riders: { own: Rider; other: Rider };
  bikes: { one: Bike; two: Bike };
  engine: Engine;
  track: Track;
  events: { a: RaceEvent; b: RaceEvent };
  sessions: Record<string, number>;
}

export async function buildWorld(team: TestTeam, sessions: WorldSession[]): Promise<World> {
  initModels();
  const teamId = team.teamId;
  const own = await Rider.create({ teamId, name: "Wren Tallis", raceNumber: "11", userId: team.members.rider.userId });
  const other = await Rider.create({ teamId, name: "Odo Marsh", raceNumber: "12", userId: null });
  const one = await Bike.create({ teamId, name: "Bike 11", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: 14200, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null });
  const two = await Bike.create({ teamId, name: "Bike 12", className: null, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null, sprocketFront: null, sprocketRear: null, revCeilingRpm: 14200, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, calibrations: null, thresholds: null });
  const engine = await Engine.create({ teamId, bikeId: one.id, serial: `E-${Math.random().toString(36).slice(2, 8)}`, rebuildIntervalH: 10, rebuildIntervalKm: 2000, notes: null });
  const track = await Track.create({ teamId, name: "Harrow Fen Raceway", centerLat: null, centerLon: null, lengthM: 4000, gates: null, corners: null, outline: null, pitSpeedLimitKmh: 60, thresholds: null });
  const a = await RaceEvent.create({ teamId, trackId: track.id, name: "Round 1", startsOn: "2031-04-05", endsOn: "2031-04-06" });
  const b = await RaceEvent.create({ teamId, trackId: track.id, name: "Round 2", startsOn: "2031-06-14", endsOn: "2031-06-15" });
  const ids: Record<string, number> = {};
  for (const s of sessions) {
    const row = await RideSession.create({
      teamId, eventId: s.event ? (s.event === "a" ? a : b).id : null, bikeId: (s.bike === "one" ? one : two).id, engineId: s.bike === "one" ? engine.id : null,
      riderId: (s.rider === "own" ? own : other).id, trackId: track.id, logFileId: null, importProfileId: null, title: s.title, startedAt: new Date(s.startedAt),
      conditions: s.conditions ?? null, status: "ready", statusReason: null, mapping: null, summary: null, durationS: 600, createdBy: null,
    });
    ids[s.title] = row.id;
    let t = 0;
    for (let i = 0; i < s.lapsMs.length; i++) {
      await Lap.create({ sessionId: row.id, number: i + 1, startTimeS: t, endTimeS: t + at(s.lapsMs, i) / 1000, lapTimeMs: at(s.lapsMs, i), distanceM: 4000, sectorTimesMs: s.sectorsMs?.[i] ?? null, topSpeedMps: s.topSpeedsMs?.[i] ?? null, stats: null });
      t += at(s.lapsMs, i) / 1000;
    }
    for (let i = 0; i < (s.findings?.open ?? 0) + (s.findings?.acknowledged ?? 0); i++) {
      const ack = i >= (s.findings?.open ?? 0);
      await Finding.create({ teamId, sessionId: row.id, kind: "rev_ceiling", lapNumber: 1, startTimeS: 1, endTimeS: 2, distanceM: 10, lat: null, lon: null, measuredValue: 14300, thresholdValue: 14200, unit: "rpm", message: "Rev ceiling touched", acknowledgedBy: ack ? team.members.engineer.userId : null, acknowledgedAt: ack ? new Date() : null, note: null });
    }
    let v = 0;
    for (const fields of s.setup ?? []) {
      v++;
      await SetupSheet.create({ teamId, sessionId: row.id, bikeId: (s.bike === "one" ? one : two).id, version: v, fields, createdBy: team.members.engineer.userId });
    }
  }
  return { riders: { own, other }, bikes: { one, two }, engine, track, events: { a, b }, sessions: ids };
}
