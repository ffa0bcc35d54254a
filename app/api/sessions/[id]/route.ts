import { NextResponse } from "next/server";
import { teamRoute } from "@/lib/http/route";
import { getSessionForViewer } from "@/lib/data/session-for-viewer";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";

/** GET /api/sessions/:id — one session; 404 for other teams' sessions and sessions a rider may not see. */
export const GET = teamRoute<{ id: string }>({}, async (_req, ctx, { id }) => {
  const sessionId = parseId(id);
  if (sessionId === null) throw new HttpError(404, "Session was not found in your team.");
  return NextResponse.json({ session: await getSessionForViewer(ctx, sessionId) });
});
