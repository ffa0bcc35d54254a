import { XMLParser, XMLValidator } from "fast-xml-parser";
import { getPreciseDistance } from "geolib";
import { gpsFixSeries } from "./gps-fix-series";
import { ISO_8601_DATE_TIME } from "./detect-time-format";
import { IngestError, quoteForMessage } from "./ingest-error";
import { formatBytes, GPX_MAX_BYTES, LIMITS, type IngestLimits } from "./limits";
import type { ParsedSeries } from "./parsed-series";
import { sniffFormat } from "./sniff-format";
import { allFixesPoorMessage, poorFixNote, poorFixReason, type PoorFixCounts } from "./fix-quality";

export interface ParseGpxOptions {
  fileName?: string;
  limits?: IngestLimits;
}

interface TrackPoint {
  lat: number;
  lon: number;
  ele: number;
  speed: number;
  ms: number;
  timeText: string;
  line: number;
  /** <sat> and <hdop> (GPX 1.1 wptType), NaN when absent. */
  sats: number;
  hdop: number;
}

/** Line number (1-based) of a character index, by binary search over line starts. */
function lineFinder(text: string): (index: number) => number {
  const starts = [0];
  for (let i = text.indexOf("\n"); i >= 0; i = text.indexOf("\n", i + 1)) starts.push(i + 1);
  return (index) => {
    let lo = 0;
    let hi = starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (starts[mid] <= index) lo = mid;
      else hi = mid - 1;
    }
    return lo + 1;
  };
}

function asArray<T>(x: T | T[] | undefined): T[] {
  return x === undefined ? [] : Array.isArray(x) ? x : [x];
}

function numberOrNaN(x: unknown): number {
  if (typeof x !== "string" || x.trim() === "") return NaN;
  const v = Number(x);
  return Number.isFinite(v) ? v : NaN;
}

/**
 * Parse a GPX 1.1 track (fast-xml-parser) into the common series shape: gps_lat, gps_lon (deg),
 * gps_alt (m, from <ele>), gps_speed (m/s). GPX 1.1 has no speed element: a plain <speed> in the
 * point (GPX 1.0) or in its <extensions> is used when every point has one; otherwise speed is
 * derived from positions (geodesic distance by geolib's Vincenty, central difference over time).
 * Time: seconds from the first point; its ISO 8601 time is in metadata.start_time_iso.
 * Broken XML → IngestError XML_INVALID with the line and column XMLValidator reports.
 */
export function parseGpx(input: string | Buffer, options: ParseGpxOptions = {}): ParsedSeries {
  const fileName = options.fileName ?? "upload.gpx";
  const limits = options.limits ?? LIMITS;
  const bytes = typeof input === "string" ? Buffer.byteLength(input, "utf8") : input.length;
  if (bytes > limits.maxBytes) {
    throw new IngestError("FILE_TOO_LARGE", `The file is larger than the limit of ${formatBytes(limits.maxBytes)} (${bytes.toLocaleString("en-GB")} bytes).`);
  }
  const gpxMax = limits.maxGpxBytes ?? GPX_MAX_BYTES;
  if (bytes > gpxMax) {
    throw new IngestError(
      "FILE_TOO_LARGE",
      `"${fileName}" is ${bytes.toLocaleString("en-GB")} bytes; a GPX file is read whole, so the limit is ${formatBytes(gpxMax)}. Split the track, or export it as NMEA 0183 or CSV (streamed, up to ${formatBytes(limits.maxBytes)}).`,
    );
  }
  let text: string;
  if (typeof input === "string") text = input;
  else {
    const sniff = sniffFormat(input, fileName, true);
    if (sniff.format === "rejected") throw new IngestError(sniff.code, sniff.reason, { byteOffset: sniff.byteOffset, line: sniff.line });
    text = input.toString("utf8");
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (text.trim() === "") throw new IngestError("EMPTY_FILE", `"${fileName}" is empty.`);

  const valid = XMLValidator.validate(text);
  if (valid !== true) {
    const { line, col, msg } = valid.err;
    const unclosed = /^Invalid '\[(.*)\]' found\.$/s.exec(msg);
    const what = unclosed
      ? `the file ends before these elements are closed: ${unclosed[1].split(",").map((s) => `<${s.trim().replace(/^"|"$/g, "")}>`).join(", ")} (cut off?)`
      : msg;
    throw new IngestError("XML_INVALID", `"${fileName}" is not well-formed XML: line ${line}, column ${col}: ${what}`, { line });
  }
  const parser = new XMLParser({
    ignoreAttributes: false,
    attributeNamePrefix: "@_",
    parseTagValue: false,
    parseAttributeValue: false,
    // GPX needs no entity expansion; leaving it off also shuts out entity-expansion attacks.
    processEntities: false,
    removeNSPrefix: false,
    captureMetaData: true,
    isArray: (name) => name === "trk" || name === "trkseg" || name === "trkpt",
  });
  const doc = parser.parse(text) as Record<string, unknown>;
  const gpx = doc.gpx as Record<string, unknown> | undefined;
  if (!gpx || typeof gpx !== "object") {
    throw new IngestError("GPX_NOT_GPX", `"${fileName}" is XML but its root element is not <gpx>.`);
  }
  const meta = XMLParser.getMetaDataSymbol() as unknown as symbol;
  const lineOf = lineFinder(text);
  const points: TrackPoint[] = [];
  let everyPointHasSpeed = true;
  for (const trk of asArray(gpx.trk as Record<string, unknown>[])) {
    for (const seg of asArray((trk as Record<string, unknown>).trkseg as Record<string, unknown>[])) {
      for (const pt of asArray((seg as Record<string, unknown>).trkpt as Record<string | symbol, unknown>[])) {
        const start = (pt[meta] as { startIndex?: number } | undefined)?.startIndex;
        const line = start === undefined ? 0 : lineOf(start);
        const where = `Line ${line}: track point ${points.length + 1}`;
        const lat = numberOrNaN(pt["@_lat"]);
        const lon = numberOrNaN(pt["@_lon"]);
        if (!(lat >= -90 && lat <= 90) || !(lon >= -180 && lon <= 180)) {
          throw new IngestError("GPX_BAD_POINT", `${where} has lat=${quoteForMessage(String(pt["@_lat"] ?? ""))} lon=${quoteForMessage(String(pt["@_lon"] ?? ""))}; expected latitude −90…90 and longitude −180…180 in decimal degrees.`, { line });
        }
        const timeText = typeof pt.time === "string" ? pt.time.trim() : "";
        if (!timeText) throw new IngestError("GPX_BAD_POINT", `${where} has no <time>; Lapbench needs a time for every track point.`, { line });
        const ms = ISO_8601_DATE_TIME.test(timeText) ? Date.parse(/(Z|[+-]\d{2}:?\d{2})$/.test(timeText) ? timeText : timeText + "Z") : NaN;
        if (Number.isNaN(ms)) {
          throw new IngestError("GPX_BAD_POINT", `${where}: expected an ISO 8601 <time> (e.g. 2024-05-01T10:00:00.100Z), found ${quoteForMessage(timeText)}.`, { line });
        }
        const ext = pt.extensions as Record<string, unknown> | undefined;
        const speed = numberOrNaN(pt.speed ?? (ext && typeof ext === "object" ? ext.speed : undefined));
        if (Number.isNaN(speed)) everyPointHasSpeed = false;
        points.push({ lat, lon, ele: numberOrNaN(pt.ele), speed, ms, timeText, line, sats: numberOrNaN(pt.sat), hdop: numberOrNaN(pt.hdop) });
      }
    }
  }
  if (points.length === 0) {
    const routePoints = asArray((gpx.rte as Record<string, unknown> | undefined)?.rtept).length;
    const waypoints = asArray(gpx.wpt).length;
    const other = routePoints || waypoints ? ` It has ${routePoints} route points and ${waypoints} waypoints, which are plans, not recordings.` : "";
    throw new IngestError("GPX_NO_POINTS", `"${fileName}" has no track points (<trk><trkseg><trkpt>).${other}`);
  }
  if (points.length > limits.maxRows) {
    throw new IngestError("TOO_MANY_ROWS", `"${fileName}" has ${points.length.toLocaleString("en-GB")} track points; at most ${limits.maxRows.toLocaleString("en-GB")} are accepted.`);
  }
  // Poor fixes (too few satellites, too high an HDOP) are dropped and counted.
  const poor: PoorFixCounts = { satellites: 0, hdop: 0 };
  {
    let w = 0;
    for (const p of points) {
      const why = poorFixReason(p.sats, p.hdop);
      if (why) poor[why]++;
      else points[w++] = p;
    }
    points.length = w;
  }
  if (points.length === 0) throw new IngestError("GPX_NO_POINTS", allFixesPoorMessage(fileName, poor));
  if (everyPointHasSpeed === false && points.every((p) => !Number.isNaN(p.speed))) everyPointHasSpeed = true;
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1];
    const b = points[i];
    if (b.ms === a.ms) {
      throw new IngestError("DUPLICATE_TIME", `Line ${b.line}: track point ${i + 1} has the same time ${quoteForMessage(b.timeText)} as the point on line ${a.line}; times must be unique.`, { line: b.line });
    }
    if (b.ms < a.ms) {
      throw new IngestError("TIME_BACKWARDS", `Line ${b.line}: track point ${i + 1} at ${quoteForMessage(b.timeText)} is earlier than the point on line ${a.line} (${quoteForMessage(a.timeText)}); times must increase.`, { line: b.line });
    }
  }
  const n = points.length;
  const t0 = points[0].ms;
  const { timeS, channels } = gpsFixSeries(
    points.map((p) => ({ ms: p.ms, lat: p.lat, lon: p.lon, altM: p.ele })),
    (speed) => {
      if (everyPointHasSpeed) for (let i = 0; i < n; i++) speed[i] = points[i].speed;
      else deriveSpeed(points, speed);
    },
  );
  const metadata: Record<string, string> = {
    source_format: "gpx",
    time_format: "iso8601",
    start_time_iso: new Date(t0).toISOString(),
    gps_speed_source: everyPointHasSpeed ? "file" : "derived from positions",
  };
  const creator = (gpx as Record<string, unknown>)["@_creator"];
  if (typeof creator === "string") metadata.creator = creator.slice(0, 200);
  const note = poorFixNote(poor);
  if (note) metadata.gpx_poor_fixes_dropped = String(poor.satellites + poor.hdop);
  return { timeS, channels, metadata, rows: n, ...(note ? { notes: [note] } : {}) };
}

/** Speed at each point: geodesic distance over time, central difference (one-sided at the ends). */
function deriveSpeed(points: TrackPoint[], out: Float32Array): void {
  const n = points.length;
  if (n < 2) {
    out.fill(NaN);
    return;
  }
  const step = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) {
    // accuracy 0.001: metres to the millimetre (geolib rounds to `accuracy`).
    step[i] = getPreciseDistance({ latitude: points[i].lat, longitude: points[i].lon }, { latitude: points[i + 1].lat, longitude: points[i + 1].lon }, 0.001);
  }
  for (let i = 0; i < n; i++) {
    const a = Math.max(0, i - 1);
    const b = Math.min(n - 1, i + 1);
    let d = 0;
    for (let k = a; k < b; k++) d += step[k];
    out[i] = d / ((points[b].ms - points[a].ms) / 1000);
  }
}
