/**
 * Stores the analysis of one session (laps, findings, summary) inside the caller's transaction:
 * used by the ingest worker right after the samples are written and by re-analysis from the
 * stored chunks. Replaces the session's laps and findings; a person's acknowledgement of a
 * finding and "invalid" mark on a lap carry over to the same event or lap found again.
 * Then the Drive slip, Suspension use, Gears and Rider brief results for the default settings
 * are computed and stored (storePageAnalyses), so those pages need not read the samples.
 */
import { Op, QueryTypes, type Sequelize, type Transaction } from "sequelize";
import { initModels, Bike, Finding, Lap, RaceEvent, RideSession, Track } from "@/models";
import type { SeriesLike } from "@/lib/laps/types";
import { analyseSeries, type SessionAnalysisSummary } from "@/lib/analysis/analyse-series";
import { analysisBasis, buildAnalysisBase, PAGE_ROLES, seriesView } from "@/lib/analysis/analysis-base";
import { precomputePageAnalyses } from "@/lib/analysis/precompute-pages";
import { storedJsonStringify } from "@/lib/analysis/stored-json";
import { guessTrack, medianPosition, trackCentre, trackGatesForAnalysis } from "./tracks";
import { haversineM } from "@/lib/geo/haversine-m";
import { loadAnalysisInputs } from "./analysis";

/** Same event after a re-analysis: same kind and lap, start within this many seconds. */
export const SAME_FINDING_WITHIN_S = 0.2;

/** A track chosen for the session (its own or its event's) is used only when the log's positions lie within this distance of it, m. */
export const TRACK_MATCH_MAX_M = 2000;

/** A track the session was not put on because its GPS lies elsewhere. */
export interface TrackRefusal {
  trackId: number;
  name: string;
  /** From the log's median position to the track's centre, m. */
  distanceM: number;
  via: "session" | "event";
}

/**
 * The session's track: its own, else its event's, else the nearest of the team's tracks. The GPS
 * decides: its own or its event's track is refused when the log's median position is more than
 * TRACK_MATCH_MAX_M from it (a session without GPS keeps what it was given).
 */
async function resolveTrack(sequelize: Sequelize, t: Transaction, session: RideSession, series: SeriesLike): Promise<{ track: Track | null; refused: TrackRefusal | null }> {
  const at = medianPosition(series);
  let refused: TrackRefusal | null = null;
  const distance = (track: Track): number | null => {
    const c = trackCentre(track);
    return at && c ? haversineM(at.lat, at.lon, c.lat, c.lon) : null;
  };
  const accept = (track: Track, via: TrackRefusal["via"]): boolean => {
    const d = distance(track);
    if (d == null || d <= TRACK_MATCH_MAX_M) return true;
    refused ??= { trackId: track.id, name: track.name, distanceM: Math.round(d), via };
    return false;
  };
  const ev = session.eventId != null ? await RaceEvent.findOne({ where: { id: session.eventId, teamId: session.teamId }, transaction: t }) : null;
  if (session.trackId != null) {
    const own = await Track.findOne({ where: { id: session.trackId, teamId: session.teamId }, transaction: t });
    // The event's track, copied onto the session when its details were saved, is still the event's choice.
    if (own && accept(own, ev?.trackId === own.id ? "event" : "session")) return { track: own, refused: null };
  }
  if (ev) {
    if (ev.trackId != null) {
      const viaEvent = await Track.findOne({ where: { id: ev.trackId, teamId: session.teamId }, transaction: t });
      if (viaEvent && accept(viaEvent, "event")) return { track: viaEvent, refused: null };
    }
  }
  const guessed = await guessTrack(sequelize, session.teamId, series, { transaction: t });
  return { track: guessed && (!refused || guessed.id !== (refused as TrackRefusal).trackId) ? guessed : null, refused };
}

export async function analyseSessionInTransaction(sequelize: Sequelize, t: Transaction, sessionId: number, series: SeriesLike): Promise<SessionAnalysisSummary> {
  initModels(sequelize);
  const t0 = performance.now();
  const session = await RideSession.findByPk(sessionId, { transaction: t });
  if (!session) throw new Error(`session ${sessionId} not found`);
  const { track, refused: trackRefused } = await resolveTrack(sequelize, t, session, series);
  const bike = session.bikeId != null ? await Bike.findOne({ where: { id: session.bikeId, teamId: session.teamId }, transaction: t }) : null;

  const oldLaps = await Lap.findAll({ where: { sessionId, isInvalid: true }, attributes: ["number", "startTimeS"], transaction: t });
  const oldAcks = await Finding.findAll({
    where: { sessionId, [Op.or]: [{ acknowledgedAt: { [Op.ne]: null } }, { note: { [Op.ne]: null } }] },
    transaction: t,
  });

  const analysis = analyseSeries(
    series,
    track
      ? { gates: trackGatesForAnalysis(track), pitSpeedLimitMps: track.pitSpeedLimitKmh != null ? track.pitSpeedLimitKmh / 3.6 : null, thresholds: track.thresholds }
      : null,
    bike
      ? {
          revCeilingRpm: bike.revCeilingRpm,
          forkStrokeM: bike.forkStrokeMm != null ? bike.forkStrokeMm / 1000 : null,
          shockStrokeM: bike.shockStrokeMm != null ? bike.shockStrokeMm / 1000 : null,
          thresholds: bike.thresholds,
        }
      : null,
    { isInvalid: (lap) => oldLaps.some((o) => Math.abs(o.startTimeS - lap.startTimeS) <= SAME_FINDING_WITHIN_S) },
  );

  // Delete by primary key, and only rows that exist: a DELETE … WHERE session_id that matches
  // nothing takes a gap lock at the end of the index, and two sessions ingested at once would then
  // deadlock on each other's inserts.
  const oldLapIds = (await Lap.findAll({ where: { sessionId }, attributes: ["id"], transaction: t })).map((r) => r.id);
  const oldFindingIds = (await Finding.findAll({ where: { sessionId }, attributes: ["id"], transaction: t })).map((r) => r.id);
  if (oldLapIds.length) await Lap.destroy({ where: { id: oldLapIds }, transaction: t });
  if (oldFindingIds.length) await Finding.destroy({ where: { id: oldFindingIds }, transaction: t });
  // New laps: caches of per-lap results (Compare's distance arrays) key on this counter.
  await sequelize.query("UPDATE ride_sessions SET analysis_version = analysis_version + 1 WHERE id = ?", { replacements: [sessionId], type: QueryTypes.UPDATE, transaction: t });
  if (analysis.laps.length) {
    await Lap.bulkCreate(
      analysis.laps.map((l) => ({
        sessionId,
        number: l.number,
        startTimeS: l.startTimeS,
        endTimeS: l.endTimeS,
        lapTimeMs: l.lapTimeMs,
        distanceM: l.distanceM,
        isOutLap: l.outLap,
        isInLap: l.inLap,
        isInvalid: !!l.invalid,
        pitPass: l.pitPass,
        sectorTimesMs: l.sectorTimesMs as number[],
        topSpeedMps: l.topSpeedMps,
        stats: { ...l.stats, complete: l.complete, ...(l.suspect ? { suspect: true } : {}) },
      })),
      { transaction: t },
    );
  }
  if (analysis.findings.length) {
    await Finding.bulkCreate(
      analysis.findings.map((f) => {
        const before = oldAcks.find(
          (o) => o.kind === f.kind && o.lapNumber === f.lapNumber && o.startTimeS != null && Math.abs(o.startTimeS - f.startTimeS) <= SAME_FINDING_WITHIN_S,
        );
        return {
          teamId: session.teamId,
          sessionId,
          kind: f.kind,
          lapNumber: f.lapNumber,
          startTimeS: f.startTimeS,
          endTimeS: f.endTimeS,
          distanceM: f.distanceM,
          lat: f.lat,
          lon: f.lon,
          severity: f.severity,
          measuredValue: Number.isFinite(f.measuredValue) ? f.measuredValue : null,
          thresholdValue: Number.isFinite(f.thresholdValue) ? f.thresholdValue : null,
          unit: f.unit,
          message: f.storedMessage,
          acknowledgedBy: before?.acknowledgedBy ?? null,
          acknowledgedAt: before?.acknowledgedAt ?? null,
          note: before?.note ?? null,
        };
      }),
      { transaction: t },
    );
  }

  const analysisMs = Math.round(performance.now() - t0);
  if (track && session.trackId !== track.id) await RideSession.update({ trackId: track.id }, { where: { id: sessionId }, transaction: t });
  else if (!track && session.trackId != null) await RideSession.update({ trackId: null }, { where: { id: sessionId }, transaction: t });
  const pages = await storePageAnalyses(sequelize, t, sessionId, series);

  const summary: SessionAnalysisSummary = {
    ...analysis.summary,
    analysedAt: new Date().toISOString(),
    trackId: track?.id ?? null,
    analysisMs,
    pages,
  };
  // Merge: the import preview (and anything else kept there) stays.
  const previous = (session.summary ?? {}) as Record<string, unknown>;
  await RideSession.update({ summary: { ...previous, ...summary, trackRefused } }, { where: { id: sessionId }, transaction: t });
  return summary;
}

/**
 * Compute the four analysis pages' results with the default settings and store them, one row per
 * part (session_analysis_parts), replacing the session's earlier parts. The inputs are read back
 * inside the transaction exactly as the pages read them (lib/data/analysis.ts), and each page's
 * result is computed on the channels that page loads, so a stored part equals the page's own
 * computation. A failure here is logged and leaves no parts (the pages then compute on request):
 * it must not cost the session its laps and findings.
 */
async function storePageAnalyses(sequelize: Sequelize, t: Transaction, sessionId: number, series: SeriesLike): Promise<SessionAnalysisSummary["pages"]> {
  const t0 = performance.now();
  const old = await sequelize.query<{ part: string }>("SELECT part FROM session_analysis_parts WHERE session_id = ?", { replacements: [sessionId], type: QueryTypes.SELECT, transaction: t });
  let rows: [string, string][] = [];
  let basis = "";
  try {
    const inputs = await loadAnalysisInputs(sequelize, sessionId, t);
    basis = analysisBasis(inputs);
    const tc = performance.now();
    const slip = buildAnalysisBase(inputs, seriesView(series, PAGE_ROLES.slip));
    const a = precomputePageAnalyses({
      slip,
      suspension: buildAnalysisBase(inputs, seriesView(series, PAGE_ROLES.suspension), slip),
      gears: buildAnalysisBase(inputs, seriesView(series, PAGE_ROLES.gears), slip),
      brief: buildAnalysisBase(inputs, seriesView(series, PAGE_ROLES.brief), slip),
    });
    const computeMs = performance.now() - tc;
    rows = [
      ["slip", storedJsonStringify(a.slip)],
      ...[...a.slipTraces].map(([lap, trace]): [string, string] => [`slip-trace:${lap}`, storedJsonStringify(trace)]),
      ["suspension", storedJsonStringify(a.suspension)],
      ["gears", storedJsonStringify(a.gears)],
      ["brief", storedJsonStringify(a.brief)],
    ];
    // Parts not written again (laps that are gone) are deleted by key, as laps and findings are above.
    const stale = old.map((r) => r.part).filter((p) => !rows.some(([name]) => name === p));
    if (stale.length) await deleteParts(sequelize, t, sessionId, stale);
    // One statement for all parts; ~1 MB for a 30-minute session, far below max_allowed_packet.
    await sequelize.query(
      `INSERT INTO session_analysis_parts (session_id, part, basis, data) VALUES ${rows.map(() => "(?, ?, ?, ?)").join(", ")}
       ON DUPLICATE KEY UPDATE basis = VALUES(basis), data = VALUES(data), created_at = CURRENT_TIMESTAMP(3)`,
      { replacements: rows.flatMap(([part, data]) => [sessionId, part, basis, data]), type: QueryTypes.INSERT, transaction: t },
    );
    return { ms: Math.round(performance.now() - t0), computeMs: Math.round(computeMs), parts: rows.length, bytes: rows.reduce((n, [, d]) => n + Buffer.byteLength(d), 0) };
  } catch (e) {
    console.log(`[ingest] session ${sessionId}: page analyses not stored (computed on request instead): ${e instanceof Error ? e.message : String(e)}`);
    if (old.length) await deleteParts(sequelize, t, sessionId, old.map((r) => r.part));
    return null;
  }
}

async function deleteParts(sequelize: Sequelize, t: Transaction, sessionId: number, parts: string[]): Promise<void> {
  await sequelize.query(`DELETE FROM session_analysis_parts WHERE session_id = ? AND part IN (${parts.map(() => "?").join(",")})`, {
    replacements: [sessionId, ...parts],
    type: QueryTypes.DELETE,
    transaction: t,
  });
}
