/**
 * When a session started, from what a file says about itself: absolute time stamps
 * (start_time_iso, set by the parsers for ISO 8601 time columns, GPX and NMEA) first, then a
 * `# key: value` line such as "started at", "start time", "date" holding an ISO 8601 date-time.
 * Returns null when nothing usable is there; a value that does not parse is ignored, not guessed.
 */
import { ISO_8601_DATE_TIME } from "./detect-time-format";

const KEYS = ["start_time_iso", "started at", "started_at", "start time", "start_time", "start", "date", "datetime"];

export function sessionStartTime(metadata: Record<string, string>): Date | null {
  const lower = new Map(Object.entries(metadata).map(([k, v]) => [k.trim().toLowerCase(), v.trim()]));
  for (const key of KEYS) {
    const v = lower.get(key);
    if (!v || !ISO_8601_DATE_TIME.test(v)) continue;
    // ISO 8601 without a zone is read as UTC, as the CSV time column is.
    const withZone = /(Z|[+-]\d{2}:?\d{2})$/.test(v) ? v : `${v.replace(" ", "T")}Z`;
    const ms = Date.parse(withZone);
    if (!Number.isNaN(ms)) return new Date(ms);
  }
  return null;
}
