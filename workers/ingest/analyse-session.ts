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

/** The parser's channel list as the by-role shape lib/ takes (the first channel of each role; "other" is not analysed). */
export function seriesFromParsed(parsed: ParsedSeries): SeriesLike {
  const channels: Record<string, NumericArray> = {};
  for (const c of parsed.channels) if (c.role !== "other" && !(c.role in channels)) channels[c.role] = c.values;
  return { timeS: parsed.timeS, channels: channels as SeriesLike["channels"] };
}

export async function analyseAndStore(sequelize: Sequelize, t: Transaction, session: RideSession, parsed: ParsedSeries): Promise<SessionAnalysisSummary> {
  const summary = await analyseSessionInTransaction(sequelize, t, session.id, seriesFromParsed(parsed));
  if (process.env.LAPBENCH_LOG_ANALYSIS === "1") console.log(`[ingest] session ${session.id}: ${summary.lapCount} laps analysed in ${summary.analysisMs} ms`);
  return summary;
}
