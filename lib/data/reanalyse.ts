/**
 * Re-analysis from the stored chunks, for when a track's gates or thresholds, or a bike's
 * settings, change. Each session is redone in one transaction: its old laps and findings are
 * replaced, acknowledgements of findings found again are kept, and the Drive slip, Suspension
 * use, Gears and Rider brief results stored for the default settings are computed again
 * (lib/data/session-analysis.ts).
 */
import type { Sequelize } from "sequelize";
import { initModels, RideSession } from "@/models";
import type { SessionAnalysisSummary } from "@/lib/analysis/analyse-series";
import { ANALYSED_ROLES } from "@/lib/analysis/analysed-roles";
import { loadSessionSeries } from "./session-series";
import { analyseSessionInTransaction } from "./session-analysis";

/** The same channels the analysis kept at ingest (seriesFromParsed): the roles the analysis declares it reads. */
const ANALYSIS_ROLES = [...ANALYSED_ROLES];

/** Recompute laps, findings and summary of a ready session. Null when the session is not ready (nothing stored to read). */
export async function reanalyseSession(sequelize: Sequelize, sessionId: number): Promise<SessionAnalysisSummary | null> {
  initModels(sequelize);
  const session = await RideSession.findByPk(sessionId, { attributes: ["id", "status"] });
  if (!session || session.status !== "ready") return null;
  const { series } = await loadSessionSeries(sequelize, sessionId, ANALYSIS_ROLES);
  return sequelize.transaction((t) => analyseSessionInTransaction(sequelize, t, sessionId, series));
}

/** Re-analyse every ready session on a track (after its gates, limits or thresholds changed). */
export async function reanalyseTrackSessions(sequelize: Sequelize, trackId: number): Promise<{ sessionIds: number[] }> {
  initModels(sequelize);
  const rows = await RideSession.findAll({ where: { trackId, status: "ready" }, attributes: ["id"], order: [["id", "ASC"]] });
  const sessionIds: number[] = [];
  for (const r of rows) if (await reanalyseSession(sequelize, r.id)) sessionIds.push(r.id);
  return { sessionIds };
}
