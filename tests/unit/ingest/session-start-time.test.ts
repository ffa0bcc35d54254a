import { describe, it, expect } from "vitest";
import { sessionStartTime } from "@/lib/ingest/session-start-time";

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
