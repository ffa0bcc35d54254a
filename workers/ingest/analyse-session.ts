/**
 * The analysis that runs at ingest, inside the session's write transaction, so a session becomes
 * visible with its laps, findings and summary or not at all.
 */
import type { Sequelize, Transaction } from "sequelize";
import type { RideSession } from "../../models";
import type { ChannelRole } from "../../lib/channels/roles";
import type { ParsedSeries } from "../../lib/ingest/parsed-series";
import type { NumericArray, SeriesLike } from "../../lib/laps/types";
import type { SessionAnalysisSummary } from "../../lib/analysis/analyse-series";
import { analyseSessionInTransaction } from "../../lib/data/session-analysis";

/**
 * The roles analyseSeries (and guessTrack) read, with where: the only channels the worker keeps in
 * memory for the analysis; all others are written as they are parsed and dropped. A role added to
 * a detector must be added here too, or ingest would analyse without it (re-analysis from the
 * stored chunks reads every role and would then disagree).
 */
export const ANALYSED_ROLES: ReadonlySet<ChannelRole> = new Set<ChannelRole>([
  "speed_front", // lap stats, ground speed, distance, engine usage, wheel spin, GPS faults, sensor flat
  "speed_rear", // same, as the fallback; wheel spin, drive slip, gear from ratios
  "gps_speed", // fixes, ground speed fallback, GPS faults, top speed without laps
  "gps_lat", // fixes (laps, pit lane), guessTrack, finding positions, GPS faults
  "gps_lon",
  "engine_rpm", // rev ceiling, lap max rpm, engine ledger, sensor flat
  "throttle", // brake on straight, wheel spin, slip calibration, sensor flat
  "brake_front", // brake on straight, braking points (Rider brief)
  "fork_travel", // bottoming, sensor flat, Suspension use
  "shock_travel",
  "lean_angle", // drive slip, sensor flat
  "accel_long", // sensor flat
  "accel_lat",
  "lap_beacon", // laps without GPS gates
  "gear", // Gears page (time in gear, shifts), stored at ingest
]);

/** The parser's channel list as the by-role shape lib/ takes (the first channel of each analysed role). */
export function seriesFromParsed(parsed: ParsedSeries): SeriesLike {
  const channels: Record<string, NumericArray> = {};
  for (const c of parsed.channels) if (ANALYSED_ROLES.has(c.role) && !(c.role in channels)) channels[c.role] = c.values;
  return { timeS: parsed.timeS, channels: channels as SeriesLike["channels"] };
}

export async function analyseAndStore(sequelize: Sequelize, t: Transaction, session: RideSession, parsed: ParsedSeries): Promise<SessionAnalysisSummary> {
  const summary = await analyseSessionInTransaction(sequelize, t, session.id, seriesFromParsed(parsed));
  if (process.env.LAPBENCH_LOG_ANALYSIS === "1") {
    const p = summary.pages;
    const pages = p ? `; pages ${p.ms} ms (compute ${p.computeMs} ms, ${p.parts} parts, ${Math.round(p.bytes / 1024)} kB)` : "; pages not stored";
    console.log(`[ingest] session ${session.id}: ${summary.lapCount} laps analysed in ${summary.analysisMs} ms${pages}`);
  }
  return summary;
}
