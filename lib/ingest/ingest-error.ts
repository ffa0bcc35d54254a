/**
 * The one error type the import path throws. `message` is written for the person who uploaded the
 * file: it names the line, the column and what was expected, so they can fix the export.
 */
export const INGEST_ERROR_CODES = [
  "EMPTY_FILE",
  "BINARY_FILE",
  "COMPRESSED_ARCHIVE",
  "NOT_UTF8",
  "UNSUPPORTED_TEXT",
  "NO_HEADER",
  "HEADER_ONLY",
  "WRONG_DELIMITER",
  "DUPLICATE_HEADER",
  "EMPTY_HEADER_NAME",
  "FORMULA_IN_HEADER",
  "HEADER_NAME_TOO_LONG",
  "MAPPING_MISMATCH",
  "NO_TIME_COLUMN",
  "ONLY_TIME_COLUMN",
  "UNKNOWN_UNIT",
  "MISSING_UNIT",
  "NOT_A_NUMBER",
  "NON_FINITE_NUMBER",
  "NUMBER_OUT_OF_RANGE",
  "BAD_TIME",
  "TIME_BACKWARDS",
  "DUPLICATE_TIME",
  "FIELD_COUNT",
  "TRUNCATED_LINE",
  "UNCLOSED_QUOTE",
  "LINE_TOO_LONG",
  "TOO_MANY_COLUMNS",
  "TOO_MANY_ROWS",
  "FILE_TOO_LARGE",
  "XML_INVALID",
  "GPX_NOT_GPX",
  "GPX_NO_POINTS",
  "GPX_BAD_POINT",
  "NMEA_ALL_BAD_CHECKSUMS",
  "NMEA_NO_SENTENCES",
  "NMEA_NO_FIX",
] as const;

export type IngestErrorCode = (typeof INGEST_ERROR_CODES)[number];

export interface IngestErrorDetails {
  /** 1-based line in the file. */
  line?: number;
  /** Column name as written in the header (CSV). */
  column?: string;
  /** 0-based byte offset in the file. */
  byteOffset?: number;
  /** DUPLICATE_TIME: how many rows repeat the time stamp of the row before. */
  duplicateRows?: number;
}

export class IngestError extends Error {
  readonly code: IngestErrorCode;
  readonly line?: number;
  readonly column?: string;
  readonly byteOffset?: number;
  readonly duplicateRows?: number;

  constructor(code: IngestErrorCode, message: string, details: IngestErrorDetails = {}) {
    super(message);
    this.name = "IngestError";
    this.code = code;
    this.line = details.line;
    this.column = details.column;
    this.byteOffset = details.byteOffset;
    this.duplicateRows = details.duplicateRows;
  }

  /** Plain object for a job record or a JSON response. */
  toJSON(): { code: IngestErrorCode; message: string } & IngestErrorDetails {
    return { code: this.code, message: this.message, line: this.line, column: this.column, byteOffset: this.byteOffset };
  }
}

/** Quote a cell or name for a message, cut to a readable length. */
export function quoteForMessage(text: string, max = 40): string {
  const oneLine = text.replace(/[\r\n\t]/g, " ");
  return `'${oneLine.length > max ? oneLine.slice(0, max) + "…" : oneLine}'`;
}
