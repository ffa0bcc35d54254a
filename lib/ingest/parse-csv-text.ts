import type { IngestLimits } from "./limits";
import { LIMITS } from "./limits";
import type { Mapping } from "./mapping";
import { parseCsvStream } from "./parse-csv-stream";
import type { ParsedSeries } from "./parsed-series";

/**
 * Non-streaming wrapper for small inputs (previews, tests): the same checks and output as
 * parseCsvStream. The worker streams files; do not use this for uploads.
 */
export function parseCsvText(text: string | Buffer, mapping: Mapping, limits: IngestLimits = LIMITS, fileName = "upload.csv"): Promise<ParsedSeries> {
  const bytes = typeof text === "string" ? Buffer.from(text, "utf8") : text;
  async function* one(): AsyncGenerator<Buffer> {
    // 64 KiB pieces, like a file stream, so chunk boundaries are exercised too.
    for (let i = 0; i < bytes.length; i += 65536) yield bytes.subarray(i, i + 65536);
  }
  return parseCsvStream(one(), mapping, limits, undefined, { fileName });
}
