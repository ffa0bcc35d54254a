import { findInvalidUtf8 } from "./find-invalid-utf8";
import { IngestError } from "./ingest-error";
import { formatBytes, type IngestLimits } from "./limits";
import { SNIFF_BYTES, sniffFormat, type SniffResult } from "./sniff-format";

export interface DecodeProgress {
  bytesRead: number;
  /** Complete lines seen so far (LF count). */
  lines: number;
  /** NUL bytes dropped (only with `dropNul`). */
  nulBytes?: number;
}

export interface DecodeOptions {
  limits: IngestLimits;
  /** For messages ("… renamed .csv"). */
  fileName: string;
  /** Called once with the sniffed format before any text is yielded; throw to refuse it. */
  onFormat?: (sniff: Exclude<SniffResult, { format: "rejected" }>) => void;
  progress?: DecodeProgress;
  /**
   * Drop NUL bytes instead of refusing the file, counting them in `progress.nulBytes`: a GPS
   * receiver that restarts mid-log writes a few (NMEA only; a CSV with one is still binary).
   */
  dropNul?: boolean;
}

/**
 * Turn a byte stream into UTF-8 text chunks with LF line endings, enforcing on the bytes as they
 * arrive: the file size limit, the line length limit, no NUL bytes, valid UTF-8 (with the byte
 * offset of the first bad byte), and the sniffed format of the first bytes. The BOM is dropped.
 * Line endings: LF and CR LF (also mixed in one file) become LF; a lone CR is refused with its line,
 * because it would otherwise hide inside a cell.
 */
export async function* decodeTextStream(source: AsyncIterable<Buffer | string | Uint8Array>, options: DecodeOptions): AsyncGenerator<string> {
  const { limits, fileName } = options;
  const progress = options.progress ?? { bytesRead: 0, lines: 0 };
  const decoder = new TextDecoder("utf-8", { fatal: true, ignoreBOM: false });
  let head: Buffer[] | null = [];
  let headBytes = 0;
  let lineBytes = 0;
  let line = 1;
  let pendingCr = false;
  let tail: Buffer = Buffer.alloc(0);

  function* handle(buf: Buffer): Generator<string> {
    const chunkStart = progress.bytesRead;
    progress.bytesRead += buf.length;
    if (progress.bytesRead > limits.maxBytes) {
      throw new IngestError("FILE_TOO_LARGE", `The file is larger than the limit of ${formatBytes(limits.maxBytes)} (more than ${progress.bytesRead.toLocaleString("en-GB")} bytes read).`, {
        byteOffset: limits.maxBytes,
      });
    }
    let nul = buf.indexOf(0);
    if (nul >= 0 && options.dropNul) {
      const kept = Buffer.allocUnsafe(buf.length);
      let k = 0;
      for (let i = 0; i < buf.length; i++) if (buf[i] !== 0) kept[k++] = buf[i];
      progress.nulBytes = (progress.nulBytes ?? 0) + (buf.length - k);
      buf = kept.subarray(0, k);
      nul = -1;
    }
    if (nul >= 0) {
      throw new IngestError("BINARY_FILE", `Zero byte at byte offset ${chunkStart + nul} (line ${line + countLf(buf, nul)}): this is a binary file, not text.`, {
        line: line + countLf(buf, nul),
        byteOffset: chunkStart + nul,
      });
    }
    // Line lengths, counted in bytes between LFs.
    let pos = 0;
    for (;;) {
      const lf = buf.indexOf(0x0a, pos);
      const end = lf < 0 ? buf.length : lf;
      lineBytes += end - pos;
      if (lineBytes > limits.maxLineBytes) {
        throw new IngestError("LINE_TOO_LONG", `Line ${line} is longer than the limit of ${formatBytes(limits.maxLineBytes)}; is this really a CSV, GPX or NMEA file?`, { line });
      }
      if (lf < 0) break;
      line++;
      progress.lines++;
      lineBytes = 0;
      pos = lf + 1;
    }
    let text: string;
    try {
      text = decoder.decode(buf, { stream: true });
    } catch {
      const joined = Buffer.concat([tail, buf]);
      const at = findInvalidUtf8(joined, true);
      const offset = chunkStart - tail.length + Math.max(at, 0);
      const byte = at >= 0 ? ` 0x${joined[at].toString(16).toUpperCase().padStart(2, "0")}` : "";
      const badLine = at >= 0 ? line - countLf(joined, joined.length) + countLf(joined, at) : line;
      throw new IngestError(
        "NOT_UTF8",
        `The file is not UTF-8: byte${byte} at byte offset ${offset} (line ${badLine}) is not valid UTF-8 (Latin-1 or Windows-1252 text?). Save the file as UTF-8.`,
        { line: badLine, byteOffset: offset },
      );
    }
    tail = buf.subarray(Math.max(0, buf.length - 3));
    yield* normaliseLineEndings(text);
  }

  function* normaliseLineEndings(text: string): Generator<string> {
    if (pendingCr) text = "\r" + text;
    pendingCr = text.endsWith("\r");
    if (pendingCr) text = text.slice(0, -1);
    if (text.indexOf("\r") >= 0) {
      const lone = /\r(?!\n)/.exec(text);
      if (lone) {
        const lineOfCr = line - countChar(text, "\n") + countChar(text.slice(0, lone.index), "\n");
        throw new IngestError("UNSUPPORTED_TEXT", `Line ${lineOfCr} ends with a lone carriage return (CR, an old Mac line ending); save the file with LF or CR LF line endings.`, { line: lineOfCr });
      }
      text = text.replace(/\r\n/g, "\n");
    }
    if (text.length > 0) yield text;
  }

  for await (const raw of source) {
    const buf = typeof raw === "string" ? Buffer.from(raw, "utf8") : Buffer.isBuffer(raw) ? raw : Buffer.from(raw.buffer, raw.byteOffset, raw.byteLength);
    if (head) {
      head.push(buf);
      headBytes += buf.length;
      if (headBytes < SNIFF_BYTES) continue;
      const first = Buffer.concat(head);
      head = null;
      checkSniff(first, fileName, false, options.onFormat);
      yield* handle(first);
    } else {
      yield* handle(buf);
    }
  }
  if (head) {
    const first = Buffer.concat(head);
    head = null;
    checkSniff(first, fileName, true, options.onFormat);
    yield* handle(first);
  }
  try {
    const rest = decoder.decode();
    if (rest) yield* normaliseLineEndings(rest);
  } catch {
    throw new IngestError("NOT_UTF8", `The file is not UTF-8: it ends inside a multi-byte character (byte offset ${progress.bytesRead - 1}). Save the file as UTF-8.`, {
      byteOffset: progress.bytesRead - 1,
    });
  }
  if (pendingCr) {
    throw new IngestError("UNSUPPORTED_TEXT", `Line ${line} ends with a lone carriage return (CR, an old Mac line ending); save the file with LF or CR LF line endings.`, { line });
  }
}

function checkSniff(first: Buffer, fileName: string, whole: boolean, onFormat: DecodeOptions["onFormat"]): void {
  const sniff = sniffFormat(first, fileName, whole);
  if (sniff.format === "rejected") {
    throw new IngestError(sniff.code, sniff.reason, { byteOffset: sniff.byteOffset, line: sniff.line });
  }
  onFormat?.(sniff);
}

function countLf(buf: Uint8Array, end: number): number {
  let n = 0;
  for (let i = 0; i < end; i++) if (buf[i] === 0x0a) n++;
  return n;
}

function countChar(s: string, ch: string): number {
  let n = 0;
  for (let i = s.indexOf(ch); i >= 0; i = s.indexOf(ch, i + 1)) n++;
  return n;
}
