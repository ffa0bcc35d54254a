import { findInvalidUtf8, lineOfOffset } from "./find-invalid-utf8";
import type { IngestErrorCode } from "./ingest-error";

export type SniffResult =
  | { format: "csv" | "gpx" | "nmea"; hasBom: boolean }
  | { format: "rejected"; code: IngestErrorCode; reason: string; byteOffset?: number; line?: number };

/** How many leading bytes callers should pass: enough for magic numbers and a few lines. */
export const SNIFF_BYTES = 64 * 1024;

const MAGIC: { bytes: number[]; name: string; code: IngestErrorCode }[] = [
  { bytes: [0x1f, 0x8b], name: "a gzip-compressed archive", code: "COMPRESSED_ARCHIVE" },
  { bytes: [0x50, 0x4b, 0x03, 0x04], name: "a zip archive (a spreadsheet workbook such as .xlsx is one too)", code: "COMPRESSED_ARCHIVE" },
  { bytes: [0x50, 0x4b, 0x05, 0x06], name: "an empty zip archive", code: "COMPRESSED_ARCHIVE" },
  { bytes: [0x37, 0x7a, 0xbc, 0xaf, 0x27, 0x1c], name: "a 7z archive", code: "COMPRESSED_ARCHIVE" },
  { bytes: [0x42, 0x5a, 0x68], name: "a bzip2-compressed archive", code: "COMPRESSED_ARCHIVE" },
  { bytes: [0xfd, 0x37, 0x7a, 0x58, 0x5a, 0x00], name: "an xz-compressed archive", code: "COMPRESSED_ARCHIVE" },
  { bytes: [0x25, 0x50, 0x44, 0x46], name: "a PDF document", code: "BINARY_FILE" },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0], name: "an old binary spreadsheet/document (OLE2)", code: "BINARY_FILE" },
];

function startsWith(bytes: Buffer, prefix: number[]): boolean {
  if (bytes.length < prefix.length) return false;
  for (let i = 0; i < prefix.length; i++) if (bytes[i] !== prefix[i]) return false;
  return true;
}

function extensionOf(fileName: string): string {
  const dot = fileName.lastIndexOf(".");
  return dot >= 0 ? fileName.slice(dot).toLowerCase() : "";
}

/**
 * Decide from the first bytes of an upload (SNIFF_BYTES is plenty) what it is: CSV, GPX or NMEA
 * 0183 text in UTF-8, or rejected with a reason the uploader can act on. Content decides, not the
 * file name; the name only makes messages clearer ("… renamed .csv").
 * `isWholeFile`: the buffer is the entire file, so a multi-byte character cut at its end is an error.
 */
export function sniffFormat(firstBytes: Buffer, fileName: string, isWholeFile = false): SniffResult {
  const ext = extensionOf(fileName);
  const renamed = ext ? ` renamed ${ext}` : "";
  if (firstBytes.length === 0) {
    return { format: "rejected", code: "EMPTY_FILE", reason: `"${fileName}" is empty (0 bytes).` };
  }
  for (const m of MAGIC) {
    if (startsWith(firstBytes, m.bytes)) {
      const advice = m.code === "COMPRESSED_ARCHIVE" ? " Unpack it and upload the CSV, GPX or NMEA file inside." : " Export the data as CSV, GPX or NMEA text.";
      return { format: "rejected", code: m.code, reason: `"${fileName}" is ${m.name}${renamed}, not a text file.${advice}` };
    }
  }
  if (startsWith(firstBytes, [0xff, 0xfe, 0x00, 0x00]) || startsWith(firstBytes, [0x00, 0x00, 0xfe, 0xff])) {
    return { format: "rejected", code: "NOT_UTF8", reason: `"${fileName}" is UTF-32 text (byte-order mark at the start), not UTF-8. Save it as UTF-8.` };
  }
  if (startsWith(firstBytes, [0xff, 0xfe]) || startsWith(firstBytes, [0xfe, 0xff])) {
    const order = firstBytes[0] === 0xff ? "little-endian" : "big-endian";
    return { format: "rejected", code: "NOT_UTF8", reason: `"${fileName}" is UTF-16 ${order} text (byte-order mark at the start), not UTF-8. Save it as UTF-8.` };
  }
  const hasBom = startsWith(firstBytes, [0xef, 0xbb, 0xbf]);
  const nul = firstBytes.indexOf(0);
  if (nul >= 0 && looksLikeNmea(Buffer.from(firstBytes.filter((b) => b !== 0)).toString("latin1"))) {
    // A GPS receiver that restarts mid-log writes NUL bytes between its sentences; the NMEA reader drops them.
    return { format: "nmea", hasBom };
  }
  if (nul >= 0) {
    // UTF-16 without a byte-order mark: ASCII text with every other byte NUL.
    let nulsAtOdd = 0;
    let nulsAtEven = 0;
    const probe = Math.min(firstBytes.length, 512);
    for (let i = 0; i < probe; i++) if (firstBytes[i] === 0) {
      if (i % 2) nulsAtOdd++;
      else nulsAtEven++;
    }
    if (Math.max(nulsAtOdd, nulsAtEven) > probe * 0.4 && Math.min(nulsAtOdd, nulsAtEven) < probe * 0.05) {
      return { format: "rejected", code: "NOT_UTF8", reason: `"${fileName}" looks like UTF-16 text without a byte-order mark (every other byte is zero), not UTF-8. Save it as UTF-8.` };
    }
    return {
      format: "rejected",
      code: "BINARY_FILE",
      byteOffset: nul,
      line: lineOfOffset(firstBytes, nul),
      reason: `"${fileName}" is a binary file, not text: a zero byte at byte offset ${nul} (line ${lineOfOffset(firstBytes, nul)}). Export the data as CSV, GPX or NMEA text.`,
    };
  }
  const bad = findInvalidUtf8(firstBytes, !isWholeFile);
  if (bad >= 0) {
    return {
      format: "rejected",
      code: "NOT_UTF8",
      byteOffset: bad,
      line: lineOfOffset(firstBytes, bad),
      reason: `"${fileName}" is not UTF-8: byte 0x${firstBytes[bad].toString(16).toUpperCase().padStart(2, "0")} at byte offset ${bad} (line ${lineOfOffset(firstBytes, bad)}) is not valid UTF-8 (Latin-1 or Windows-1252 text?). Save the file as UTF-8.`,
    };
  }
  const text = firstBytes.subarray(hasBom ? 3 : 0, Math.min(firstBytes.length, 4096)).toString("utf8").trimStart();
  if (text.startsWith("<")) {
    if (/<gpx[\s>]/.test(text)) return { format: "gpx", hasBom };
    const head = text.slice(0, 200).toLowerCase();
    if (head.startsWith("<!doctype html") || head.startsWith("<html")) {
      return { format: "rejected", code: "UNSUPPORTED_TEXT", reason: `"${fileName}" is a web page (HTML), not a data file.` };
    }
    if (text.startsWith("<?xml")) {
      return { format: "rejected", code: "GPX_NOT_GPX", reason: `"${fileName}" is XML but has no <gpx> root element in its first 4 KiB; only GPX 1.1 is accepted as XML.` };
    }
  }
  if (looksLikeNmea(text)) return { format: "nmea", hasBom };
  return { format: "csv", hasBom };
}

/** "$" + talker + sentence id + ",": any talker (GP, GN, GL, BD, proprietary P…), as NMEA 0183 allows. */
const NMEA_SENTENCE = /\$[A-Z][A-Z0-9]{3,6},/;

/**
 * NMEA 0183 text: the first line is a sentence, or most of the first lines that are not `#` notes
 * hold one (capture tools put notes first, some loggers prefix each sentence with a time stamp).
 */
function looksLikeNmea(text: string): boolean {
  const lines = text.split(/\r?\n/, 60).map((l) => l.trim()).filter((l) => l !== "");
  if (lines.length === 0) return false;
  if (/^\$(GP|GN|GL|GA|GB|BD)[A-Z]{3},/.test(lines[0])) return true;
  const body = lines.filter((l) => !l.startsWith("#"));
  const withSentence = lines.filter((l) => NMEA_SENTENCE.test(l) && /\*[0-9A-Fa-f]{2}$/.test(l)).length;
  if (body.length === 0) return withSentence > 0;
  const sentences = body.filter((l) => NMEA_SENTENCE.test(l)).length;
  return sentences >= Math.max(1, body.length / 2) || (withSentence > 0 && withSentence >= body.length / 4);
}
