import { describe, it, expect } from "vitest";
import { sessionStartTime } from "@/lib/ingest/session-start-time";
import { formatInZone, isTimeZone } from "@/lib/ingest/zoned-time";

// Expected instants written out by hand from the ISO 8601 strings (RFC 3339 profile: "Z" = UTC,
// ±hh:mm offsets subtract from local time).
describe("sessionStartTime", () => {
  it.each([
    [{ start_time_iso: "2031-05-17T10:02:00.000Z" }, "2031-05-17T10:02:00.000Z"],
    [{ "started at": "2031-05-17T10:02:00.000Z" }, "2031-05-17T10:02:00.000Z"],
    [{ "Start Time": "2031-05-17T12:02:00+02:00" }, "2031-05-17T10:02:00.000Z"],
    [{ date: "2031-05-17 10:02:00" }, "2031-05-17T10:02:00.000Z"],
    // Absolute time stamps from the data win over a metadata line.
    [{ start_time_iso: "2031-05-17T10:02:00.250Z", "started at": "2031-05-17T09:00:00Z" }, "2031-05-17T10:02:00.250Z"],
  ])("%j → %s", (meta, iso) => {
    expect(sessionStartTime(meta)?.toISOString()).toBe(iso);
  });

  it.each([[{}], [{ "started at": "yesterday morning" }], [{ date: "17/05/2031" }], [{ rider: "2031-05-17T10:02:00Z" }]])("%j → null", (meta) => {
    expect(sessionStartTime(meta)).toBeNull();
  });
});

describe("a start time without a zone is read in the track's time zone", () => {
  // IANA tz database: Europe/Madrid is UTC+1 (CET) in winter and UTC+2 (CEST) from the last Sunday
  // of March to the last Sunday of October; Australia/Perth is UTC+8 all year.
  it.each([
    [{ date: "2024-05-01 10:00:00" }, "Europe/Madrid", "2024-05-01T08:00:00.000Z"],
    [{ date: "2024-01-15 10:00:00" }, "Europe/Madrid", "2024-01-15T09:00:00.000Z"],
    [{ date: "2024-01-15 10:00:00" }, "Australia/Perth", "2024-01-15T02:00:00.000Z"],
    // The CSV reader marks a zone-less ISO time column: its start is wall-clock time too.
    [{ start_time_iso: "2024-05-01T10:00:00.000Z", time_zone_in_file: "no" }, "Europe/Madrid", "2024-05-01T08:00:00.000Z"],
    // A time that says its zone is not moved.
    [{ start_time_iso: "2024-05-01T10:00:00.000Z" }, "Europe/Madrid", "2024-05-01T10:00:00.000Z"],
    [{ date: "2024-05-01T10:00:00+02:00" }, "Australia/Perth", "2024-05-01T08:00:00.000Z"],
    // No zone on the track: UTC, as before.
    [{ date: "2024-05-01 10:00:00" }, null, "2024-05-01T10:00:00.000Z"],
  ])("%j in %s → %s", (meta, zone, iso) => {
    expect(sessionStartTime(meta, zone)?.toISOString()).toBe(iso);
  });

  it("is shown in local time with UTC beside it", () => {
    expect(formatInZone("2024-05-01T08:00:00.000Z", "Europe/Madrid")).toBe("2024-05-01 10:00");
    expect(isTimeZone("Europe/Madrid")).toBe(true);
    expect(isTimeZone("Mars/Olympus")).toBe(false);
  });
});
