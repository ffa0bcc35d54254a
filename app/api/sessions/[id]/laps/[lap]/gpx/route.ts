import { teamRoute } from "@/lib/http/route";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { sessionLapGpx } from "@/lib/data/lap-exports";

/** GET /api/sessions/:id/laps/:lap/gpx — one lap's GPS fixes as GPX 1.1. */
export const GET = teamRoute<{ id: string; lap: string }>({}, async (_req, ctx, { id, lap }) => {
  const sessionId = parseId(id);
  const lapNumber = Number(lap);
  if (sessionId === null) throw new HttpError(404, "Session was not found in your team.");
  if (!Number.isInteger(lapNumber) || lapNumber < 0) throw new HttpError(404, "Lap was not found in this session.");
  const { fileName, gpx } = await sessionLapGpx(ctx, sessionId, lapNumber);
  return new Response(gpx, {
    status: 200,
    headers: { "content-type": "application/gpx+xml; charset=utf-8", "content-disposition": `attachment; filename="${fileName}"`, "cache-control": "private, no-store" },
  });
});
