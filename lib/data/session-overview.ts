import "server-only";
/**
 * The session page's data as plain objects: the session the caller may see (riders: their own
 * and shared ones), the names behind its ids, the log file, and its channels in display units.
 */
import { initModels, RaceEvent, Bike, Engine, Rider, Track, LogFile, RideSession } from "@/models";
import { getSequelize } from "@/models/db";
import type { TeamContext } from "@/lib/auth/guard";
import { getSessionForViewer, type SessionDetail } from "./session-for-viewer";
import { listChannels } from "./samples";
import type { ImportPreview } from "./imports";
import { ROLE_LABEL, isChannelRole } from "@/lib/channels/roles";
import { displayUnitFor, formatDisplay } from "@/lib/units/display";

export interface ChannelRow {
  id: number;
  name: string;
  roleLabel: string;
  /** Unit shown (display unit, e.g. km/h for a speed stored in m/s). */
  unit: string;
  rateHz: number | null;
  samples: number;
  min: string;
  max: string;
}

export interface SessionOverview {
  session: SessionDetail & { conditions: string | null; createdAt: string };
  eventName: string | null;
  trackName: string | null;
  /** The track's IANA time zone: the start is shown in its local time with UTC beside it. */
  trackTimeZone: string | null;
  bikeName: string | null;
  engineSerial: string | null;
  riderName: string | null;
  fileName: string | null;
  format: ImportPreview["format"] | null;
  /** What the reader skipped or corrected in the file (e.g. "412 sentences skipped: …"). */
  importNotes: string[];
  /** A CSV refused because rows repeat their time stamps: how many rows repeat (it can be imported keeping the first of each). */
  repeatedTimeRows: number | null;
  channels: ChannelRow[];
}

export async function getSessionOverview(ctx: TeamContext, sessionId: number): Promise<SessionOverview> {
  const sequelize = getSequelize();
  initModels(sequelize);
  const s = await getSessionForViewer(ctx, sessionId);
  const row = await RideSession.findByPk(s.id, { attributes: ["conditions", "createdAt", "summary"] });
  const [event, bike, engine, rider, track, log, channels] = await Promise.all([
    s.eventId ? RaceEvent.findOne({ where: { id: s.eventId, teamId: ctx.teamId } }) : null,
    s.bikeId ? Bike.findOne({ where: { id: s.bikeId, teamId: ctx.teamId } }) : null,
    s.engineId ? Engine.findOne({ where: { id: s.engineId, teamId: ctx.teamId } }) : null,
    s.riderId ? Rider.findOne({ where: { id: s.riderId, teamId: ctx.teamId } }) : null,
    s.trackId ? Track.findOne({ where: { id: s.trackId, teamId: ctx.teamId } }) : null,
    s.logFileId ? LogFile.findOne({ where: { id: s.logFileId, teamId: ctx.teamId } }) : null,
    // Channels are written in the same transaction that marks the session ready: none are partial.
    s.status === "ready" ? listChannels(sequelize, s.id) : [],
  ]);
  const preview = (row?.summary as { preview?: ImportPreview } | null)?.preview;
  return {
    session: { ...s, conditions: row?.conditions ?? null, createdAt: (row?.createdAt ?? new Date()).toISOString() },
    eventName: event?.name ?? null,
    trackName: track?.name ?? null,
    trackTimeZone: track?.timeZone ?? null,
    bikeName: bike?.name ?? null,
    engineSerial: engine?.serial ?? null,
    riderName: rider?.name ?? null,
    fileName: log?.name ?? null,
    format: preview?.format ?? null,
    importNotes: [
      ...(((row?.summary as { importNotes?: unknown } | null)?.importNotes as string[] | undefined) ?? []),
      ...(((row?.summary as { analysisNotes?: unknown } | null)?.analysisNotes as string[] | undefined) ?? []),
    ].filter((x) => typeof x === "string"),
    repeatedTimeRows: repeatedTimeRows(s.status, row?.summary),
    channels: channels.map((c) => {
      const d = displayUnitFor(c.role, c.unit);
      return {
        id: c.id,
        name: c.name,
        roleLabel: isChannelRole(c.role) ? ROLE_LABEL[c.role] : c.role,
        unit: d.unit,
        rateHz: c.rateHz,
        samples: c.sampleCount,
        min: formatDisplay(c.minValue, d),
        max: formatDisplay(c.maxValue, d),
      };
    }),
  };
}

function repeatedTimeRows(status: string, summary: unknown): number | null {
  const f = (summary as { failure?: { code?: unknown; duplicateRows?: unknown } } | null)?.failure;
  return status === "failed" && f?.code === "DUPLICATE_TIME" && typeof f.duplicateRows === "number" ? f.duplicateRows : null;
}
