import { readFileSync } from "node:fs";
import Papa from "papaparse";
import { ROLE_LABEL, type ChannelRole, type SessionSeries } from "@/lib/channels/roles";

/** File unit → SI factor (NIST SP 811 App. B: km/h = 1/3.6 m/s, bar = 100 000 Pa, mm = 0.001 m; all exact). */
const TO_SI: Record<string, number> = { "km/h": 1 / 3.6, bar: 1e5, mm: 1e-3 };

/**
 * Reads a sample-logs CSV ("# key: value" lines, then "Name [unit]" headers, empty cell = no
 * sample) into a SessionSeries, matching names to roles by their labels and converting to SI.
 */
export function readSampleCsv(file: string): SessionSeries {
  const parsed = Papa.parse<string[]>(readFileSync(file, "utf8"), { comments: "#", skipEmptyLines: true });
  const [header, ...rows] = parsed.data;
  if (!header) throw new Error(`${file}: no header row`);
  const byLabel = new Map(Object.entries(ROLE_LABEL).map(([role, label]) => [label, role as ChannelRole]));
  const timeS = new Float64Array(rows.length);
  const channels: SessionSeries["channels"] = {};
  header.forEach((h, col) => {
    const m = /^(.*?)\s*(?:\[(.*)\])?$/.exec(h.trim())!;
    const name = m[1] ?? "";
    const factor = TO_SI[m[2] ?? ""] ?? 1;
    if (name === "Time") {
      rows.forEach((r, i) => (timeS[i] = Number(r[col]) * (m[2] === "ms" ? 1e-3 : 1)));
      return;
    }
    const role = byLabel.get(name);
    if (!role || role === "time" || role === "other") return;
    const data = new Float32Array(rows.length);
    rows.forEach((r, i) => (data[i] = r[col] === "" || r[col] === undefined ? NaN : Number(r[col]) * factor));
    channels[role] = data;
  });
  return { timeS, channels };
}
