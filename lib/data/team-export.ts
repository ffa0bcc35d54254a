import "server-only";
/**
 * The owner's full export of the team's data as one zip, streamed: archiver writes each entry as
 * it is produced and the response sends the bytes on, so neither the archive nor an uploaded file
 * is ever held whole in memory. Contents:
 *   README.md           what each file holds and every column of the CSVs with its unit
 *   sessions.csv        one row per session, SI units
 *   laps.csv            one row per lap, SI units
 *   setup-sheets.json   every version of every setup sheet
 *   notes.json          session notes
 *   findings.json       findings with their acknowledgements
 *   uploads/<session id>-<file name>   the original uploaded files, byte for byte
 */
import { PassThrough, Readable } from "node:stream";
import type { ReadableStream as WebReadableStream } from "node:stream/web";
import archiver from "archiver";
import Papa from "papaparse";
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { forbidden } from "@/lib/http/http-error";
import { CSV_FORMULA_START } from "@/lib/export/lap-table-csv";
import { lapFigures } from "@/lib/record/lap-figures";
import { lapsOfSessions } from "./season-record";
import { jsonColumn } from "./json-column";

export const SESSION_COLUMNS: [string, string][] = [
  ["session_id", "Lapbench's id of the session"],
  ["title", "Session title"],
  ["kind", "practice, qualifying, race or test"],
  ["started_at", "Start of the recording, ISO 8601 in UTC"],
  ["event", "Event name"],
  ["event_starts_on", "First day of the event, ISO 8601 date"],
  ["track", "Track name"],
  ["rider", "Rider name"],
  ["bike", "Bike name"],
  ["engine", "Engine serial"],
  ["conditions", "Conditions as recorded by the team"],
  ["status", "uploaded, mapping, queued, parsing, ready or failed"],
  ["duration_s", "Length of the recording, s"],
  ["lap_count", "Laps found, including out- and in-laps"],
  ["best_lap_s", "Quickest flying lap, s"],
  ["best_three_mean_s", "Mean of the three quickest flying laps, s"],
  ["top_speed_m_per_s", "Highest lap top speed, m/s"],
  ["engine_hours", "Engine running time in the session, h (hour: the SI-accepted unit of engine life)"],
  ["distance_m", "Distance covered in the session, m"],
  ["findings_open", "Findings not yet acknowledged"],
  ["findings_acknowledged", "Findings acknowledged"],
  ["setup_version", "Latest setup-sheet version of the session"],
  ["original_file", "Path of the uploaded file inside this archive"],
];

export const LAP_COLUMNS: [string, string][] = [
  ["session_id", "Session the lap belongs to"],
  ["lap", "Lap number (1 = first lap of the recording)"],
  ["lap_time_s", "Lap time, s"],
  ["start_time_s", "Start of the lap from the start of the recording, s"],
  ["distance_m", "Lap distance, m"],
  ["top_speed_m_per_s", "Top speed in the lap, m/s"],
  ["sector_times_s", "Sector times, s, separated by '|'"],
  ["out_lap", "1 when the lap left the pit lane"],
  ["in_lap", "1 when the lap ended in the pit lane"],
  ["pit_pass", "1 when the lap passed through the pit lane"],
  ["invalid", "1 when the lap was marked invalid"],
];

export function exportReadme(teamName: string, at: Date): string {
  const table = (cols: [string, string][]) => ["| column | meaning |", "| --- | --- |", ...cols.map(([c, m]) => `| ${c} | ${m} |`)].join("\n");
  return `# ${teamName}: Lapbench export

Exported ${at.toISOString()}. Units are SI (s, m, m/s) unless a column says otherwise; times in UTC.
Text cells that a spreadsheet would read as a formula start with a single quote.

## sessions.csv

${table(SESSION_COLUMNS)}

## laps.csv

${table(LAP_COLUMNS)}

## setup-sheets.json

Every saved version of every setup sheet: session, bike, version, the fields with their units in
their names (N/mm, mm, bar, clicks out from fully closed), author and time. Nothing is overwritten in
Lapbench, so older versions are here too.

## notes.json, findings.json

Session notes with their author and time; findings with kind, lap, measured and threshold values
(SI, unit given), message and acknowledgement.

## uploads/

The original uploaded files, byte for byte, named \`<session id>-<file name>\`.
`;
}

const cell = (v: unknown) => (typeof v === "string" && CSV_FORMULA_START.test(v) ? `'${v}` : v);
const csv = (columns: [string, string][], rows: unknown[][]) => Papa.unparse({ fields: columns.map((c) => c[0]), data: rows.map((r) => r.map(cell)) }, { newline: "\n" }) + "\n";
const round = (x: number | null | undefined, d: number) => (x == null || !Number.isFinite(x) ? null : Number(x.toFixed(d)));
const safeName = (s: string) => s.replace(/[^A-Za-z0-9._-]+/g, "_").slice(0, 120) || "file";

/** Start the export; the returned stream is the zip. 403 for anyone but the owner. */
export async function teamExportStream(ctx: TeamContext): Promise<{ fileName: string; stream: Readable }> {
  if (ctx.role !== "owner") throw forbidden("Only the team owner exports the team's data.");
  const sequelize = getSequelize();
  const sessions = await sequelize.query<{
    id: number; title: string | null; kind: string; startedAt: Date | null; eventName: string | null; eventStartsOn: string | null; trackName: string | null; riderName: string | null; bikeName: string | null;
    engineSerial: string | null; conditions: string | null; status: string; durationS: number | null; summary: unknown; logName: string | null; logUrl: string | null; findingsOpen: number; findingsAck: number; setupVersion: number | null;
  }>(
    `SELECT rs.id, rs.title, rs.kind, rs.started_at AS startedAt, e.name AS eventName, DATE_FORMAT(e.starts_on, '%Y-%m-%d') AS eventStartsOn, t.name AS trackName, r.name AS riderName,
            b.name AS bikeName, en.serial AS engineSerial, rs.conditions, rs.status, rs.duration_s AS durationS, rs.summary, lf.name AS logName, lf.url AS logUrl,
            (SELECT COUNT(*) FROM findings f WHERE f.session_id = rs.id AND f.acknowledged_at IS NULL) AS findingsOpen,
            (SELECT COUNT(*) FROM findings f WHERE f.session_id = rs.id AND f.acknowledged_at IS NOT NULL) AS findingsAck,
            (SELECT MAX(ss.version) FROM setup_sheets ss WHERE ss.session_id = rs.id) AS setupVersion
       FROM ride_sessions rs LEFT JOIN events e ON e.id = rs.event_id LEFT JOIN tracks t ON t.id = COALESCE(rs.track_id, e.track_id)
       LEFT JOIN riders r ON r.id = rs.rider_id LEFT JOIN bikes b ON b.id = rs.bike_id LEFT JOIN engines en ON en.id = rs.engine_id
       LEFT JOIN log_files lf ON lf.id = rs.log_file_id
      WHERE rs.team_id = ? ORDER BY rs.started_at, rs.id`,
    { replacements: [ctx.teamId], type: QueryTypes.SELECT },
  );
  const laps = await lapsOfSessions(sessions.map((s) => s.id));
  const uploadPath = (s: { id: number; logName: string | null }) => (s.logName ? `uploads/${s.id}-${safeName(s.logName)}` : null);

  const archive = archiver("zip", { zlib: { level: 6 } });
  const out = new PassThrough();
  archive.on("warning", (e) => console.log(`[export] ${e.message}`));
  archive.on("error", (e) => out.destroy(e));
  archive.pipe(out);

  const at = new Date();
  archive.append(exportReadme(ctx.teamName, at), { name: "README.md" });
  archive.append(
    csv(
      SESSION_COLUMNS,
      sessions.map((s) => {
        const f = lapFigures(laps.get(s.id) ?? []);
        const eng = jsonColumn<{ engine?: { hours?: number; distanceM?: number } }>(s.summary)?.engine;
        return [
          s.id, s.title, s.kind, s.startedAt ? new Date(s.startedAt).toISOString() : null, s.eventName, s.eventStartsOn, s.trackName, s.riderName, s.bikeName, s.engineSerial, s.conditions, s.status,
          round(s.durationS, 3), (laps.get(s.id) ?? []).length, round(f.bestLapMs == null ? null : f.bestLapMs / 1000, 3), round(f.bestThreeMeanMs == null ? null : f.bestThreeMeanMs / 1000, 3),
          round(f.topSpeedMps, 3), round(eng?.hours, 4), round(eng?.distanceM, 1), Number(s.findingsOpen), Number(s.findingsAck), s.setupVersion, uploadPath(s),
        ];
      }),
    ),
    { name: "sessions.csv" },
  );
  const lapRows: unknown[][] = [];
  for (const s of sessions) {
    for (const l of laps.get(s.id) ?? []) {
      lapRows.push([s.id, l.number, round(l.lapTimeMs / 1000, 3), null, null, round(l.topSpeedMps, 3), (l.sectorTimesMs ?? []).map((x) => round(x / 1000, 3)).join("|"), +l.isOutLap, +l.isInLap, +l.pitPass, +l.isInvalid]);
    }
  }
  // Start time and distance of each lap (not in the season-record lap read).
  const extra = await sequelize.query<{ sessionId: number; number: number; startTimeS: number; distanceM: number | null }>(
    `SELECT l.session_id AS sessionId, l.number, l.start_time_s AS startTimeS, l.distance_m AS distanceM FROM laps l JOIN ride_sessions rs ON rs.id = l.session_id WHERE rs.team_id = ?`,
    { replacements: [ctx.teamId], type: QueryTypes.SELECT },
  );
  const byKey = new Map(extra.map((e) => [`${e.sessionId}:${e.number}`, e]));
  for (const r of lapRows) {
    const e = byKey.get(`${r[0]}:${r[1]}`);
    r[3] = round(e?.startTimeS, 3);
    r[4] = round(e?.distanceM, 1);
  }
  archive.append(csv(LAP_COLUMNS, lapRows), { name: "laps.csv" });

  const json = async (sql: string) => sequelize.query<Record<string, unknown>>(sql, { replacements: [ctx.teamId], type: QueryTypes.SELECT });
  const setups = await json(
    `SELECT s.id, s.session_id AS sessionId, b.name AS bike, s.version, s.fields, u.name AS author, s.created_at AS createdAt
       FROM setup_sheets s LEFT JOIN bikes b ON b.id = s.bike_id LEFT JOIN user u ON u.id = s.created_by WHERE s.team_id = ? ORDER BY s.session_id, s.version`,
  );
  for (const s of setups) s.fields = jsonColumn(s.fields);
  archive.append(JSON.stringify(setups, null, 2) + "\n", { name: "setup-sheets.json" });
  const notes = await json(`SELECT n.id, n.session_id AS sessionId, n.lap_number AS lap, u.name AS author, n.text, n.created_at AS createdAt FROM notes n LEFT JOIN user u ON u.id = n.author_id WHERE n.team_id = ? ORDER BY n.session_id, n.id`);
  archive.append(JSON.stringify(notes, null, 2) + "\n", { name: "notes.json" });
  const findings = await json(
    `SELECT f.id, f.session_id AS sessionId, f.kind, f.severity, f.lap_number AS lap, f.start_time_s AS startTimeS, f.distance_m AS distanceM, f.measured_value AS measured,
            f.threshold_value AS threshold, f.unit, f.message, u.name AS acknowledgedBy, f.acknowledged_at AS acknowledgedAt, f.note
       FROM findings f LEFT JOIN user u ON u.id = f.acknowledged_by WHERE f.team_id = ? ORDER BY f.session_id, f.id`,
  );
  archive.append(JSON.stringify(findings, null, 2) + "\n", { name: "findings.json" });

  // The uploads one after another: each is fetched only when the archive has taken the one before.
  void (async () => {
    try {
      for (const s of sessions) {
        const name = uploadPath(s);
        if (!name || !s.logUrl) continue;
        const res = await fetch(s.logUrl, { cache: "no-store" }).catch(() => null);
        if (!res?.ok || !res.body) {
          archive.append(`The uploaded file of session ${s.id} (${s.logName}) could not be read from storage (${res ? res.status : "no answer"}).\n`, { name: `${name}.missing.txt` });
          continue;
        }
        const done = new Promise<void>((resolve) => archive.once("entry", () => resolve()));
        archive.append(Readable.fromWeb(res.body as unknown as WebReadableStream<Uint8Array>), { name });
        await done;
      }
      await archive.finalize();
    } catch (e) {
      out.destroy(e instanceof Error ? e : new Error(String(e)));
    }
  })();
  const slug = safeName(ctx.teamSlug || ctx.teamName);
  return { fileName: `lapbench-${slug}-${at.toISOString().slice(0, 10)}.zip`, stream: out };
}
