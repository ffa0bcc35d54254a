import Papa from "papaparse";
import { IngestError, quoteForMessage } from "./ingest-error";
import { LIMITS, type IngestLimits } from "./limits";
import { normaliseUnit } from "./units";

export type CsvDelimiter = "," | ";" | "\t";

export interface CsvColumn {
  /** 0-based field index in each line. */
  index: number;
  /** Name without the unit, whitespace collapsed. */
  name: string;
  /** Unit as written between [..] or (..) after the name, "" if none. */
  unit: string;
  /** The header cell as written (trimmed). */
  header: string;
}

export interface CsvHeader {
  /** `# key: value` lines before the header. */
  metadata: Record<string, string>;
  delimiter: CsvDelimiter;
  /** Numbers are written with a decimal comma ("12,5"); only with ";" or tab delimiters. */
  decimalComma: boolean;
  columns: CsvColumn[];
  /** Fields per line, including a trailing empty field when every line ends with a delimiter. */
  fieldCount: number;
  /** 1-based line number of the header row. */
  headerLine: number;
  /** 1-based line number of the first line after the header. */
  dataStartLine: number;
  /** Character index in `text` where that line starts. */
  dataStartOffset: number;
  /** The first data rows (up to SAMPLE_ROWS), split with the chosen delimiter. */
  sampleRows: string[][];
}

const SAMPLE_ROWS = 20;
const MAX_NAME_CHARS = 160; // channels.name is VARCHAR(160)
const MAX_METADATA_LINES = 200;
const DELIMITERS: readonly CsvDelimiter[] = [",", ";", "\t"];
const DELIMITER_WORD: Record<CsvDelimiter, string> = { ",": "comma", ";": "semicolon", "\t": "tab" };

interface Line {
  text: string;
  start: number;
  /** Index after the line's terminator. */
  end: number;
  number: number;
}

/** Split into lines with their offsets; accepts \n, \r\n and lone \r. */
function splitLines(text: string, isComplete: boolean): Line[] {
  const lines: Line[] = [];
  const re = /\r\n|\n|\r/g;
  let start = 0;
  let n = 1;
  let m: RegExpExecArray | null;
  while ((m = re.exec(text)) !== null) {
    lines.push({ text: text.slice(start, m.index), start, end: m.index + m[0].length, number: n++ });
    start = m.index + m[0].length;
  }
  // The rest is a whole line only if the text is the whole file; otherwise it may be cut.
  if (start < text.length && isComplete) lines.push({ text: text.slice(start), start, end: text.length, number: n });
  return lines;
}

function splitFields(line: string, delimiter: string): string[] {
  const parsed = Papa.parse<string[]>(line, { delimiter, newline: "\n", header: false, quoteChar: '"' });
  return parsed.data[0] ?? [""];
}

/** Looks like a spreadsheet formula (CSV injection): =…, @…, or +/-… with a DDE pipe or sheet "!". */
function looksLikeFormula(cell: string): boolean {
  if (/^[=@]/.test(cell)) return true;
  if (/^[+-]/.test(cell) && /[|!]/.test(cell)) return true;
  return false;
}

const NUMBER_LIKE = /^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$/;

/** Name and unit from "Front brake [bar]" or "Front brake (bar)"; the last bracket group is the unit. */
export function splitNameAndUnit(cell: string): { name: string; unit: string } {
  const m = /^(.*?)\s*(?:\[([^\[\]]*)\]|\(([^()]*)\))\s*$/.exec(cell);
  if (!m) return { name: cell, unit: "" };
  return { name: m[1].trim(), unit: (m[2] ?? m[3] ?? "").trim() };
}

/**
 * Read the start of a CSV export: `# key: value` metadata lines, the delimiter (the one of , ; tab
 * that gives the header and the first data lines the same field count, at least two), decimal
 * comma, and the header row with names and units. Throws IngestError with the line and column
 * for a header Lapbench cannot use.
 * `text`: the decoded start of the file (a BOM is skipped). `isComplete`: text is the whole file.
 */
export function readCsvHeader(text: string, isComplete: boolean, limits: IngestLimits = LIMITS): CsvHeader {
  const bomSkip = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  const lines = splitLines(text.slice(bomSkip), isComplete);
  const metadata: Record<string, string> = {};
  let i = 0;
  let metadataLines = 0;
  for (; i < lines.length; i++) {
    const t = lines[i].text.trim();
    if (t === "") continue;
    if (!t.startsWith("#")) break;
    if (++metadataLines > MAX_METADATA_LINES) {
      throw new IngestError("NO_HEADER", `More than ${MAX_METADATA_LINES} '#' metadata lines before the header (line ${lines[i].number}); is the header missing?`, { line: lines[i].number });
    }
    const m = /^#\s*([^:]{1,64}?)\s*:\s*(.*)$/.exec(t);
    if (m) metadata[m[1]] = m[2].replace(/[,;\t]+$/, "").trim().slice(0, 1000);
  }
  if (i >= lines.length) {
    const what = metadataLines > 0 ? "only '#' metadata lines" : "no lines";
    throw new IngestError(lines.length === 0 && text.trim() === "" ? "EMPTY_FILE" : "NO_HEADER", `The file has ${what} and no header row naming the columns.`);
  }
  const headerLine = lines[i];
  const dataLines: Line[] = [];
  for (let k = i + 1; k < lines.length && dataLines.length < SAMPLE_ROWS; k++) {
    if (lines[k].text.trim() !== "") dataLines.push(lines[k]);
  }

  // Delimiter: consistent field counts over the header and the first data lines.
  type Candidate = { d: CsvDelimiter; header: string[]; counts: number[]; consistent: boolean };
  const candidates: Candidate[] = DELIMITERS.map((d) => {
    const header = splitFields(headerLine.text, d);
    const counts = dataLines.map((l) => splitFields(l.text, d).length);
    return { d, header, counts, consistent: header.length >= 2 && counts.every((c) => c === header.length) };
  });
  const best = (list: Candidate[]) => list.reduce((a, b) => (b.header.length > a.header.length ? b : a));
  const consistent = candidates.filter((c) => c.consistent);
  const multi = candidates.filter((c) => c.header.length >= 2);
  if (multi.length === 0) {
    // One column: either a real single-column file (only a time column, say) or another delimiter.
    const other = ["|", ":", " ", "/"].find((c) => {
      const h = splitFields(headerLine.text, c).length;
      return h >= 2 && dataLines.length > 0 && dataLines.every((l) => splitFields(l.text, c).length === h);
    }) ?? (headerLine.text.includes("|") ? "|" : undefined);
    if (other !== undefined || dataLines.length === 0) {
      const hint = other ? ` It seems to use ${quoteForMessage(other)}, which is not accepted.` : "";
      throw new IngestError(
        "WRONG_DELIMITER",
        `Line ${headerLine.number} (the header) splits into only one column with comma, semicolon or tab.${hint} Accepted delimiters: comma, semicolon, tab.`,
        { line: headerLine.number },
      );
    }
  }
  const chosen = consistent.length > 0 ? best(consistent) : multi.length > 0 ? best(multi) : candidates[0];
  const delimiter = chosen.d;
  const cells = chosen.header.map((c) => c.trim());
  if (cells.length > limits.maxColumns) {
    throw new IngestError(
      "TOO_MANY_COLUMNS",
      `The header (line ${headerLine.number}) has ${cells.length.toLocaleString("en-GB")} columns; at most ${limits.maxColumns.toLocaleString("en-GB")} are accepted.`,
      { line: headerLine.number },
    );
  }
  if (cells.every((c) => c === "" || NUMBER_LIKE.test(c))) {
    throw new IngestError(
      "NO_HEADER",
      `Line ${headerLine.number} holds numbers, not column names: the first line after the '#' metadata must be the header row, e.g. "Time [s]${delimiter}Front wheel speed [km/h]".`,
      { line: headerLine.number },
    );
  }
  const sampleRows = dataLines.map((l) => splitFields(l.text, delimiter));
  const sampleCells = sampleRows.flat();
  const decimalComma =
    delimiter !== "," && sampleCells.some((c) => /^[+-]?\d*,\d+$/.test(c.trim())) && !sampleCells.some((c) => /^[+-]?\d*\.\d+$/.test(c.trim()));

  // A trailing empty header cell (every line ends with the delimiter) is an export artefact.
  const fieldCount = cells.length;
  const named = cells[cells.length - 1] === "" && cells.length > 2 ? cells.slice(0, -1) : cells;
  const columns: CsvColumn[] = [];
  const seen = new Map<string, number>();
  named.forEach((raw, index) => {
    const where = `Line ${headerLine.number}, column ${index + 1}`;
    if (looksLikeFormula(raw)) {
      throw new IngestError(
        "FORMULA_IN_HEADER",
        `${where}: the header name ${quoteForMessage(raw)} starts like a spreadsheet formula (=, @, or + / - with | or !); rename the column with plain text.`,
        { line: headerLine.number, column: raw },
      );
    }
    const clean = raw.replace(/[\u0000-\u001f\u007f]+/g, " ").replace(/\s+/g, " ").trim();
    const { name, unit } = splitNameAndUnit(clean);
    if (name === "") {
      const around = [named[index - 1], named[index + 1]].filter((s) => s !== undefined && s !== "").map((s) => quoteForMessage(s!));
      throw new IngestError(
        "EMPTY_HEADER_NAME",
        `${where} has no name${around.length ? ` (next to ${around.join(" and ")})` : ""}; every column needs a name in the header row.`,
        { line: headerLine.number },
      );
    }
    if (clean.length > MAX_NAME_CHARS) {
      throw new IngestError("HEADER_NAME_TOO_LONG", `${where}: the header name is ${clean.length} characters long; at most ${MAX_NAME_CHARS} are accepted.`, { line: headerLine.number, column: clean.slice(0, 40) });
    }
    const key = `${name.toLowerCase()}|${normaliseUnit(unit)}`;
    const first = seen.get(key);
    if (first !== undefined) {
      throw new IngestError(
        "DUPLICATE_HEADER",
        `${where}: the header name ${quoteForMessage(clean)} appears twice, in columns ${first + 1} and ${index + 1}; column names must be unique.`,
        { line: headerLine.number, column: clean },
      );
    }
    seen.set(key, index);
    columns.push({ index, name, unit, header: clean });
  });

  const dataStartOffset = bomSkip + headerLine.end;
  return {
    metadata,
    delimiter,
    decimalComma,
    columns,
    fieldCount,
    headerLine: headerLine.number,
    dataStartLine: headerLine.number + 1,
    dataStartOffset,
    sampleRows,
  };
}

export { DELIMITER_WORD };
