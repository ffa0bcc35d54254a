import Papa from "papaparse";
import type { Lap } from "@/lib/laps/types";
import { formatLapTime } from "./format-lap-time";

/**
 * Leading characters that make a spreadsheet read a cell as a formula: = + - @ tab CR, per the
 * OWASP "CSV Injection" guidance; LF added because papaparse's own default pattern uses `.*$`,
 * which a multi-line cell slips past. Such text cells get a leading single quote.
 */
export const CSV_FORMULA_START = /^[=+\-@\t\r\n]/;

export interface LapTableCsvOptions {
  /** Text written in a "Session" column on every row (user-entered, so neutralised). */
  sessionLabel?: string;
  /** Notes by lap number (user-entered, so neutralised). */
  notes?: Record<number, string>;
  /** Field separator; default ",". */
  delimiter?: string;
}

function flagsOf(lap: Lap): string {
  const f: string[] = [];
  if (lap.outLap) f.push("out-lap");
  if (lap.inLap) f.push("in-lap");
  if (lap.pitPass) f.push("pit pass");
  if (!lap.complete) f.push("partial");
  if (lap.invalid) f.push("invalid");
  return f.join(" ");
}

/**
 * The lap table as CSV (papaparse `unparse`): one header row with units in brackets, one row per
 * lap. Lap and sector times both as m:ss.SSS text and as whole ms; start/end in session seconds.
 * Numbers are written as numbers; text cells starting with a formula character are prefixed with
 * a single quote (OWASP CSV injection guidance), via papaparse's escapeFormulae.
 */
export function lapTableCsv(laps: readonly Lap[], options: LapTableCsvOptions = {}): string {
  const sectorCount = laps.reduce((m, l) => Math.max(m, l.sectorTimesMs.length), 0);
  const fields: string[] = [];
  if (options.sessionLabel !== undefined) fields.push("Session");
  fields.push("Lap", "Lap time [m:ss.SSS]", "Lap time [ms]");
  for (let s = 1; s <= sectorCount; s++) fields.push(`Sector ${s} [ms]`);
  fields.push("Start [s]", "End [s]", "Flags", "Note");

  const data = laps.map((lap) => {
    const row: (string | number)[] = [];
    if (options.sessionLabel !== undefined) row.push(options.sessionLabel);
    row.push(lap.number, formatLapTime(lap.lapTimeMs), lap.lapTimeMs);
    for (let s = 0; s < sectorCount; s++) row.push(lap.sectorTimesMs[s] ?? "");
    row.push(Number(lap.startTimeS.toFixed(3)), Number(lap.endTimeS.toFixed(3)), flagsOf(lap));
    row.push(options.notes?.[lap.number] ?? "");
    return row;
  });
  return Papa.unparse(
    { fields, data },
    { escapeFormulae: CSV_FORMULA_START, delimiter: options.delimiter ?? ",", newline: "\r\n" },
  );
}
