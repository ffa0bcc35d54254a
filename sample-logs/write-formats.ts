/**
 * Writers for generated sessions: CSV channel exports, GPX 1.1 tracks and NMEA 0183 (RMC + GGA).
 * Each format is produced as a sequence of text chunks, so big files stream to disk without the
 * whole text ever sitting in memory; the *String helpers join the chunks for small files and tests.
 */
import { createWriteStream } from "node:fs";
import { once } from "node:events";
import type { GeneratedSession } from "./generate-session";

export interface CsvOptions {
  delimiter: "," | ";" | "\t";
  /** Decimal comma (only with ';', the usual pairing where commas are decimal marks). */
  decimalComma: boolean;
  /** Time column: seconds with 3 decimals, integer milliseconds, or ISO 8601 timestamps. */
  time: "s" | "ms" | "iso";
  rowsPerChunk: number;
}

export const DEFAULT_CSV: CsvOptions = { delimiter: ",", decimalComma: false, time: "s", rowsPerChunk: 2000 };

/** Fixed decimals with trailing zeros dropped: shorter files, same values ("12.50" → "12.5"). */
export function formatNumber(value: number, decimals: number, decimalComma = false): string {
  let s = value.toFixed(decimals);
  if (decimals > 0 && s.includes(".")) s = s.replace(/\.?0+$/, "");
  if (s === "-0") s = "0";
  return decimalComma ? s.replace(".", ",") : s;
}

export function isoAt(startedAt: string, timeS: number): string {
  return new Date(Date.parse(startedAt) + Math.round(timeS * 1000)).toISOString();
}

function metadataLines(session: GeneratedSession): string[] {
  const m = session.metadata;
  const t = session.truth;
  return [
    `# team: ${m.team}`,
    `# rider: ${m.rider}`,
    `# bike: ${m.bike}`,
    `# track: ${m.track}`,
    `# session: ${m.sessionKind}`,
    `# started at: ${m.startedAt}`,
    `# sample rate: ${t.sampleRateHz} Hz`,
    `# gps rate: ${t.gpsRateHz} Hz`,
    `# generator: ${m.generator}`,
    `# seed: ${m.seed}`,
  ];
}

export function csvHeader(session: GeneratedSession, time: CsvOptions["time"]): string[] {
  const timeName = time === "s" ? "Time [s]" : time === "ms" ? "Time [ms]" : "Time";
  return [timeName, ...session.channels.map((c) => (c.fileUnit ? `${c.name} [${c.fileUnit}]` : c.name))];
}

export function* csvChunks(session: GeneratedSession, partial: Partial<CsvOptions> = {}): Generator<string> {
  const o: CsvOptions = { ...DEFAULT_CSV, ...partial };
  if (o.decimalComma && o.delimiter !== ";") throw new Error("a decimal comma needs the ';' delimiter");
  const d = o.delimiter;
  yield metadataLines(session).join("\n") + "\n" + csvHeader(session, o.time).join(d) + "\n";
  const cols = session.channels;
  const ns = session.timeS.length;
  const parts: string[] = new Array(cols.length + 1);
  let chunk: string[] = [];
  for (let j = 0; j < ns; j++) {
    const t = session.timeS[j];
    parts[0] = o.time === "s" ? formatNumber(t, 3, o.decimalComma) : o.time === "ms" ? String(Math.round(t * 1000)) : isoAt(session.metadata.startedAt, t);
    for (let k = 0; k < cols.length; k++) {
      const c = cols[k];
      const x = c.data[j];
      // Empty cell = no sample (GPS between fixes).
      parts[k + 1] = Number.isNaN(x) ? "" : formatNumber(x * c.scale + c.offset, c.decimals, o.decimalComma);
    }
    chunk.push(parts.join(d));
    if (chunk.length >= o.rowsPerChunk) {
      yield chunk.join("\n") + "\n";
      chunk = [];
    }
  }
  if (chunk.length) yield chunk.join("\n") + "\n";
}

/** GPS fix rows: indices where the latitude channel has a sample. */
export function gpsFixIndices(session: GeneratedSession): number[] {
  const lat = session.channels.find((c) => c.role === "gps_lat")!.data;
  const out: number[] = [];
  for (let j = 0; j < lat.length; j++) if (!Number.isNaN(lat[j])) out.push(j);
  return out;
}

function column(session: GeneratedSession, role: string) {
  const c = session.channels.find((x) => x.role === role);
  if (!c) throw new Error(`session has no ${role} channel`);
  return c.data;
}

function xmlEscape(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

export function* gpxChunks(session: GeneratedSession, pointsPerChunk = 2000): Generator<string> {
  const m = session.metadata;
  yield [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<gpx version="1.1" creator="${xmlEscape(m.generator)}" xmlns="http://www.topografix.com/GPX/1/1" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" xsi:schemaLocation="http://www.topografix.com/GPX/1/1 http://www.topografix.com/GPX/1/1/gpx.xsd">`,
    `  <metadata><name>${xmlEscape(`${m.track}, ${m.rider}`)}</name><desc>${xmlEscape(`${m.team}; ${m.bike}; invented data`)}</desc><time>${m.startedAt}</time></metadata>`,
    `  <trk><name>${xmlEscape(`${m.sessionKind} ${m.startedAt}`)}</name><trkseg>`,
  ].join("\n") + "\n";
  const lat = column(session, "gps_lat"), lon = column(session, "gps_lon"), alt = column(session, "gps_alt");
  let chunk: string[] = [];
  for (const j of gpsFixIndices(session)) {
    chunk.push(
      `    <trkpt lat="${lat[j].toFixed(7)}" lon="${lon[j].toFixed(7)}"><ele>${alt[j].toFixed(1)}</ele><time>${isoAt(m.startedAt, session.timeS[j])}</time></trkpt>`,
    );
    if (chunk.length >= pointsPerChunk) {
      yield chunk.join("\n") + "\n";
      chunk = [];
    }
  }
  if (chunk.length) yield chunk.join("\n") + "\n";
  yield `  </trkseg></trk>\n</gpx>\n`;
}

// ---- NMEA 0183 -------------------------------------------------------------------------------
// nmea-simple (3.3.0) has no RMC encoder, and its GGA encoder writes whole seconds only, so at
// 10–25 Hz every fix of a second would carry the same time. We write both sentences here and
// check them with nmea-simple's parser in the tests.

/** XOR of the characters between '$' and '*' (NMEA 0183 checksum), two upper-case hex digits. */
export function nmeaChecksum(body: string): string {
  let x = 0;
  for (let i = 0; i < body.length; i++) x ^= body.charCodeAt(i);
  return x.toString(16).toUpperCase().padStart(2, "0");
}

function sentence(body: string): string {
  return `$${body}*${nmeaChecksum(body)}\r\n`;
}

function nmeaTime(d: Date): string {
  const p = (n: number, w = 2) => String(n).padStart(w, "0");
  return `${p(d.getUTCHours())}${p(d.getUTCMinutes())}${p(d.getUTCSeconds())}.${p(Math.round(d.getUTCMilliseconds() / 10))}`;
}

function nmeaDate(d: Date): string {
  const p = (n: number) => String(n).padStart(2, "0");
  return `${p(d.getUTCDate())}${p(d.getUTCMonth() + 1)}${p(d.getUTCFullYear() % 100)}`;
}

/** Degrees and decimal minutes: ddmm.mmmmmm / dddmm.mmmmmm with hemisphere. */
function nmeaCoord(value: number, degDigits: 2 | 3, pos: string, neg: string): string {
  const a = Math.abs(value);
  let deg = Math.floor(a);
  let min = Number(((a - deg) * 60).toFixed(6));
  if (min >= 60) {
    deg += 1;
    min -= 60;
  }
  return `${String(deg).padStart(degDigits, "0")}${min.toFixed(6).padStart(9, "0")},${value < 0 ? neg : pos}`;
}

export function* nmeaChunks(session: GeneratedSession, fixesPerChunk = 2000): Generator<string> {
  const lat = column(session, "gps_lat"), lon = column(session, "gps_lon"), alt = column(session, "gps_alt"), spd = column(session, "gps_speed");
  const fixes = gpsFixIndices(session);
  const start = Date.parse(session.metadata.startedAt);
  let course = 0;
  let chunk: string[] = [];
  for (let k = 0; k < fixes.length; k++) {
    const j = fixes[k];
    const d = new Date(start + Math.round(session.timeS[j] * 1000));
    const next = fixes[Math.min(k + 1, fixes.length - 1)];
    const prev = fixes[Math.max(k - 1, 0)];
    if (spd[j] > 1) {
      // Course over ground from neighbouring fixes (true degrees, clockwise from north).
      const dy = lat[next] - lat[prev];
      const dx = (lon[next] - lon[prev]) * Math.cos((lat[j] * Math.PI) / 180);
      if (dx !== 0 || dy !== 0) course = ((Math.atan2(dx, dy) * 180) / Math.PI + 360) % 360;
    }
    const t = nmeaTime(d);
    const la = nmeaCoord(lat[j], 2, "N", "S");
    const lo = nmeaCoord(lon[j], 3, "E", "W");
    const knots = (spd[j] * 3600) / 1852; // 1 knot = 1852 m/h
    chunk.push(sentence(`GPRMC,${t},A,${la},${lo},${knots.toFixed(2)},${course.toFixed(1)},${nmeaDate(d)},,,A`));
    chunk.push(sentence(`GPGGA,${t},${la},${lo},1,12,0.8,${alt[j].toFixed(1)},M,0.0,M,,`));
    if (chunk.length >= 2 * fixesPerChunk) {
      yield chunk.join("");
      chunk = [];
    }
  }
  if (chunk.length) yield chunk.join("");
}

export const toCsvString = (s: GeneratedSession, o: Partial<CsvOptions> = {}) => [...csvChunks(s, o)].join("");
export const toGpxString = (s: GeneratedSession) => [...gpxChunks(s)].join("");
export const toNmeaString = (s: GeneratedSession) => [...nmeaChunks(s)].join("");

/** Streams chunks to a file, waiting for the stream to drain; returns bytes written. */
export async function writeChunks(path: string, chunks: Iterable<string>): Promise<number> {
  const out = createWriteStream(path, { encoding: "utf8" });
  let bytes = 0;
  try {
    for (const c of chunks) {
      bytes += Buffer.byteLength(c);
      if (!out.write(c)) await once(out, "drain");
    }
  } finally {
    out.end();
  }
  await once(out, "finish");
  return bytes;
}

/** The ground-truth document written beside a sample file (schema in sample-logs/README.md). */
export function truthDocument(session: GeneratedSession, file: string, opts: { gpsOnly?: boolean } = {}) {
  const t = session.truth;
  const channels = opts.gpsOnly
    ? []
    : session.channels.map((c) => ({ header: c.fileUnit ? `${c.name} [${c.fileUnit}]` : c.name, role: c.role, fileUnit: c.fileUnit, siUnit: c.siUnit }));
  return {
    ...t,
    file,
    // A GPS-only file cannot show brake pressure or rpm, so only the pit overspeed stays.
    events: opts.gpsOnly ? t.events.filter((e) => e.kind === "pit_overspeed") : t.events,
    metadata: session.metadata,
    channels,
    samples: opts.gpsOnly ? gpsFixIndices(session).length : session.timeS.length,
  };
}
