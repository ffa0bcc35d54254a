/**
 * Import limits. They protect the worker (memory, time) and the database; the UI and README print
 * LIMIT_STATEMENTS so users know them before they upload.
 */
export interface IngestLimits {
  /** Largest file accepted, in bytes (counted on the bytes actually read). */
  maxBytes: number;
  /** Most columns in a CSV header. */
  maxColumns: number;
  /** Most data rows (samples of the master clock). */
  maxRows: number;
  /** Longest single line, in bytes. */
  maxLineBytes: number;
  /**
   * Largest GPX file: GPX is XML and is parsed whole in memory (CSV and NMEA are streamed), so it
   * has its own, smaller limit. Default GPX_MAX_BYTES.
   */
  maxGpxBytes?: number;
}

const MIB = 1024 * 1024;
export const GPX_MAX_BYTES = 64 * MIB;

export const LIMITS: Readonly<IngestLimits> = Object.freeze({
  maxBytes: 512 * MIB,
  maxColumns: 512,
  maxRows: 20_000_000,
  maxLineBytes: 1 * MIB,
  maxGpxBytes: GPX_MAX_BYTES,
});

function formatBytes(bytes: number): string {
  if (bytes >= MIB && bytes % MIB === 0) return `${bytes / MIB} MiB`;
  if (bytes >= 1024 && bytes % 1024 === 0) return `${bytes / 1024} KiB`;
  return `${bytes.toLocaleString("en-GB")} bytes`;
}

/** One human sentence per limit, for the upload page and the README. */
export function limitStatements(limits: IngestLimits = LIMITS): Record<keyof IngestLimits, string> {
  return {
    maxBytes: `Files up to ${formatBytes(limits.maxBytes)} are accepted.`,
    maxColumns: `A CSV file may have at most ${limits.maxColumns.toLocaleString("en-GB")} columns.`,
    maxRows: `A file may hold at most ${limits.maxRows.toLocaleString("en-GB")} rows of samples.`,
    maxLineBytes: `A single line may be at most ${formatBytes(limits.maxLineBytes)} long.`,
    maxGpxBytes: `A GPX file is read whole, so it may be at most ${formatBytes(limits.maxGpxBytes ?? GPX_MAX_BYTES)}; CSV and NMEA are streamed.`,
  };
}

export const LIMIT_STATEMENTS = limitStatements(LIMITS);

export { formatBytes };
