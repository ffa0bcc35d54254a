import { NextResponse } from "next/server";
import { teamRoute } from "@/lib/http/route";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { listSessionLaps } from "@/lib/data/laps";

/** GET /api/sessions/:id/laps — the session's laps (Compare's lap picker). */
export const GET = teamRoute<{ id: string }>({}, async (_req, ctx, { id }) => {
  const sessionId = parseId(id);
  if (sessionId === null) throw new HttpError(404, "Session was not found in your team.");
  return NextResponse.json(await listSessionLaps(ctx, sessionId));
});
