import type { ChannelRole } from "@/lib/channels/roles";
import type { CsvColumn } from "./csv-header";
import { detectTimeFormat } from "./detect-time-format";
import type { Mapping, MappedColumn, TimeFormat } from "./mapping";
import { lookupUnit, ROLE_QUANTITY } from "./units";

export interface SuggestedColumn extends MappedColumn {
  /** 0–1: how sure the suggestion is (name match, unit agreement). */
  confidence: number;
  /** Why, in a few words, for the mapping screen. */
  reason: string;
}

export interface MappingSuggestion extends Mapping {
  columns: SuggestedColumn[];
  timeConfidence: number;
}

/** Name patterns per role, tried in order (acceleration before latitude/longitude: "accel lat"). */
const RULES: { role: ChannelRole; pattern: RegExp; confidence: number }[] = [
  { role: "time", pattern: /^(time|timestamp|time stamp|elapsed|elapsed time|t|clock|utc time|time utc|date time|datetime|log time)$/, confidence: 0.95 },
  { role: "accel_long", pattern: /\b(accel|acceleration|acc)\b.*\b(x|long|longitudinal|fwd|forward)\b|\b(longitudinal|long) (accel|acceleration|g)\b/, confidence: 0.85 },
  { role: "accel_lat", pattern: /\b(accel|acceleration|acc)\b.*\b(y|lat|lateral|side)\b|\b(lateral|lat) (accel|acceleration|g)\b/, confidence: 0.85 },
  { role: "speed_front", pattern: /\b(front wheel speed|front speed|wheel speed front|speed front|front wheel)\b/, confidence: 0.95 },
  { role: "speed_rear", pattern: /\b(rear wheel speed|rear speed|wheel speed rear|speed rear|rear wheel)\b/, confidence: 0.95 },
  { role: "gps_speed", pattern: /\b(gps speed|speed gps|ground speed|speed over ground|sog)\b/, confidence: 0.95 },
  { role: "gps_lat", pattern: /^(gps )?(latitude|lat)( gps)?$/, confidence: 0.95 },
  { role: "gps_lon", pattern: /^(gps )?(longitude|lon|lng|long)( gps)?$/, confidence: 0.95 },
  { role: "gps_alt", pattern: /^(gps )?(altitude|alt|elevation|height)( gps)?$/, confidence: 0.9 },
  { role: "engine_rpm", pattern: /\b(rpm|engine speed|engine rpm|revs)\b/, confidence: 0.95 },
  { role: "throttle", pattern: /\b(throttle|tps|throttle position|twist ?grip)\b/, confidence: 0.9 },
  { role: "brake_front", pattern: /\b(front brake|brake front)\b/, confidence: 0.9 },
  { role: "brake_rear", pattern: /\b(rear brake|brake rear)\b/, confidence: 0.9 },
  { role: "tyre_temp_front", pattern: /\b(front (tyre|tire)|(tyre|tire) front)\b.*\btemp/, confidence: 0.9 },
  { role: "tyre_temp_rear", pattern: /\b(rear (tyre|tire)|(tyre|tire) rear)\b.*\btemp/, confidence: 0.9 },
  { role: "fork_travel", pattern: /\bfork\b/, confidence: 0.85 },
  { role: "shock_travel", pattern: /\b(shock|rear suspension|rear susp|suspension rear)\b/, confidence: 0.85 },
  { role: "lean_angle", pattern: /\b(lean|lean angle|roll angle|bank angle|roll)\b/, confidence: 0.85 },
  { role: "gear", pattern: /^(gear|gear position|current gear)$/, confidence: 0.9 },
  { role: "lap_beacon", pattern: /\b(beacon|lap marker|lap beacon)\b/, confidence: 0.9 },
  { role: "water_temp", pattern: /\b(water|coolant)\b/, confidence: 0.85 },
  { role: "lambda", pattern: /\b(lambda|afr|air fuel|air fuel ratio)\b/, confidence: 0.8 },
  { role: "gps_speed", pattern: /^speed$/, confidence: 0.4 },
];

/** Lower case; separators _ - . / become spaces; whitespace collapsed. */
export function normaliseName(name: string): string {
  return name
    .toLowerCase()
    .replace(/[_\-./]+/g, " ")
    .replace(/\s+/g, " ")
    .trim();
}

/** Units to assume when the header gives none. */
const DEFAULT_UNIT: Partial<Record<ChannelRole, string>> = {
  gps_lat: "deg",
  gps_lon: "deg",
  engine_rpm: "rpm",
  throttle: "%",
  lean_angle: "deg",
};

/**
 * Suggest a role and unit for each column from its name and unit; one column per role (the first
 * match wins, later ones become "other"); unmatched columns become "other". The time format comes
 * from the time column's unit and first values (`sampleRows`, as readCsvHeader returns them).
 */
export function suggestMapping(columns: CsvColumn[], sampleRows: string[][] = []): MappingSuggestion {
  const taken = new Set<ChannelRole>();
  const out: SuggestedColumn[] = [];
  for (const col of columns) {
    const norm = normaliseName(col.name);
    const known = col.unit ? lookupUnit(col.unit) : undefined;
    let chosen: SuggestedColumn | undefined;
    for (const rule of RULES) {
      if (taken.has(rule.role) || !rule.pattern.test(norm)) continue;
      const quantity = ROLE_QUANTITY[rule.role];
      let confidence = rule.confidence;
      let reason = `name matches ${rule.role.replace(/_/g, " ")}`;
      if (known && quantity && known.quantity !== quantity) {
        // "Fork [bar]": the name says one thing and the unit another; try the next rule.
        continue;
      }
      if (known) {
        confidence = Math.min(1, confidence + 0.05);
        reason += `, unit ${known.unit}`;
      } else if (col.unit && quantity !== "count" && quantity !== "lambda") {
        confidence *= 0.5;
        reason += `, unit '${col.unit}' not known`;
      }
      const unit = rule.role === "time" ? col.unit : known ? col.unit : col.unit || DEFAULT_UNIT[rule.role] || "";
      if (!col.unit && rule.role !== "time" && !DEFAULT_UNIT[rule.role] && quantity !== "count" && quantity !== "lambda") {
        confidence *= 0.6;
        reason += ", no unit given: choose one";
      }
      chosen = { index: col.index, name: col.name, role: rule.role, unit, scale: 1, offset: 0, confidence: round2(confidence), reason };
      taken.add(rule.role);
      break;
    }
    out.push(chosen ?? { index: col.index, name: col.name, role: "other", unit: col.unit, scale: 1, offset: 0, confidence: 0.2, reason: "no role recognised from the name" });
  }
  const timeCol = out.find((c) => c.role === "time");
  let timeFormat: TimeFormat = "seconds";
  let timeConfidence = 0;
  if (timeCol) {
    const firstValues = sampleRows.map((r) => r[timeCol.index] ?? "");
    const detected = detectTimeFormat(timeCol.unit, firstValues);
    timeFormat = detected.format;
    timeConfidence = detected.confidence;
    timeCol.unit = timeFormat === "milliseconds" ? "ms" : timeFormat === "seconds" ? "s" : "";
  }
  return { columns: out, timeFormat, timeConfidence };
}

function round2(x: number): number {
  return Math.round(x * 100) / 100;
}
