import { displayValue } from "./display-value";
import type { Finding } from "./types";

/** One event inside a collapsed finding. */
export interface Occurrence {
  lapNumber: number | null;
  startTimeS: number;
  endTimeS: number;
  measuredValue: number;
}

export interface CollapsedFinding extends Finding {
  /** Every event this finding stands for, in time order (one for a finding that did not repeat). */
  occurrences: Occurrence[];
}

/**
 * Lap numbers as a person writes them: runs of consecutive laps joined with an en dash, the last
 * two parts joined with "and" — [2,3,4,5,6,8,9,10,11] → "laps 2–6 and 8–11".
 */
export function formatLapList(laps: readonly number[]): string {
  const sorted = [...new Set(laps)].sort((a, b) => a - b);
  if (sorted.length === 0) return "";
  const parts: string[] = [];
  for (let i = 0; i < sorted.length; ) {
    let j = i;
    while (j + 1 < sorted.length && sorted[j + 1] === sorted[j] + 1) j++;
    parts.push(j === i ? String(sorted[i]) : j === i + 1 ? `${sorted[i]}, ${sorted[j]}` : `${sorted[i]}–${sorted[j]}`);
    i = j + 1;
  }
  const list = parts.length === 1 ? parts[0] : `${parts.slice(0, -1).join(", ")} and ${parts[parts.length - 1]}`;
  return `${sorted.length === 1 ? "lap" : "laps"} ${list}`;
}

/** Which way is worse: lower is worse for nothing we detect today; higher for all. */
const worse = (a: Finding, b: Finding) => a.measuredValue > b.measuredValue;

/**
 * Repeats of one kind on one channel in one session as one finding, as a person would write it:
 * the worst event's finding (its message, value and place) with the count and the laps named
 * ("Sensor flat or stuck … — 10 times, laps 2–6 and 8–11; worst shown"). It is then acknowledged
 * once. A finding that happened once is returned as it was. Order: by the first occurrence.
 */
export function collapseFindings(findings: readonly Finding[]): CollapsedFinding[] {
  const groups = new Map<string, Finding[]>();
  for (const f of findings) {
    const key = `${f.kind}|${f.channel ?? ""}`;
    const g = groups.get(key);
    if (g) g.push(f);
    else groups.set(key, [f]);
  }
  const out: CollapsedFinding[] = [];
  for (const g of groups.values()) {
    g.sort((a, b) => a.startTimeS - b.startTimeS);
    const occurrences = g.map((f) => ({ lapNumber: f.lapNumber, startTimeS: f.startTimeS, endTimeS: f.endTimeS, measuredValue: f.measuredValue }));
    if (g.length === 1) {
      out.push({ ...g[0], occurrences });
      continue;
    }
    let w = g[0];
    for (const f of g) if (worse(f, w)) w = f;
    const laps = g.map((f) => f.lapNumber).filter((l): l is number => l !== null);
    const outside = g.length - laps.length;
    const where = [laps.length ? formatLapList(laps) : "", outside ? `${outside} outside a lap` : ""].filter(Boolean).join(", ");
    const worst = displayValue(w.measuredValue, w.unit);
    const worstAt = w.lapNumber === null ? "" : ` on lap ${w.lapNumber}`;
    // The worst event's own sentence, without its trailing "on lap n" (the list names the laps).
    const own = w.message.replace(/ on lap \d+(?=[.:])/, "");
    out.push({
      ...w,
      // Where the list starts: the first event's place in the session.
      lapNumber: g[0].lapNumber,
      startTimeS: g[0].startTimeS,
      endTimeS: g[0].endTimeS,
      startIndex: g[0].startIndex,
      endIndex: g[0].endIndex,
      message: `${g.length} times, ${where}; worst ${worst ? worst.text : String(w.measuredValue)}${worstAt}. ${own}`,
      occurrences,
    });
  }
  return out.sort((a, b) => a.startTimeS - b.startTimeS || a.kind.localeCompare(b.kind));
}
