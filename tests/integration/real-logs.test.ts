/**
 * Every openly licensed real recording in ../shared/real-logs/ through the real upload path
 * (SDK → local upload service → our route → import → worker), as an engineer would send it.
 * None was recorded on a race bike: these check that real receivers' and loggers' faults are read
 * or refused honestly — each file ends ready, or failed with a specific reason, and nothing partial
 * is kept. Expected values come from the real-logs README's measured facts (named beside each).
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import path from "node:path";
import zlib from "node:zlib";
import { getSequelize } from "@/models/db";
import { initModels, RideSession, Finding } from "@/models";
import { claimJob, finishJob, failJob } from "@/lib/data/jobs";
import { confirmMapping, heldDuplicate, resolveDuplicate } from "@/lib/data/imports";
import { listChannels } from "@/lib/data/samples";
import { loadSessionSeries } from "@/lib/data/session-series";
import { runIngestJob } from "@/workers/ingest/run-ingest-job";
import type { Mapping } from "@/lib/ingest/mapping";
import { driveSlip } from "@/lib/slip/drive-slip";
import { haversineM } from "@/lib/geo/haversine-m";
import { createTeamWithRoles, type TestTeam } from "./helpers/teams";
import { startUploadHarness, type UploadHarness } from "./helpers/ingest-harness";
import { at } from "../fixtures/at";

const ROOT = path.resolve(__dirname, "../../../shared/real-logs");

let team: TestTeam;
let up: UploadHarness;

beforeAll(async () => {
  initModels();
  team = await createTeamWithRoles("Real logs team");
  up = await startUploadHarness();
});
afterAll(async () => {
  await up?.close();
});

interface Outcome {
  sessionId: number;
  status: string;
  reason: string | null;
  summary: Record<string, unknown>;
}

/** Upload bytes as `name`; `map` lets the test act as the person on the mapping screen. */
async function importFile(name: string, bytes: Buffer, map?: (m: Mapping) => Mapping): Promise<Outcome> {
  const { sessionId } = await up.upload(new File([new Uint8Array(bytes)], name), team.members.engineer.cookie);
  let s = await RideSession.findByPk(sessionId);
  // The "…again" checks read a file the loop above already imported: import it again on purpose.
  if (s && heldDuplicate(s)) {
    await resolveDuplicate(getSequelize(), team.teamId, sessionId, "import");
    s = await RideSession.findByPk(sessionId);
  }
  if (s?.status === "mapping") {
    const m = s.mapping as Mapping;
    await confirmMapping(getSequelize(), team.teamId, sessionId, map ? map(m) : m, `Real ${name}`);
    s = await RideSession.findByPk(sessionId);
  }
  if (s?.status === "queued") {
    const job = await claimJob(getSequelize(), `real-logs-${sessionId}`, { sessionId });
    const r = await runIngestJob(getSequelize(), sessionId);
    if (r === "ready") await finishJob(getSequelize(), job!.id);
    else await failJob(getSequelize(), job!.id, "bad input");
    s = await RideSession.findByPk(sessionId);
  }
  const out = { sessionId, status: s!.status, reason: s!.statusReason, summary: (s!.summary ?? {}) as Record<string, unknown> };
  const a = out.summary as { lapCount?: number; distanceM?: number | null; findingCounts?: object; importNotes?: string[] };
  console.log(
    `[real-logs] ${name}: ${out.status}` +
      (out.status === "ready" ? ` — distance ${a.distanceM == null ? "none" : `${(a.distanceM / 1000).toFixed(2)} km`}, findings ${JSON.stringify(a.findingCounts ?? {})}${a.importNotes?.length ? `, notes: ${a.importNotes.join(" ")}` : ""}` : ` — ${out.reason}`),
  );
  if (out.status === "failed") expect(await listChannels(getSequelize(), sessionId)).toEqual([]); // nothing partial kept
  return out;
}

const read = (...p: string[]) => fs.readFileSync(path.join(ROOT, ...p));

/** Every recording file (licence texts and the README are not recordings). */
function recordings(dir: string): string[] {
  return fs
    .readdirSync(path.join(ROOT, dir))
    .filter((f) => !/^(LICENSE|COPYING|README)/.test(f))
    .sort();
}

/** Files whose failure is the honest outcome, with the reason a person reads. */
const EXPECTED_FAILURES: Record<string, RegExp> = {
  // GENIVI's own log format ($GV… sentences without checksums), not NMEA 0183 as a receiver writes it.
  "car-city-short.nmea": /^None of the 905 sentences in "car-city-short\.nmea" is a readable NMEA 0183 sentence \(905 without a checksum\), first at line 3\. Most are \$GVGNSP, .*none is an RMC or GGA position sentence: this looks like another logging format/,
  // Every fix of these captures uses 3 satellites (GGA field 7): too few for a full fix (four unknowns).
  "mtk-3301.log": /no GPS fix good enough to use: all 4 fixes are poor \(4 with fewer than 4 satellites\)/,
  "rgm3800.log": /no GPS fix good enough to use: all 2 fixes are poor \(2 with fewer than 4 satellites\)/,
  // Void-only captures (README): the receiver never had a fix.
  "GPSmap-76S.log": /no GPS fix/,
  "ublox-lea-5q.log": /no GPS fix/,
  "skytraq.log": /no GPS fix/,
  // One waypoint and no track (README: a BOM and non-ASCII names).
  "unicode_with_bom.gpx": /no track points.*1 waypoints/,
};

describe("real recorded logs through the upload path", () => {
  it.each([...recordings("nmea").map((f) => ["nmea", f]), ...recordings("gpsd-captures").map((f) => ["gpsd-captures", f]), ...recordings("gpx").map((f) => ["gpx", f])])(
    "%s/%s ends ready or failed with a specific reason",
    async (dir, file) => {
      const o = await importFile(file, read(dir, file));
      const expected = EXPECTED_FAILURES[file];
      if (expected) {
        expect(o.status).toBe("failed");
        expect(o.reason).toMatch(expected);
      } else {
        expect(o.status, `${file}: ${o.reason}`).toBe("ready");
        const s = await RideSession.findByPk(o.sessionId);
        // Dates: no session from the wrong decade (cold-start 1980 / rollover 1999 dates).
        if (s?.startedAt) expect(s.startedAt.getUTCFullYear()).toBeGreaterThanOrEqual(2000);
      }
    },
    120_000,
  );

  it("the 3 h car log: restarts and NUL bytes skipped, about 242 km from valid fixes", async () => {
    const o = await importFile("car-3h-again.nmea", read("nmea", "car-3h-1hz-receiver-restarts.nmea"));
    expect(o.status).toBe("ready");
    // README: "covers about 242 km (sum of fix-to-fix distances over valid fixes)".
    const km = (o.summary.distanceM as number) / 1000;
    expect(km).toBeGreaterThan(242 * 0.98);
    expect(km).toBeLessThan(242 * 1.02);
    expect((o.summary.importNotes as string[]).join(" ")).toMatch(/zero bytes dropped/);
    // Its GGA sentences (counted with awk over the file): 3 fixes with fewer than 4 satellites, 1 with HDOP
    // above 5, and epochs the receiver dead-reckoned (GGA quality 6, 0 satellites) while RMC said valid.
    expect((o.summary.importNotes as string[]).join(" ")).toMatch(/\d+ poor GPS fixes dropped: 3 with fewer than 4 satellites, 1 with HDOP above 5, \d+ marked by GGA as dead reckoning/);
  }, 300_000);

  it("a capture with high-HDOP fixes: they are dropped and counted", async () => {
    // geos-1m.log: of its 7 GGA fixes, 4 have HDOP 8.3 (the file's field 8).
    const o = await importFile("geos-1m-again.log", read("gpsd-captures", "geos-1m.log"));
    expect(o.status, String(o.reason)).toBe("ready");
    expect((o.summary.importNotes as string[]).join(" ")).toMatch(/4 with HDOP above 5/);
  });

  it("NMEA with spliced, truncated and bad-checksum sentences: skipped and counted on the session", async () => {
    // gpsd capture notes (README): spliced sentences in isync/triton400, truncated ones with bad checksums in the cold-boot capture.
    const o = await importFile("gp-320fw-again.log", read("gpsd-captures", "gp-320fw-2019-04-07-coldboot.log"));
    expect(o.status).toBe("ready");
    const notes = (o.summary.importNotes as string[]).join(" ");
    expect(notes).toMatch(/^\d+ sentences skipped: \d+ bad checksum, \d+ truncated/);
    // The capture is named for 2019-04-07; its receiver reports 1999 (1024 weeks early) and other cold-start dates.
    const s = await RideSession.findByPk(o.sessionId);
    expect(s!.startedAt!.toISOString().slice(0, 10)).toBe("2019-04-07");
  });

  it("mixed talkers: the handheld's $GP sentences are read among other talkers' lines", async () => {
    const o = await importFile("handheld-again.nmea", read("nmea", "handheld-2s-mixed-talkers.nmea"));
    expect(o.status).toBe("ready");
    const { series } = await loadSessionSeries(getSequelize(), o.sessionId, ["gps_lat"]);
    expect(series.timeS.length).toBeGreaterThanOrEqual(2);
  });

  it("the GPX car loop closes within about 30 m (README: ends about 26 m from its start)", async () => {
    const o = await importFile("visnjan-again.gpx", read("gpx", "around-visnjan-with-car.gpx"));
    expect(o.status).toBe("ready");
    const { series: s } = await loadSessionSeries(getSequelize(), o.sessionId, ["gps_lat", "gps_lon"]);
    const lat = s.channels.gps_lat!;
    const lon = s.channels.gps_lon!;
    const n = lat.length;
    const gap = haversineM(at(lat, 0), at(lon, 0), at(lat, n - 1), at(lon, n - 1));
    expect(gap).toBeGreaterThan(20);
    expect(gap).toBeLessThan(30);
  });

  it("the wheel-speed segment: slip median near 0, no sustained spin finding", async () => {
    // The person maps one wheel per axle (a role is used once): front left and rear left.
    const o = await importFile("car-60s-wheel-speeds-83hz.csv", read("vehicle-csv", "car-60s-wheel-speeds-83hz.csv"), (m) => ({
      ...m,
      columns: m.columns.map((c) => ({
        ...c,
        role: c.index === 0 ? "time" : c.index === 1 ? "speed_front" : c.index === 3 ? "speed_rear" : "other",
        unit: c.index === 0 ? "s" : "m/s",
        scale: 1,
        offset: 0,
      })),
    }));
    expect(o.status, String(o.reason)).toBe("ready");
    const { series: s } = await loadSessionSeries(getSequelize(), o.sessionId, ["speed_front", "speed_rear"]);
    const slip = Array.from(driveSlip(s)).filter(Number.isFinite).sort((a, b) => a - b);
    expect(slip.length).toBeGreaterThan(1000);
    // README: median of |rear/front − 1| over the segment is 0.21 %; one wheel per axle adds its own
    // rolling-radius offset, which the automatic zero takes out.
    expect(Math.abs(at(slip, slip.length >> 1))).toBeLessThan(0.005);
    expect(await Finding.count({ where: { sessionId: o.sessionId, kind: "wheel_spin" } })).toBe(0);
  }, 120_000);

  it("the vehicle CSV packed as .gz is refused at upload with what to do", async () => {
    const bytes = read("vehicle-csv", "city-drives-1hz-28-drives.csv.gz");
    await expect(up.upload(new File([new Uint8Array(bytes)], "city-drives-1hz-28-drives.csv.gz"), team.members.engineer.cookie)).rejects.toThrow(/not a log file Lapbench can read: use \.csv/);
  });

  it("the vehicle CSV unpacked: NA is empty, the date-time column is time, 28 drives reported", async () => {
    const bytes = zlib.gunzipSync(read("vehicle-csv", "city-drives-1hz-28-drives.csv.gz"));
    // The person fills in what the header does not say: elevation in m, acceleration in g, speed in mph.
    const o = await importFile("city-drives-1hz-28-drives.csv", bytes, (m) => {
      const time = m.columns.find((c) => c.role === "time");
      expect(time?.name).toBe("time_utc"); // the date-time column is suggested as time
      expect(m.timeFormat).toBe("iso8601");
      return {
        ...m,
        columns: m.columns.map((c) =>
          c.role === "gps_alt" ? { ...c, unit: "m" } : c.role === "accel_long" || c.role === "accel_lat" ? { ...c, unit: "g" } : c.name === "speed_mph" ? { ...c, role: "gps_speed", unit: "mph" } : c,
        ),
      };
    });
    expect(o.status, String(o.reason)).toBe("ready");
    const s = await RideSession.findByPk(o.sessionId);
    // First row's time_utc is 2019-05-23 20:54:11 (the file).
    expect(s!.startedAt!.toISOString()).toBe("2019-05-23T20:54:11.000Z");
    const channels = (await listChannels(getSequelize(), o.sessionId)).map((c) => c.name);
    expect(channels).not.toContain("speed_source");
    expect(channels).toContain("engine_rpm");
    const notes = ((o.summary.importNotes as string[] | undefined) ?? []).join(" ");
    // README: 28 real drives in one upload.
    expect(notes).toMatch(/28 separate runs/);
    expect(notes).toMatch(/'speed_source' \(e\.g\. 'gps'\)/);
    expect(notes).toMatch(/cells written NA were read as empty/);
  }, 300_000);
});
