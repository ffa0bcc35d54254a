/**
 * The analysis that runs at ingest, inside the session's write transaction, so a session becomes
 * visible with its laps, findings and summary or not at all.
 */
import type { Sequelize, Transaction } from "sequelize";
import type { RideSession } from "../../models";
import type { ParsedSeries } from "../../lib/ingest/parsed-series";
import type { NumericArray, SeriesLike } from "../../lib/laps/types";
import type { SessionAnalysisSummary } from "../../lib/analysis/analyse-series";
import { analyseSessionInTransaction } from "../../lib/data/session-analysis";
import { ANALYSED_ROLES } from "../../lib/analysis/analysed-roles";

// The roles kept in memory for the analysis: the union the analysis declares.
export { ANALYSED_ROLES };

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
