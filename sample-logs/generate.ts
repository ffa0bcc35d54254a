/**
 * Writes the committed sample files into sample-logs/files/, or one big benchmark CSV.
 *
 *   npx tsx sample-logs/generate.ts [--out dir]
 *   npx tsx sample-logs/generate.ts --big 50MB [--file /tmp/lapbench-big-50MB.csv]
 */
import { mkdirSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { DEMO_ROSTER } from "./demo-roster";
import { RIDERS, generateSession, type GeneratedSession, type SessionOptions } from "./generate-session";
import { type CsvOptions, csvChunks, gpxChunks, nmeaChunks, toCsvString, truthDocument, writeChunks } from "./write-formats";

function arg(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

function parseMegabytes(s: string): number {
  const m = /^(\d+(?:\.\d+)?)\s*(MB|M)?$/i.exec(s.trim());
  if (!m) throw new Error(`--big expects a size such as 50MB, got "${s}"`);
  return Number(m[1]);
}

const THREE_LAPS: Partial<SessionOptions> = {
  seed: 7,
  flyingLaps: 3,
  rider: RIDERS.a,
  startedAt: "2031-05-17T10:02:00.000Z",
  brakeOnStraightLaps: [2],
  revCeilingLap: 3,
  pitOverspeed: "in",
};

async function writeSet(dir: string, base: string, session: GeneratedSession, csv: Partial<CsvOptions> = {}): Promise<void> {
  const bytes = await writeChunks(path.join(dir, `${base}.csv`), csvChunks(session, csv));
  writeFileSync(path.join(dir, `${base}.truth.json`), JSON.stringify(truthDocument(session, `${base}.csv`), null, 2) + "\n");
  console.log(`${base}.csv  ${(bytes / 1e6).toFixed(2)} MB, ${session.timeS.length} rows, ${session.truth.laps.length} laps`);
}

async function writeCommitted(dir: string): Promise<void> {
  mkdirSync(dir, { recursive: true });
  await writeSet(dir, "three-laps-20hz", generateSession({ ...THREE_LAPS, gpsRateHz: 20 }));
  const tenHz = generateSession({ ...THREE_LAPS, gpsRateHz: 10 });
  await writeSet(dir, "three-laps-10hz", tenHz);
  const gpx = await writeChunks(path.join(dir, "three-laps.gpx"), gpxChunks(tenHz));
  const nmea = await writeChunks(path.join(dir, "three-laps.nmea"), nmeaChunks(tenHz));
  writeFileSync(path.join(dir, "three-laps.gps.truth.json"), JSON.stringify(truthDocument(tenHz, "three-laps.gpx, three-laps.nmea", { gpsOnly: true }), null, 2) + "\n");
  console.log(`three-laps.gpx ${(gpx / 1e6).toFixed(2)} MB, three-laps.nmea ${(nmea / 1e6).toFixed(2)} MB (GPS 10 Hz)`);
  await writeSet(
    dir,
    "demo-session-20min",
    generateSession({
      seed: 11, flyingLaps: 12, rider: RIDERS.a, sampleRateHz: 100, gpsRateHz: 20, startedAt: "2031-05-17T14:30:00.000Z",
      brakeOnStraightLaps: [4, 9], revCeilingLap: 7, pitOverspeed: "out",
    }),
  );
  await writeSet(
    dir,
    "demo-session-10min-rider-b",
    generateSession({
      seed: 12, flyingLaps: 5, rider: RIDERS.b, sampleRateHz: 50, gpsRateHz: 25, startedAt: "2031-05-17T14:55:00.000Z",
      bike: DEMO_ROSTER.bikes.b.name, brakeOnStraightLaps: [3], revCeilingLap: null, pitOverspeed: null,
    }),
    // A second dialect for the importer: ';' with decimal comma, time in milliseconds, 50 Hz.
    { delimiter: ";", decimalComma: true, time: "ms" },
  );
}

/** A long 40-channel 100 Hz file sized to the request, streamed to disk (not committed). */
async function writeBig(megabytes: number, file: string): Promise<void> {
  const probe = generateSession({ flyingLaps: 1, extendedChannels: true, seed: 99 });
  const probeText = toCsvString(probe);
  const bytesPerLapSecond = probeText.length / probe.timeS[probe.timeS.length - 1];
  const targetS = (megabytes * 1e6) / bytesPerLapSecond;
  const flyingLaps = Math.max(1, Math.round((targetS - 240) / 83));
  const session = generateSession({
    seed: 99, flyingLaps, extendedChannels: true, gpsRateHz: 20, brakeOnStraightLaps: [2, Math.max(2, flyingLaps - 1)],
    revCeilingLap: Math.min(3, flyingLaps), pitOverspeed: "in",
  });
  const bytes = await writeChunks(file, csvChunks(session));
  writeFileSync(file.replace(/\.csv$/, "") + ".truth.json", JSON.stringify(truthDocument(session, path.basename(file)), null, 2) + "\n");
  console.log(`${file}: ${(bytes / 1e6).toFixed(1)} MB, ${session.channels.length} channels, ${session.timeS.length} rows, ${(session.timeS[session.timeS.length - 1] / 60).toFixed(1)} min`);
}

async function main(): Promise<void> {
  const big = arg("--big");
  if (big) {
    const mb = parseMegabytes(big);
    await writeBig(mb, arg("--file") ?? path.join(tmpdir(), `lapbench-big-${mb}MB.csv`));
    return;
  }
  await writeCommitted(arg("--out") ?? path.join(__dirname, "files"));
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
