import "server-only";
/** The Sessions screen: every session the caller may see, newest first, filtered by event and rider. */
import { Op } from "sequelize";
import { initModels, RaceEvent, Rider, Bike, RideSession } from "@/models";
import type { TeamContext } from "@/lib/auth/guard";
import { sessionVisibility, toSessionListItem, type SessionListItem } from "./sessions";

export interface SessionFilter {
  eventId?: number | null;
  riderId?: number | null;
}

export interface SessionListPage {
  sessions: SessionListItem[];
  events: { id: number; name: string }[];
  riders: { id: number; name: string }[];
}

/** Sessions are a few per outing; 500 covers seasons before paging is needed. */
const MAX_LISTED = 500;

export async function listSessions(ctx: TeamContext, filter: SessionFilter = {}): Promise<SessionListPage> {
  initModels();
  // The visibility rule comes first and filters only narrow it: a rider's filter cannot widen it.
  const where = {
    [Op.and]: [
      await sessionVisibility(ctx),
      ...(filter.eventId != null ? [{ eventId: filter.eventId }] : []),
      ...(filter.riderId != null ? [{ riderId: filter.riderId }] : []),
    ],
  };
  const [rows, events, riders, bikes] = await Promise.all([
    RideSession.findAll({ where, order: [["createdAt", "DESC"], ["id", "DESC"]], limit: MAX_LISTED }),
    RaceEvent.findAll({ where: { teamId: ctx.teamId }, order: [["startsOn", "DESC"], ["name", "ASC"]], attributes: ["id", "name"] }),
    Rider.findAll({ where: { teamId: ctx.teamId }, order: [["name", "ASC"]], attributes: ["id", "name"] }),
    Bike.findAll({ where: { teamId: ctx.teamId }, attributes: ["id", "name"] }),
  ]);
  return {
    sessions: rows.map((r) => toSessionListItem(r, { riders, bikes, events })),
    events: events.map((e) => ({ id: e.id, name: e.name })),
    riders: riders.map((r) => ({ id: r.id, name: r.name })),
  };
}
