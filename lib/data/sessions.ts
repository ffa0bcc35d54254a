import "server-only";
/** Read access to ride sessions as plain objects, with the role rules applied: a rider sees their own sessions and those shared with riders, every other role all of the team's. */
import { Op, type WhereOptions } from "sequelize";
import { initModels, RideSession, Rider, Bike, RaceEvent, type SessionKind, type SessionStatus } from "@/models";
import type { TeamContext } from "@/lib/auth/guard";

export interface SessionListItem {
  id: number;
  title: string;
  kind: SessionKind;
  status: SessionStatus;
  progress: number;
  statusReason: string | null;
  startedAt: string | null;
  createdAt: string;
  riderName: string | null;
  bikeName: string | null;
  eventName: string | null;
}

/** Riders see their own sessions and those shared with riders; every other role sees all. */
export async function sessionVisibility(ctx: TeamContext): Promise<WhereOptions> {
  initModels();
  const base = { teamId: ctx.teamId };
  if (ctx.role !== "rider") return base;
  const mine = await Rider.findAll({ where: { teamId: ctx.teamId, userId: ctx.userId }, attributes: ["id"] });
  const ids = mine.map((r) => r.id);
  return { ...base, [Op.or]: [{ sharedWithRiders: true }, ...(ids.length ? [{ riderId: { [Op.in]: ids } }] : [])] };
}

/**
 * The same rule as sessionVisibility, as SQL over ride_sessions aliased `alias`, for raw queries
 * on hot paths: the rider's own riders are a subquery, so the rule costs no extra round trip.
 */
export function sessionVisibilitySql(ctx: TeamContext, alias: string): { sql: string; replacements: (string | number)[] } {
  const base = `${alias}.team_id = ?`;
  if (ctx.role !== "rider") return { sql: base, replacements: [ctx.teamId] };
  return {
    sql: `(${base} AND (${alias}.shared_with_riders = 1 OR ${alias}.rider_id IN (SELECT id FROM riders WHERE team_id = ? AND user_id = ?)))`,
    replacements: [ctx.teamId, ctx.teamId, ctx.userId],
  };
}

export async function listRecentSessions(ctx: TeamContext, limit = 20): Promise<SessionListItem[]> {
  initModels();
  const rows = await RideSession.findAll({ where: await sessionVisibility(ctx), order: [["createdAt", "DESC"]], limit });
  const riderIds = [...new Set(rows.map((r) => r.riderId).filter((x): x is number => x != null))];
  const bikeIds = [...new Set(rows.map((r) => r.bikeId).filter((x): x is number => x != null))];
  const eventIds = [...new Set(rows.map((r) => r.eventId).filter((x): x is number => x != null))];
  const [riders, bikes, events] = await Promise.all([
    riderIds.length ? Rider.findAll({ where: { id: { [Op.in]: riderIds } } }) : [],
    bikeIds.length ? Bike.findAll({ where: { id: { [Op.in]: bikeIds } } }) : [],
    eventIds.length ? RaceEvent.findAll({ where: { id: { [Op.in]: eventIds } } }) : [],
  ]);
  return rows.map((r) => toSessionListItem(r, { riders, bikes, events }));
}

/** One session row as a list item, with the names of its rider, bike and event from lists already read. */
export function toSessionListItem(
  r: RideSession,
  names: { riders: { id: number; name: string }[]; bikes: { id: number; name: string }[]; events: { id: number; name: string }[] },
): SessionListItem {
  const name = (list: { id: number; name: string }[], id: number | null) => (id == null ? null : (list.find((x) => x.id === id)?.name ?? null));
  return {
    id: r.id,
    title: r.title ?? `Session ${r.id}`,
    kind: r.kind,
    status: r.status,
    progress: r.progress,
    statusReason: r.statusReason,
    startedAt: r.startedAt ? r.startedAt.toISOString() : null,
    createdAt: r.createdAt.toISOString(),
    riderName: name(names.riders, r.riderId),
    bikeName: name(names.bikes, r.bikeId),
    eventName: name(names.events, r.eventId),
  };
}
