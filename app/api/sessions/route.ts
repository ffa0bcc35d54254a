import { NextResponse } from "next/server";
import { teamRoute } from "@/lib/http/route";
import { listRecentSessions } from "@/lib/data/sessions";

/** GET /api/sessions — the team's recent sessions (riders: their own and shared ones). */
export const GET = teamRoute({}, async (req, ctx) => {
  const limit = Math.min(100, Math.max(1, Number(new URL(req.url).searchParams.get("limit") ?? 20) || 20));
  return NextResponse.json({ sessions: await listRecentSessions(ctx, limit) });
});
