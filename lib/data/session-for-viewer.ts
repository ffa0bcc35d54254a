import "server-only";
/** One session as a plain object, if the caller's team owns it and their role may see it. */
import { initModels, RideSession } from "@/models";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import { sessionVisibility } from "./sessions";

export interface SessionDetail {
  id: number;
  title: string;
  kind: string;
  status: string;
  statusReason: string | null;
  progress: number;
  startedAt: string | null;
  riderId: number | null;
  bikeId: number | null;
  engineId: number | null;
  eventId: number | null;
  trackId: number | null;
  logFileId: number | null;
  sharedWithRiders: boolean;
  durationS: number | null;
}

export async function getSessionForViewer(ctx: TeamContext, id: number): Promise<SessionDetail> {
  initModels();
  const row = await RideSession.findOne({ where: { ...(await sessionVisibility(ctx)), id } });
  if (!row) throw new HttpError(404, "Session was not found in your team.");
  return {
    id: row.id,
    title: row.title ?? `Session ${row.id}`,
    kind: row.kind,
    status: row.status,
    statusReason: row.statusReason,
    progress: row.progress,
    startedAt: row.startedAt?.toISOString() ?? null,
    riderId: row.riderId,
    bikeId: row.bikeId,
    engineId: row.engineId,
    eventId: row.eventId,
    trackId: row.trackId,
    logFileId: row.logFileId,
    sharedWithRiders: row.sharedWithRiders,
    durationS: row.durationS,
  };
}
