/**
 * The data behind Drive slip, Suspension use, Gears and the Rider brief. With the default
 * settings the results stored at ingest are read back (session_analysis_parts, written by
 * lib/data/session-analysis.ts) as long as the laps, bike and track settings they were computed
 * from are unchanged; a changed setting (lean correction, velocity window, low/high split) or a
 * stale or missing part computes on request from the stored samples (loadAnalysisBase and the
 * plain lib/analysis/*-page.ts functions, the same ones ingest runs). Callers check access
 * first (getSessionForViewer); these functions take a session id that is already allowed.
 */
import { QueryTypes, type Sequelize, type Transaction } from "sequelize";
import { initModels, Bike, Lap as LapModel, RideSession, Track, type TrackCorner } from "@/models";
import type { ChannelRole } from "@/lib/channels/roles";
import type { Lap } from "@/lib/laps/types";
import { recomputeCached, roundBoundaryMs } from "./recompute-cache";
import { analysisBasis, buildAnalysisBase, PAGE_ROLES, pageRoles, type AnalysisBase, type AnalysisInputs, type BikeInfo } from "@/lib/analysis/analysis-base";
import { computeSlip, slipLapShown, type SlipAnalysis, type SlipTrace } from "@/lib/analysis/slip-page";
import { computeSuspension, suspensionSettings, type SuspensionAnalysis } from "@/lib/analysis/suspension-page";
import { computeGears, type GearAnalysis } from "@/lib/analysis/gears-page";
import { briefLapShown, computeBrief, type RiderBrief } from "@/lib/analysis/brief-page";
import type { StoredBrief, StoredSuspension } from "@/lib/analysis/precompute-pages";
import { storedJsonParse } from "@/lib/analysis/stored-json";
import { loadSessionSeries } from "./session-series";
import { jsonColumn } from "./json-column";
import { storedLapState } from "@/lib/laps/stored-lap-state";
import { trackGatesForAnalysis } from "@/lib/laps/track-gates-for-analysis";

export type { AnalysisBase, BikeInfo, LapInfo } from "@/lib/analysis/analysis-base";
export { lapRange } from "@/lib/analysis/analysis-base";
export type { SpinRow, SlipAnalysis, CornerExitSlip } from "@/lib/analysis/slip-page";
export type { SuspensionSide, SuspensionAnalysis } from "@/lib/analysis/suspension-page";
export type { GearAnalysis } from "@/lib/analysis/gears-page";
export type { BriefCorner, RiderBrief } from "@/lib/analysis/brief-page";
export { SG_WINDOWS } from "@/lib/analysis/suspension-page";
export { BRIEF_BRAKE_THRESHOLD_PA } from "@/lib/analysis/brief-page";

/** The session's rows as the page analyses read them. Ingest maps its own rows through this too, so both hash to the same basis. */
export function analysisInputsFromRows(session: Pick<RideSession, "id" | "title">, lapRows: LapModel[], bikeRow: Bike | null, trackRow: Track | null): AnalysisInputs {
  const laps: Lap[] = lapRows.map((l) => {
    const { complete, suspect } = storedLapState(jsonColumn<{ complete?: boolean; suspect?: boolean }>(l.stats), Boolean(l.isOutLap), Boolean(l.isInLap));
    return {
      number: l.number,
      startTimeS: l.startTimeS,
      endTimeS: l.endTimeS,
      lapTimeMs: l.lapTimeMs,
      sectorTimesMs: jsonColumn<(number | null)[]>(l.sectorTimesMs) ?? [],
      outLap: Boolean(l.isOutLap),
      inLap: Boolean(l.isInLap),
      pitPass: Boolean(l.pitPass),
      complete,
      invalid: Boolean(l.isInvalid),
      ...(suspect ? { suspect: true } : {}),
    };
  });
  const bike: BikeInfo | null = bikeRow
    ? {
        id: bikeRow.id,
        name: bikeRow.name,
        wheelCircRearMm: bikeRow.wheelCircRearMm,
        primaryRatio: bikeRow.primaryRatio,
        gearboxRatios: jsonColumn<number[]>(bikeRow.gearboxRatios),
        sprocketFront: bikeRow.sprocketFront,
        sprocketRear: bikeRow.sprocketRear,
        forkStrokeMm: bikeRow.forkStrokeMm,
        shockStrokeMm: bikeRow.shockStrokeMm,
        tyreCrownRadiusMm: bikeRow.tyreCrownRadiusMm,
        tyreCrownRadiusFrontMm: bikeRow.tyreCrownRadiusFrontMm ?? null,
        wheelCircFrontMm: bikeRow.wheelCircFrontMm,
        thresholds: jsonColumn<Record<string, number>>(bikeRow.thresholds) ?? {},
      }
    : null;
  return {
    sessionId: session.id,
    title: session.title ?? `Session ${session.id}`,
    laps,
    gates: trackRow ? trackGatesForAnalysis(trackRow) : null,
    bike,
    trackThresholds: jsonColumn<Record<string, number>>(trackRow?.thresholds) ?? {},
    namedCorners: jsonColumn<TrackCorner[]>(trackRow?.corners),
  };
}

/** The rows the page analyses depend on, read as loadAnalysisBase always has (laps in number order; bike and track by the session's ids). */
export async function loadAnalysisInputs(sequelize: Sequelize, sessionId: number, t?: Transaction): Promise<AnalysisInputs> {
  initModels(sequelize);
  const session = await RideSession.findByPk(sessionId, { transaction: t });
  if (!session) throw new Error(`session ${sessionId} not found`);
  const [lapRows, bikeRow, trackRow] = await Promise.all([
    LapModel.findAll({ where: { sessionId }, order: [["number", "ASC"]], transaction: t }),
    session.bikeId ? Bike.findByPk(session.bikeId, { transaction: t }) : null,
    session.trackId ? Track.findByPk(session.trackId, { transaction: t }) : null,
  ]);
  return analysisInputsFromRows(session, lapRows, bikeRow, trackRow);
}

export async function loadAnalysisBase(sequelize: Sequelize, sessionId: number, roles?: readonly ChannelRole[]): Promise<AnalysisBase> {
  // Distance and laps always need the wheel speeds and GPS (pageRoles adds them).
  const [inputs, { series }] = await Promise.all([loadAnalysisInputs(sequelize, sessionId), loadSessionSeries(sequelize, sessionId, roles ? pageRoles(roles) : undefined)]);
  return buildAnalysisBase(inputs, series);
}

/**
 * Stored parts of a session whose basis matches the rows as they are now; a missing or stale
 * part is simply absent from the map (the caller computes on request).
 */
async function readStoredParts(sequelize: Sequelize, inputs: AnalysisInputs, parts: string[]): Promise<Map<string, unknown>> {
  const rows = await sequelize.query<{ part: string; basis: string; data: string }>(
    `SELECT part, basis, data FROM session_analysis_parts WHERE session_id = ? AND part IN (${parts.map(() => "?").join(",")})`,
    { replacements: [inputs.sessionId, ...parts], type: QueryTypes.SELECT },
  );
  const out = new Map<string, unknown>();
  if (rows.length === 0) return out;
  const basis = analysisBasis(inputs);
  for (const r of rows) if (r.basis === basis) out.set(r.part, storedJsonParse(r.data));
  return out;
}

/* ───────────────────────────── Drive slip ───────────────────────────── */

export async function slipAnalysis(sequelize: Sequelize, sessionId: number, opts: { lap?: number | null; lean?: boolean } = {}): Promise<SlipAnalysis> {
  // The lean correction is a person's setting: only the plain slip is stored.
  if (!opts.lean) {
    const inputs = await loadAnalysisInputs(sequelize, sessionId);
    const stored = (await readStoredParts(sequelize, inputs, ["slip"])).get("slip") as SlipAnalysis | undefined;
    if (stored && !stored.available) return stored;
    if (stored) {
      const chosen = slipLapShown(stored.laps, stored.laps.find((l) => l.best) ?? null, opts.lap);
      if (!chosen) return stored;
      const trace = (await readStoredParts(sequelize, inputs, [`slip-trace:${chosen.number}`])).get(`slip-trace:${chosen.number}`) as SlipTrace | undefined;
      if (trace) return { ...stored, lap: chosen.number, trace };
    }
  }
  // The lean correction (or a lap the stored part lacks): computed from the samples, kept a while.
  const inputs = await loadAnalysisInputs(sequelize, sessionId);
  return recomputeCached(`slip:${sessionId}:${analysisBasis(inputs)}:${opts.lap ?? "best"}:${opts.lean ? 1 : 0}`, async () =>
    computeSlip(await loadAnalysisBase(sequelize, sessionId, PAGE_ROLES.slip), opts),
  );
}

/* ─────────────────────────── Suspension use ─────────────────────────── */

export async function suspensionAnalysis(
  sequelize: Sequelize,
  sessionId: number,
  opts: { lap?: number | null; window?: number; boundaryMs?: number } = {},
): Promise<SuspensionAnalysis> {
  const inputs = await loadAnalysisInputs(sequelize, sessionId);
  // A person's boundary is restricted to whole mm/s (5–2 000), so results can be kept and reused.
  if (opts.boundaryMs && opts.boundaryMs > 0) opts = { ...opts, boundaryMs: roundBoundaryMs(opts.boundaryMs) };
  const { window, boundaryMs } = suspensionSettings(opts);
  const stored = (await readStoredParts(sequelize, inputs, ["suspension"])).get("suspension") as StoredSuspension | undefined;
  // Stored for the default window and split only; another one is a person's setting.
  if (stored && stored.window === window && stored.boundaryMs === boundaryMs) {
    const lap = opts.lap != null ? stored.lapList.find((l) => l.number === opts.lap) ?? null : null;
    const sides = lap ? stored.laps[lap.number] : stored.session;
    if (sides) {
      return { scope: lap ? `Lap ${lap.number}` : "Whole session", lap: lap?.number ?? null, laps: stored.lapList, window, boundaryMs, fork: sides.fork, shock: sides.shock, sampleRateHz: stored.sampleRateHz };
    }
  }
  const settings = opts;
  return recomputeCached(`suspension:${sessionId}:${analysisBasis(inputs)}:${opts.lap ?? "all"}:${window}:${boundaryMs}`, async () =>
    computeSuspension(await loadAnalysisBase(sequelize, sessionId, PAGE_ROLES.suspension), settings),
  );
}

/* ─────────────────────────────── Gears ──────────────────────────────── */

export async function gearAnalysis(sequelize: Sequelize, sessionId: number): Promise<GearAnalysis> {
  const inputs = await loadAnalysisInputs(sequelize, sessionId);
  const stored = (await readStoredParts(sequelize, inputs, ["gears"])).get("gears") as GearAnalysis | undefined;
  if (stored) return stored;
  return computeGears(await loadAnalysisBase(sequelize, sessionId, PAGE_ROLES.gears));
}

/* ──────────────────────────── Rider brief ───────────────────────────── */

export async function riderBrief(sequelize: Sequelize, sessionId: number, opts: { lap?: number | null } = {}): Promise<RiderBrief> {
  const inputs = await loadAnalysisInputs(sequelize, sessionId);
  const stored = (await readStoredParts(sequelize, inputs, ["brief"])).get("brief") as StoredBrief | undefined;
  if (stored) {
    // The title is the session's as it is now (it can be renamed after ingest).
    const out: RiderBrief = { ...stored.brief, sessionId, title: inputs.title };
    if (!out.available) return out;
    const byNumber = new Map(out.laps.map((l) => [l.number, l]));
    const best = out.bestLap != null ? byNumber.get(out.bestLap) : undefined;
    if (best) {
      const shown = briefLapShown(out.laps, out.laps.filter((l) => l.flying), best, opts.lap);
      const braking = stored.laps[shown.number];
      if (braking) return { ...out, lap: shown.number, corners: braking.corners };
    }
  }
  return computeBrief(await loadAnalysisBase(sequelize, sessionId, PAGE_ROLES.brief), opts);
}
