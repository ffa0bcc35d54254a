import { parseUnsafeNmeaSentence, type GGAPacket, type RMCPacket } from "nmea-simple";
import { gpsFixSeries } from "./gps-fix-series";
import { decodeTextStream, type DecodeProgress } from "./decode-text-stream";
import { IngestError } from "./ingest-error";
import { LIMITS, type IngestLimits } from "./limits";
import type { IngestProgress, ParsedSeries } from "./parsed-series";
import { KNOT_TO_MPS } from "./units";

export interface ParseNmeaOptions {
  fileName?: string;
  limits?: IngestLimits;
  onProgress?: (p: IngestProgress) => void;
}

const DAY_MS = 86_400_000;

/** One fix epoch: the RMC and GGA sentences of the same UTC time of day. */
interface Epoch {
  todMs: number;
  /** ms since the epoch, from the RMC date; NaN until known. */
  absMs: number;
  lat: number;
  lon: number;
  speedMps: number;
  altM: number;
  line: number;
  timeText: string;
}

/**
 * Fractional seconds from the raw hhmmss.sss field. nmea-simple 3.3.0 reads the RMC time's
 * fraction only when it has exactly two digits (hhmmss.ss); 10–25 Hz receivers often write three,
 * which it would drop — so the fraction is taken from the field text here.
 */
function fractionMs(rawTime: string): number {
  const dot = rawTime.indexOf(".");
  if (dot < 0) return 0;
  const f = Number("0" + rawTime.slice(dot));
  return Number.isFinite(f) ? Math.round(f * 1000) : 0;
}

function formatTod(todMs: number): string {
  return new Date(todMs).toISOString().slice(11, 23);
}

/**
 * Parse an NMEA 0183 log (nmea-simple) into the common series shape: RMC gives time, date,
 * position and speed over ground; GGA gives altitude and fix quality. Sentences of one epoch
 * (same UTC time) are merged; dates carry across midnight. Lines with a wrong checksum are
 * counted (metadata.nmea_bad_checksum_lines) and skipped — fatal only when no sentence is good.
 * Other sentence types are ignored. Time: seconds from the first fix; start_time_iso in metadata
 * when an RMC date is present.
 */
export async function parseNmea(input: string | Buffer | NodeJS.ReadableStream | AsyncIterable<Buffer>, options: ParseNmeaOptions = {}): Promise<ParsedSeries> {
  const fileName = options.fileName ?? "upload.nmea";
  const limits = options.limits ?? LIMITS;
  const source: AsyncIterable<Buffer | string> =
    typeof input === "string" || Buffer.isBuffer(input)
      ? (async function* () {
          const b = typeof input === "string" ? Buffer.from(input, "utf8") : input;
          for (let i = 0; i < b.length; i += 65536) yield b.subarray(i, i + 65536);
        })()
      : (input as AsyncIterable<Buffer>);
  const progress: DecodeProgress = { bytesRead: 0, lines: 0 };
  const text = decodeTextStream(source, {
    limits,
    fileName,
    progress,
    onFormat: (s) => {
      if (s.format === "gpx") throw new IngestError("UNSUPPORTED_TEXT", `"${fileName}" is a GPX file, not NMEA 0183; import it as GPX.`);
    },
  });

  const epochs: Epoch[] = [];
  let current: Epoch | undefined;
  let lineNo = 0;
  let sentences = 0;
  let good = 0;
  let badChecksum = 0;
  let firstBadLine = 0;
  let noFix = 0;
  let fixSentences = 0;
  let ignored = 0;
  let nonNmeaLines = 0;

  const flush = () => {
    if (current) epochs.push(current);
    current = undefined;
    if (epochs.length > limits.maxRows) {
      throw new IngestError("TOO_MANY_ROWS", `Line ${lineNo}: more than ${limits.maxRows.toLocaleString("en-GB")} fixes; split the log into shorter files.`, { line: lineNo });
    }
  };
  const epochFor = (todMs: number, line: number, timeText: string): Epoch => {
    if (current && current.todMs === todMs) return current;
    flush();
    current = { todMs, absMs: NaN, lat: NaN, lon: NaN, speedMps: NaN, altM: NaN, line, timeText };
    return current;
  };

  const handleLine = (raw: string) => {
    lineNo++;
    const line = raw.trim();
    if (line === "") return;
    if (line.charCodeAt(0) !== 36 /* $ */) {
      nonNmeaLines++;
      return;
    }
    sentences++;
    let packet: ReturnType<typeof parseUnsafeNmeaSentence>;
    try {
      packet = parseUnsafeNmeaSentence(line);
    } catch {
      ignored++;
      return;
    }
    if (!packet.chxOk) {
      badChecksum++;
      if (!firstBadLine) firstBadLine = lineNo;
      return;
    }
    good++;
    const fields = line.split("*")[0].split(",");
    if (packet.sentenceId === "RMC") {
      fixSentences++;
      const rmc = packet as RMCPacket;
      if (rmc.status !== "valid" || fields[3] === "" || fields[5] === "" || !Number.isFinite(rmc.latitude) || !Number.isFinite(rmc.longitude)) {
        noFix++;
        return;
      }
      const frac = fractionMs(fields[1]);
      const wholeSecondMs = rmc.datetime.getTime() - rmc.datetime.getUTCMilliseconds();
      const absMs = wholeSecondMs + frac;
      const todMs = Number.isFinite(absMs) ? ((absMs % DAY_MS) + DAY_MS) % DAY_MS : todFromField(fields[1]);
      if (!Number.isFinite(todMs)) {
        noFix++;
        return;
      }
      const e = epochFor(todMs, lineNo, fields[1]);
      e.absMs = absMs;
      e.lat = rmc.latitude;
      e.lon = rmc.longitude;
      e.speedMps = Number.isFinite(rmc.speedKnots) ? rmc.speedKnots * KNOT_TO_MPS : NaN;
    } else if (packet.sentenceId === "GGA") {
      fixSentences++;
      const gga = packet as GGAPacket;
      if (!gga.fixType || gga.fixType === "none" || fields[2] === "" || fields[4] === "") {
        noFix++;
        return;
      }
      const t = gga.time;
      const todMs = t.getUTCHours() * 3_600_000 + t.getUTCMinutes() * 60_000 + t.getUTCSeconds() * 1000 + t.getUTCMilliseconds();
      if (!Number.isFinite(todMs) || fields[1] === "") {
        noFix++;
        return;
      }
      const e = epochFor(todMs, lineNo, fields[1]);
      if (Number.isNaN(e.lat)) {
        e.lat = gga.latitude;
        e.lon = gga.longitude;
      }
      e.altM = fields[9] === "" ? NaN : gga.altitudeMeters;
    } else {
      ignored++;
    }
  };

  let carry = "";
  for await (const chunk of text) {
    const s = carry + chunk;
    let start = 0;
    for (let nl = s.indexOf("\n"); nl >= 0; nl = s.indexOf("\n", start)) {
      handleLine(s.slice(start, nl));
      start = nl + 1;
    }
    carry = s.slice(start);
    options.onProgress?.({ bytesRead: progress.bytesRead, rows: epochs.length });
  }
  if (carry) handleLine(carry);
  flush();

  if (progress.bytesRead === 0 || (sentences === 0 && nonNmeaLines === 0)) throw new IngestError("EMPTY_FILE", `"${fileName}" is empty.`);
  if (sentences === 0) {
    throw new IngestError("NMEA_NO_SENTENCES", `"${fileName}" has no NMEA 0183 sentences (lines starting with '$'); ${nonNmeaLines} other lines.`);
  }
  if (good === 0 && badChecksum > 0) {
    throw new IngestError(
      "NMEA_ALL_BAD_CHECKSUMS",
      `All ${badChecksum} NMEA sentences have a missing or wrong checksum (the *hh at the end), first at line ${firstBadLine}; the file is damaged or not NMEA 0183.`,
      { line: firstBadLine },
    );
  }
  if (epochs.length === 0) {
    const why = fixSentences === 0 ? `it has no RMC or GGA sentences (${good} other sentences)` : `none of its ${fixSentences} RMC/GGA sentences has a valid fix (RMC status A or GGA fix quality 1 or more)`;
    throw new IngestError("NMEA_NO_FIX", `"${fileName}" has no GPS fix: ${why}.`);
  }

  // Absolute times: RMC epochs carry their date; GGA-only epochs take the time of day forward
  // from the previous epoch (rolling over midnight), or backward from the first dated one.
  const firstDated = epochs.findIndex((e) => !Number.isNaN(e.absMs));
  const hasDate = firstDated >= 0;
  if (!hasDate) epochs[0].absMs = epochs[0].todMs;
  const anchor = hasDate ? firstDated : 0;
  for (let i = anchor - 1; i >= 0; i--) epochs[i].absMs = epochs[i + 1].absMs - ((epochs[i + 1].todMs - epochs[i].todMs + DAY_MS) % DAY_MS);
  for (let i = anchor + 1; i < epochs.length; i++) {
    const prev = epochs[i - 1];
    const e = epochs[i];
    if (Number.isNaN(e.absMs)) {
      const step = (e.todMs - prev.todMs + DAY_MS) % DAY_MS;
      // A step of over 12 h forward is a step backwards in time of day, not a half-day gap.
      e.absMs = step > DAY_MS / 2 ? prev.absMs - (DAY_MS - step) : prev.absMs + step;
    }
    if (e.absMs === prev.absMs) {
      throw new IngestError("DUPLICATE_TIME", `Line ${e.line}: the fix time ${formatTod(e.todMs)} repeats the fix on line ${prev.line}; fix times must be unique.`, { line: e.line });
    }
    if (e.absMs < prev.absMs) {
      throw new IngestError("TIME_BACKWARDS", `Line ${e.line}: the fix time ${formatTod(e.todMs)} is before the fix on line ${prev.line} (${formatTod(prev.todMs)}); fix times must increase.`, {
        line: e.line,
      });
    }
  }

  const n = epochs.length;
  const t0 = epochs[0].absMs;
  const { timeS, channels } = gpsFixSeries(
    epochs.map((e) => ({ ms: e.absMs, lat: e.lat, lon: e.lon, altM: e.altM })),
    (speed) => {
      for (let i = 0; i < n; i++) speed[i] = epochs[i].speedMps;
    },
  );
  const metadata: Record<string, string> = {
    source_format: "nmea",
    time_format: "nmea-utc",
    nmea_sentences: String(sentences),
    nmea_bad_checksum_lines: String(badChecksum),
    nmea_no_fix_sentences: String(noFix),
    nmea_ignored_sentences: String(ignored),
  };
  if (firstBadLine) metadata.nmea_first_bad_checksum_line = String(firstBadLine);
  if (nonNmeaLines) metadata.nmea_other_lines = String(nonNmeaLines);
  if (hasDate) metadata.start_time_iso = new Date(t0).toISOString();
  else metadata.start_time_of_day_utc = formatTod(epochs[0].todMs);
  options.onProgress?.({ bytesRead: progress.bytesRead, rows: n });
  return { timeS, channels, metadata, rows: n };
}

/** UTC time of day in ms from an hhmmss(.sss) field; NaN if malformed. */
function todFromField(raw: string): number {
  if (!/^\d{6}(\.\d+)?$/.test(raw)) return NaN;
  const h = Number(raw.slice(0, 2));
  const m = Number(raw.slice(2, 4));
  const s = Number(raw.slice(4, 6));
  return h * 3_600_000 + m * 60_000 + s * 1000 + fractionMs(raw);
}
