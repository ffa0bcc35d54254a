import "server-only";
/**
 * The analysis pages' data as the caller sees it: each function first checks that the session is
 * in the caller's team and visible to their role (a rider sees only their own sessions and the ones
 * shared with riders), then reads the stored analysis. Another team's or a hidden session is
 * "not found" (HttpError 404), exactly as for the session itself.
 */
import { initModels } from "@/models";
import type { TeamContext } from "@/lib/auth/guard";
import { gearAnalysis, riderBrief, slipAnalysis, suspensionAnalysis, type GearAnalysis, type RiderBrief, type SlipAnalysis, type SuspensionAnalysis } from "./analysis";
import { getSessionForViewer } from "./session-for-viewer";

/** Drive slip of a session the caller may see. */
export async function slipForViewer(ctx: TeamContext, sessionId: number, opts: { lap?: number | null; lean?: boolean } = {}): Promise<SlipAnalysis> {
  const s = await getSessionForViewer(ctx, sessionId);
  return slipAnalysis(initModels(), s.id, opts);
}

/** Suspension use of a session the caller may see. */
export async function suspensionForViewer(ctx: TeamContext, sessionId: number, opts: { lap?: number | null; window?: number; boundaryMs?: number } = {}): Promise<SuspensionAnalysis> {
  const s = await getSessionForViewer(ctx, sessionId);
  return suspensionAnalysis(initModels(), s.id, opts);
}

/** Gear use of a session the caller may see. */
export async function gearsForViewer(ctx: TeamContext, sessionId: number): Promise<GearAnalysis> {
  const s = await getSessionForViewer(ctx, sessionId);
  return gearAnalysis(initModels(), s.id);
}

/** The rider brief of a session the caller may see. */
export async function briefForViewer(ctx: TeamContext, sessionId: number, opts: { lap?: number | null } = {}): Promise<RiderBrief> {
  const s = await getSessionForViewer(ctx, sessionId);
  return riderBrief(initModels(), s.id, opts);
}
