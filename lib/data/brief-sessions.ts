import "server-only";
/** Sessions a Rider brief can be opened for: ready, visible to the caller; a rider's own first. */
import { Op } from "sequelize";
import { initModels, RideSession, Rider } from "@/models";
import type { TeamContext } from "@/lib/auth/guard";
import { sessionVisibility } from "./sessions";

export interface BriefSession {
  id: number;
  title: string;
  startedAt: string | null;
  riderName: string | null;
  mine: boolean;
}

export async function listBriefSessions(ctx: TeamContext, limit = 30): Promise<BriefSession[]> {
  initModels();
  const rows = await RideSession.findAll({ where: { ...(await sessionVisibility(ctx)), status: "ready" }, order: [["startedAt", "DESC"], ["createdAt", "DESC"]], limit });
  const riderIds = [...new Set(rows.map((r) => r.riderId).filter((x): x is number => x != null))];
  const riders = riderIds.length ? await Rider.findAll({ where: { id: { [Op.in]: riderIds } } }) : [];
  const list = rows.map((r) => {
    const rider = riders.find((x) => x.id === r.riderId);
    return { id: r.id, title: r.title ?? `Session ${r.id}`, startedAt: r.startedAt?.toISOString() ?? null, riderName: rider?.name ?? null, mine: !!rider && rider.userId === ctx.userId };
  });
  // A rider's brief is about their own riding; shared sessions come after.
  return ctx.role === "rider" ? [...list.filter((s) => s.mine), ...list.filter((s) => !s.mine)] : list;
}
