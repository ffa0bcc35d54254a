import "server-only";
/** Read access to ride sessions as plain objects, with the role rules applied: a rider sees their own sessions and those shared with riders, every other role all of the team's. */
import { Op, literal, type WhereOptions } from "sequelize";
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

/**
 * The one rider-visibility rule, as SQL over ride_sessions aliased `alias`: a rider sees the
 * sessions shared with riders and those of the team's rider rows linked to their sign-in (a
 * subquery, so the rule costs no extra round trip). Every other role sees all of the team's.
 * Both forms below — raw SQL and the Sequelize condition — are built from this text.
 */
function riderSeesSql(alias: string): string {
  return `(${alias}.shared_with_riders = 1 OR ${alias}.rider_id IN (SELECT id FROM riders WHERE team_id = ? AND user_id = ?))`;
}

/** The rule for Sequelize finders on RideSession (aliased by its model name, as Sequelize does). */
export async function sessionVisibility(ctx: TeamContext): Promise<WhereOptions> {
  const sequelize = initModels();
  const base = { teamId: ctx.teamId };
  if (ctx.role !== "rider") return base;
  const values = [ctx.teamId, ctx.userId];
  let k = 0;
  const filled = riderSeesSql(`\`${RideSession.name}\``).replace(/\?/g, () => sequelize.escape(values[k++] ?? null));
  return { ...base, [Op.and]: [literal(filled)] };
}

/** The same rule as raw SQL with replacements, for hot paths that query ride_sessions directly. */
export function sessionVisibilitySql(ctx: TeamContext, alias: string): { sql: string; replacements: (string | number)[] } {
  const base = `${alias}.team_id = ?`;
  if (ctx.role !== "rider") return { sql: base, replacements: [ctx.teamId] };
  return { sql: `(${base} AND ${riderSeesSql(alias)})`, replacements: [ctx.teamId, ctx.teamId, ctx.userId] };
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
