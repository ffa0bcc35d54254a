import "server-only";
/** Events (race meetings) with their sessions, as plain objects. Team and role checks inside. */
import { Op } from "sequelize";
import { z } from "zod";
import { initModels, RaceEvent, RideSession, Rider, Track, type SessionKind, type SessionStatus } from "@/models";
import type { TeamContext } from "@/lib/auth/guard";
import { notFound } from "@/lib/http/http-error";
import { assertCanEditSetup } from "./setup-access";
import { sessionVisibility } from "./sessions";
import { optionalId } from "@/lib/forms/form-fields";

const isoDate = (label: string) =>
  z
    .string()
    .trim()
    .refine((s) => s === "" || (/^\d{4}-\d{2}-\d{2}$/.test(s) && !Number.isNaN(Date.parse(`${s}T00:00:00Z`))), `${label}: enter a date such as 2026-04-11`)
    .transform((s) => (s === "" ? null : s));

export const eventSchema = z
  .object({
    name: z.string({ message: "Name the event" }).trim().min(2, "Name the event (at least 2 characters)").max(160, "Keep the name under 160 characters"),
    trackId: optionalId,
    startsOn: isoDate("First day"),
    endsOn: isoDate("Last day"),
  })
  .superRefine((e, ctx) => {
    if (e.endsOn && !e.startsOn) ctx.addIssue({ code: "custom", path: ["startsOn"], message: "Enter the first day too" });
    if (e.startsOn && e.endsOn && e.endsOn < e.startsOn) ctx.addIssue({ code: "custom", path: ["endsOn"], message: "The last day cannot be before the first day" });
  });
export type EventInput = z.input<typeof eventSchema>;

export interface EventSession {
  id: number;
  title: string;
  kind: SessionKind;
  status: SessionStatus;
  startedAt: string | null;
  riderName: string | null;
}

export interface EventItem {
  id: number;
  name: string;
  trackId: number | null;
  trackName: string | null;
  startsOn: string | null;
  endsOn: string | null;
  sessions: EventSession[];
}

export interface TrackOption {
  id: number;
  name: string;
}

export async function listTrackOptions(ctx: TeamContext): Promise<TrackOption[]> {
  initModels();
  const rows = await Track.findAll({ where: { teamId: ctx.teamId }, attributes: ["id", "name"], order: [["name", "ASC"]] });
  return rows.map((t) => ({ id: t.id, name: t.name }));
}

/** Newest first; each with the sessions the caller may see (riders: their own and shared ones). */
export async function listEvents(ctx: TeamContext): Promise<EventItem[]> {
  initModels();
  const events = await RaceEvent.findAll({ where: { teamId: ctx.teamId }, order: [["startsOn", "DESC"], ["id", "DESC"]] });
  if (events.length === 0) return [];
  const [tracks, sessions] = await Promise.all([
    listTrackOptions(ctx),
    RideSession.findAll({ where: { ...(await sessionVisibility(ctx)), eventId: { [Op.in]: events.map((e) => e.id) } }, order: [["startedAt", "ASC"], ["id", "ASC"]] }),
  ]);
  const riderIds = [...new Set(sessions.map((s) => s.riderId).filter((x): x is number => x != null))];
  const riders = riderIds.length ? await Rider.findAll({ where: { id: { [Op.in]: riderIds }, teamId: ctx.teamId } }) : [];
  return events.map((e) => ({
    id: e.id,
    name: e.name,
    trackId: e.trackId,
    trackName: tracks.find((t) => t.id === e.trackId)?.name ?? null,
    startsOn: e.startsOn,
    endsOn: e.endsOn,
    sessions: sessions
      .filter((s) => s.eventId === e.id)
      .map((s) => ({
        id: s.id,
        title: s.title ?? `Session ${s.id}`,
        kind: s.kind,
        status: s.status,
        startedAt: s.startedAt?.toISOString() ?? null,
        riderName: riders.find((r) => r.id === s.riderId)?.name ?? null,
      })),
  }));
}

async function checkTrack(ctx: TeamContext, trackId: number | null): Promise<void> {
  if (trackId === null) return;
  const t = await Track.findOne({ where: { id: trackId, teamId: ctx.teamId }, attributes: ["id"] });
  if (!t) throw notFound("Track");
}

export async function createEvent(ctx: TeamContext, raw: unknown): Promise<{ id: number }> {
  assertCanEditSetup(ctx);
  const input = eventSchema.parse(raw);
  initModels();
  await checkTrack(ctx, input.trackId);
  const e = await RaceEvent.create({ teamId: ctx.teamId, ...input });
  return { id: e.id };
}

export async function updateEvent(ctx: TeamContext, id: number, raw: unknown): Promise<{ id: number }> {
  assertCanEditSetup(ctx);
  initModels();
  const e = await RaceEvent.findOne({ where: { id, teamId: ctx.teamId } });
  if (!e) throw notFound("Event");
  const input = eventSchema.parse(raw);
  await checkTrack(ctx, input.trackId);
  await e.update(input);
  return { id: e.id };
}
