/**
 * GPX is XML and is parsed whole in memory, so it has its own size limit, separate from (and below)
 * the streamed formats' 512 MiB.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { parseGpx } from "@/lib/ingest/parse-gpx";
import { GPX_MAX_BYTES, LIMITS, LIMIT_STATEMENTS } from "@/lib/ingest/limits";
import { IngestError } from "@/lib/ingest";

const track = fs.readFileSync(path.resolve("tests/fixtures/formats/track.gpx"));

describe("GPX size limit", () => {
  it("is 64 MiB by default, below the streamed formats' limit, and stated on the upload page", () => {
    expect(GPX_MAX_BYTES).toBe(64 * 1024 * 1024);
    expect(LIMITS.maxGpxBytes).toBeLessThan(LIMITS.maxBytes);
    expect(LIMIT_STATEMENTS.maxGpxBytes).toBe("A GPX file is read whole, so it may be at most 64 MiB; CSV and NMEA are streamed.");
  });

  it("refuses a GPX file above its limit with a clear message, and reads one at the limit", () => {
    const limits = { ...LIMITS, maxGpxBytes: track.length - 1 };
    let err: unknown;
    try {
      parseGpx(track, { fileName: "track.gpx", limits });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(IngestError);
    expect((err as IngestError).code).toBe("FILE_TOO_LARGE");
    expect((err as Error).message).toMatch(/^"track\.gpx" is [\d,]+ bytes; a GPX file is read whole, so the limit is [\d,]+ bytes\. Split the track, or export it as NMEA 0183 or CSV/);
    expect(parseGpx(track, { fileName: "track.gpx", limits: { ...LIMITS, maxGpxBytes: track.length } }).metadata.source_format).toBe("gpx");
  });
});
