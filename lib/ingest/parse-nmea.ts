import { parseUnsafeNmeaSentence, type GGAPacket, type RMCPacket } from "nmea-simple";
import { gpsFixSeries } from "./gps-fix-series";
import { decodeTextStream, type DecodeProgress } from "./decode-text-stream";
import { IngestError } from "./ingest-error";
import { LIMITS, type IngestLimits } from "./limits";
import type { IngestProgress, ParsedSeries } from "./parsed-series";
import { KNOT_TO_MPS } from "./units";
import { allFixesPoorMessage, poorFixNote, poorFixReason, type PoorFixCounts } from "./fix-quality";

export interface ParseNmeaOptions {
  fileName?: string;
  limits?: IngestLimits;
  onProgress?: (p: IngestProgress) => void;
  /** The time now (ms), for the week-rollover correction; tests pin it. */
  now?: number;
}

const DAY_MS = 86_400_000;
/** GPS week numbers roll over every 1024 weeks (IS-GPS-200, 10-bit week number). */
const GPS_ROLLOVER_WEEKS = 1024;
/** A step back in fix time this long is a receiver restart, not damage (Lapbench default). */
const RESTART_JUMP_MS = 60_000;
/** Latitude/longitude a fix can have: inside ±90/±180 and not the receiver's (0, 0) placeholder. */
export function plausiblePosition(lat: number, lon: number): boolean {
  return Number.isFinite(lat) && Number.isFinite(lon) && Math.abs(lat) <= 90 && Math.abs(lon) <= 180 && !(Math.abs(lat) < 1e-6 && Math.abs(lon) < 1e-6);
}

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
  /** Satellites in use and horizontal dilution of precision (GGA), when given. */
  sats?: number;
  hdop?: number;
  /** The epoch's GGA says it is no satellite fix (quality 0, 6 dead reckoning, 7 manual, 8 simulation). */
  ggaNoFix?: boolean;
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
    dropNul: true,
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
  let truncated = 0;
  let unreadable = 0;
  let spliced = 0;
  let badPosition = 0;

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

  /** The first few address fields ("$GPRMC") of sentences that could not be read, for the refusal. */
  const badTypes = new Map<string, number>();
  const tallyType = (line: string) => {
    const m = /^\$([A-Z0-9]{2,8}),/.exec(line);
    if (!m) return;
    if (badTypes.has(m[1]) || badTypes.size < 50) badTypes.set(m[1], (badTypes.get(m[1]) ?? 0) + 1);
  };

  /** One sentence ("$…*hh"); `inNote`: found inside a `#` note line, kept only when intact. */
  const handleSentence = (line: string, inNote: boolean) => {
    const star = line.lastIndexOf("*");
    const hasChecksum = star >= 0 && /^\*[0-9A-Fa-f]{2}$/.test(line.slice(star));
    if (inNote && !hasChecksum) return;
    let packet: ReturnType<typeof parseUnsafeNmeaSentence>;
    try {
      packet = parseUnsafeNmeaSentence(line);
    } catch {
      if (inNote) return;
      sentences++;
      if (!hasChecksum) truncated++;
      else unreadable++;
      if (!firstBadLine) firstBadLine = lineNo;
      tallyType(line);
      return;
    }
    if (!packet.chxOk) {
      if (inNote) return;
      sentences++;
      if (hasChecksum) badChecksum++;
      else truncated++;
      if (!firstBadLine) firstBadLine = lineNo;
      tallyType(line);
      return;
    }
    sentences++;
    good++;
    handlePacket(packet, line);
  };

  const handleLine = (raw: string) => {
    lineNo++;
    const line = raw.trim();
    if (line === "") return;
    const first = line.indexOf("$");
    if (first < 0) {
      nonNmeaLines++;
      return;
    }
    const inNote = line.charCodeAt(0) === 35; /* # */
    // Sentences spliced onto one line (a receiver cut off mid-sentence) are read one by one.
    const pieces = line.slice(first).split("$");
    let any = false;
    for (let k = 1; k < pieces.length; k++) {
      if (pieces[k] === "") continue;
      if (k < pieces.length - 1 && !inNote) spliced++;
      const before = sentences;
      handleSentence("$" + pieces[k].trim(), inNote);
      any ||= sentences > before;
    }
    if (!any && inNote) nonNmeaLines++;
  };

  const handlePacket = (packet: ReturnType<typeof parseUnsafeNmeaSentence>, line: string) => {
    const fields = line.split("*")[0].split(",");
    if (packet.sentenceId === "RMC") {
      fixSentences++;
      const rmc = packet as RMCPacket;
      if (rmc.status !== "valid" || fields[3] === "" || fields[5] === "" || !Number.isFinite(rmc.latitude) || !Number.isFinite(rmc.longitude)) {
        noFix++;
        return;
      }
      if (!plausiblePosition(rmc.latitude, rmc.longitude)) {
        badPosition++;
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
      // Fix quality 1–5 is a position fix (GPS, DGPS, PPS, RTK, float RTK); 6 dead reckoning,
      // 7 manual input and 8 simulation are not (NMEA 0183 GGA field 6).
      const quality = Number(fields[6]);
      if (!(quality >= 1 && quality <= 5) || fields[2] === "" || fields[4] === "") {
        noFix++;
        // Marks the epoch: an RMC of the same time saying "valid" (a dead-reckoned position) is not
        // a satellite fix either. A GGA-only epoch without position is dropped after reading.
        const tod = todFromField(fields[1] ?? "");
        if (Number.isFinite(tod)) epochFor(tod, lineNo, fields[1]).ggaNoFix = true;
        return;
      }
      if (!plausiblePosition(gga.latitude, gga.longitude)) {
        badPosition++;
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
      const sats = Number(fields[7]);
      const hdop = Number(fields[8]);
      if (fields[7] !== "" && Number.isFinite(sats)) e.sats = sats;
      if (fields[8] !== "" && Number.isFinite(hdop)) e.hdop = hdop;
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
  if (good === 0 && badChecksum > 0 && truncated === 0 && unreadable === 0) {
    throw new IngestError(
      "NMEA_ALL_BAD_CHECKSUMS",
      `All ${badChecksum} NMEA sentences have a missing or wrong checksum (the *hh at the end), first at line ${firstBadLine}; the file is damaged or not NMEA 0183.`,
      { line: firstBadLine },
    );
  }
  if (good === 0) {
    // Nothing readable: say what the file holds instead, so the person knows it is another format.
    const kinds = [badChecksum && `${badChecksum} with a wrong checksum`, truncated && `${truncated} without a checksum`, unreadable && `${unreadable} unreadable`].filter(Boolean).join(", ");
    const common = [...badTypes.entries()].sort((a, b) => b[1] - a[1]).slice(0, 4).map(([t]) => `$${t}`);
    const noRmcGga = ![...badTypes.keys()].some((t) => /^(?:..)(?:RMC|GGA)$/.test(t));
    throw new IngestError(
      "NMEA_ALL_BAD_CHECKSUMS",
      `None of the ${sentences} sentences in "${fileName}" is a readable NMEA 0183 sentence (${kinds}), first at line ${firstBadLine}.` +
        (common.length ? ` Most are ${common.join(", ")}${noRmcGga ? ", and none is an RMC or GGA position sentence" : ""}: this looks like another logging format, not NMEA 0183 as a GPS receiver writes it.` : ""),
      { line: firstBadLine },
    );
  }
  // Poor fixes: too few satellites, too high an HDOP, or a GGA saying the epoch is no satellite fix.
  const poor: PoorFixCounts = { satellites: 0, hdop: 0, notSatelliteFix: 0 };
  {
    let w = 0;
    for (const e of epochs) {
      if (Number.isNaN(e.lat)) continue; // a GGA without a fix and no RMC position: no fix at all
      if (e.ggaNoFix) {
        poor.notSatelliteFix!++;
        continue;
      }
      const why = poorFixReason(e.sats, e.hdop);
      if (why) {
        poor[why]++;
        continue;
      }
      epochs[w++] = e;
    }
    epochs.length = w;
  }
  if (epochs.length === 0 && (poor.satellites || poor.hdop || poor.notSatelliteFix)) throw new IngestError("NMEA_NO_FIX", allFixesPoorMessage(fileName, poor));
  if (epochs.length === 0) {
    const why = fixSentences === 0 ? `it has no RMC or GGA sentences (${good} other sentences)` : `none of its ${fixSentences} RMC/GGA sentences has a valid fix (RMC status A or GGA fix quality 1–5)`;
    throw new IngestError("NMEA_NO_FIX", `"${fileName}" has no GPS fix: ${why}.`);
  }

  // Dates a receiver gets wrong: a cold start reports 1980 or its firmware's build date until it
  // has the almanac; a receiver past the GPS week-number rollover reports a date 1024 weeks early.
  // The session takes the date most of its fixes agree on; fixes dated more than a day from it are
  // dropped and counted, and a majority date before 2000 is moved on by whole 1024-week cycles.
  const dated = epochs.filter((e) => !Number.isNaN(e.absMs));
  let wrongDate = 0;
  let rolloverWeeks = 0;
  let kept = epochs;
  if (dated.length) {
    const days = dated.map((e) => Math.floor(e.absMs / DAY_MS)).sort((x, y) => x - y);
    const majorityDay = days[days.length >> 1];
    kept = epochs.filter((e) => {
      if (Number.isNaN(e.absMs) || Math.abs(Math.floor(e.absMs / DAY_MS) - majorityDay) <= 1) return true;
      wrongDate++;
      return false;
    });
    const cycleMs = GPS_ROLLOVER_WEEKS * 7 * DAY_MS;
    if (majorityDay * DAY_MS < Date.UTC(2000, 0, 1)) {
      const now = options.now ?? Date.now();
      let shift = 0;
      while (majorityDay * DAY_MS + shift + cycleMs <= now) shift += cycleMs;
      if (shift > 0) {
        rolloverWeeks = Math.round(shift / (7 * DAY_MS));
        for (const e of kept) if (!Number.isNaN(e.absMs)) e.absMs += shift;
      }
    }
  }
  if (kept.length === 0) throw new IngestError("NMEA_NO_FIX", `"${fileName}" has no GPS fix with a usable date: all ${wrongDate} fixes disagree on the day.`);

  // Absolute times: RMC epochs carry their date; GGA-only epochs take the time of day forward
  // from the previous epoch (rolling over midnight), or backward from the first dated one.
  const firstDated = kept.findIndex((e) => !Number.isNaN(e.absMs));
  const hasDate = firstDated >= 0;
  if (!hasDate) kept[0].absMs = kept[0].todMs;
  const anchor = hasDate ? firstDated : 0;
  for (let i = anchor - 1; i >= 0; i--) kept[i].absMs = kept[i + 1].absMs - ((kept[i + 1].todMs - kept[i].todMs + DAY_MS) % DAY_MS);
  for (let i = anchor + 1; i < kept.length; i++) {
    const prev = kept[i - 1];
    const e = kept[i];
    if (Number.isNaN(e.absMs)) {
      const step = (e.todMs - prev.todMs + DAY_MS) % DAY_MS;
      // A step of over 12 h forward is a step backwards in time of day, not a half-day gap.
      e.absMs = step > DAY_MS / 2 ? prev.absMs - (DAY_MS - step) : prev.absMs + step;
    }
  }

  // Order: a fix repeating the time of the one before is dropped (counted). A step back of a
  // minute or more is a receiver that restarted with a wrong clock: the log is cut there and the
  // longest run of increasing fixes is kept (the others counted). A small step back is damage.
  let repeated = 0;
  const runs: Epoch[][] = [[kept[0]]];
  for (let i = 1; i < kept.length; i++) {
    const run = runs[runs.length - 1];
    const prev = run[run.length - 1];
    const e = kept[i];
    if (e.absMs === prev.absMs) {
      repeated++;
      continue;
    }
    if (e.absMs < prev.absMs) {
      if (prev.absMs - e.absMs >= RESTART_JUMP_MS) {
        runs.push([e]);
        continue;
      }
      throw new IngestError("TIME_BACKWARDS", `Line ${e.line}: the fix time ${formatTod(e.todMs)} is before the fix on line ${prev.line} (${formatTod(prev.todMs)}); fix times must increase.`, {
        line: e.line,
      });
    }
    run.push(e);
  }
  const longest = runs.reduce((best, r) => (r.length > best.length ? r : best), runs[0]);
  const clockJumpDropped = kept.length - repeated - longest.length;
  epochs.length = 0;
  epochs.push(...longest);

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
  if (truncated) metadata.nmea_truncated_sentences = String(truncated);
  if (unreadable) metadata.nmea_unreadable_sentences = String(unreadable);
  if (spliced) metadata.nmea_spliced_lines = String(spliced);
  if (progress.nulBytes) metadata.nmea_nul_bytes = String(progress.nulBytes);
  if (badPosition) metadata.nmea_bad_position_fixes = String(badPosition);
  if (wrongDate) metadata.nmea_wrong_date_fixes = String(wrongDate);
  if (repeated) metadata.nmea_repeated_fixes = String(repeated);
  if (clockJumpDropped) metadata.nmea_clock_jump_dropped_fixes = String(clockJumpDropped);
  if (rolloverWeeks) metadata.nmea_date_corrected_weeks = String(rolloverWeeks);
  const notes: string[] = [];
  const skipped = badChecksum + truncated + unreadable;
  if (skipped) {
    const parts = [badChecksum && `${badChecksum} bad checksum`, truncated && `${truncated} truncated or without checksum`, unreadable && `${unreadable} unreadable`].filter(Boolean);
    notes.push(`${skipped} ${skipped === 1 ? "sentence" : "sentences"} skipped: ${parts.join(", ")}.`);
  }
  if (progress.nulBytes) notes.push(`${progress.nulBytes} zero bytes dropped (the receiver restarted).`);
  if (badPosition) notes.push(`${badPosition} fixes at (0, 0) or out of range dropped.`);
  const poorNote = poorFixNote(poor);
  if (poorNote) {
    notes.push(poorNote);
    metadata.nmea_poor_fixes_dropped = String(poor.satellites + poor.hdop + poor.notSatelliteFix!);
  }
  if (wrongDate) notes.push(`${wrongDate} fixes dated more than a day from the rest (a cold start or a receiver's wrong clock) dropped.`);
  if (rolloverWeeks) notes.push(`The receiver's dates were ${rolloverWeeks} weeks early (GPS week-number rollover); corrected.`);
  if (repeated) notes.push(`${repeated} fixes repeating the time of the one before dropped.`);
  if (clockJumpDropped) notes.push(`${clockJumpDropped} fixes after the receiver's clock jumped back dropped; the longest run of fixes in time order is kept.`);
  if (nonNmeaLines) metadata.nmea_other_lines = String(nonNmeaLines);
  if (hasDate) metadata.start_time_iso = new Date(t0).toISOString();
  else metadata.start_time_of_day_utc = formatTod(epochs[0].todMs);
  options.onProgress?.({ bytesRead: progress.bytesRead, rows: n });
  const sats = epochs.some((e) => e.sats !== undefined) ? Float32Array.from(epochs, (e) => e.sats ?? NaN) : undefined;
  const hdop = epochs.some((e) => e.hdop !== undefined) ? Float32Array.from(epochs, (e) => e.hdop ?? NaN) : undefined;
  return { timeS, channels, metadata, rows: n, notes, ...(sats || hdop ? { fixQuality: { sats, hdop } } : {}) };
}

/** UTC time of day in ms from an hhmmss(.sss) field; NaN if malformed. */
function todFromField(raw: string): number {
  if (!/^\d{6}(\.\d+)?$/.test(raw)) return NaN;
  const h = Number(raw.slice(0, 2));
  const m = Number(raw.slice(2, 4));
  const s = Number(raw.slice(4, 6));
  return h * 3_600_000 + m * 60_000 + s * 1000 + fractionMs(raw);
}
