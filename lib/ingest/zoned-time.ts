/**
 * Local wall-clock times in an IANA time zone (e.g. "Europe/Madrid"), with the zone rules of the
 * runtime's ICU data (Intl) — no table of our own.
 */

/** True when `timeZone` is an IANA zone name the runtime knows. */
export function isTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat("en-GB", { timeZone }).format(0);
    return true;
  } catch {
    return false;
  }
}

/** The zone's offset from UTC (ms, east positive) at the instant `utcMs`. */
export function zoneOffsetMs(utcMs: number, timeZone: string): number {
  const parts = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
  }).formatToParts(new Date(utcMs));
  const get = (type: string) => Number(parts.find((p) => p.type === type)!.value);
  const asUtc = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  return asUtc - (utcMs - (((utcMs % 1000) + 1000) % 1000));
}

/**
 * The UTC instant of a wall-clock time in `timeZone`, given as the ms the same digits would mean
 * in UTC (what a zone-less ISO date-time parses to). Two passes settle the offset across a change
 * of daylight-saving time; a time skipped by the change resolves to the later offset.
 */
export function wallClockToUtcMs(wallAsUtcMs: number, timeZone: string): number {
  let utc = wallAsUtcMs - zoneOffsetMs(wallAsUtcMs, timeZone);
  utc = wallAsUtcMs - zoneOffsetMs(utc, timeZone);
  return utc;
}

/** "2031-05-17 12:02" in the zone, for showing beside UTC. */
export function formatInZone(utcIso: string, timeZone: string): string {
  const ms = Date.parse(utcIso);
  const local = new Date(ms + zoneOffsetMs(ms, timeZone)).toISOString();
  return `${local.slice(0, 10)} ${local.slice(11, 16)}`;
}
