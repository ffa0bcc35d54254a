/**
 * When a session started, from what a file says about itself: absolute time stamps
 * (start_time_iso, set by the parsers for ISO 8601 time columns, GPX and NMEA) first, then a
 * `# key: value` line such as "started at", "start time", "date" holding an ISO 8601 date-time.
 * Returns null when nothing usable is there; a value that does not parse is ignored, not guessed.
 * A date-time written without a zone is read in `timeZone` (the track's) when given, else as UTC;
 * `time_zone_in_file: "no"` (set by the CSV reader for zone-less ISO time columns) says the same of
 * start_time_iso.
 */
import { ISO_8601_DATE_TIME } from "./detect-time-format";
import { wallClockToUtcMs } from "./zoned-time";

const KEYS = ["start_time_iso", "started at", "started_at", "start time", "start_time", "start", "date", "datetime"];

export function sessionStartTime(metadata: Record<string, string>, timeZone?: string | null): Date | null {
  const lower = new Map(Object.entries(metadata).map(([k, v]) => [k.trim().toLowerCase(), v.trim()]));
  for (const key of KEYS) {
    const v = lower.get(key);
    if (!v || !ISO_8601_DATE_TIME.test(v)) continue;
    const zoned = /(Z|[+-]\d{2}:?\d{2})$/.test(v) && !(key === "start_time_iso" && lower.get("time_zone_in_file") === "no");
    // ISO 8601 without a zone: the track's local time when the track has a zone, else UTC.
    const withZone = /(Z|[+-]\d{2}:?\d{2})$/.test(v) ? v : `${v.replace(" ", "T")}Z`;
    const ms = Date.parse(withZone);
    if (Number.isNaN(ms)) continue;
    return new Date(!zoned && timeZone ? wallClockToUtcMs(ms, timeZone) : ms);
  }
  return null;
}
