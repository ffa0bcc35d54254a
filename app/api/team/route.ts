import { NextResponse } from "next/server";
import { teamRoute } from "@/lib/http/route";
import { listMembers } from "@/lib/data/team";

/** GET /api/team — the active team, its members and the caller's role. */
export const GET = teamRoute({}, async (_req, ctx) =>
  NextResponse.json({
    team: { id: ctx.teamId, name: ctx.teamName, slug: ctx.teamSlug },
    role: ctx.role,
    members: await listMembers(ctx.teamId),
  }),
);
