import { teamRoute } from "@/lib/http/route";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { sessionLapTableCsv } from "@/lib/data/lap-exports";

/** GET /api/sessions/:id/laps.csv — the lap table as CSV (formula-looking cells neutralised). */
export const GET = teamRoute<{ id: string }>({}, async (_req, ctx, { id }) => {
  const sessionId = parseId(id);
  if (sessionId === null) throw new HttpError(404, "Session was not found in your team.");
  const { fileName, csv } = await sessionLapTableCsv(ctx, sessionId);
  return new Response(csv, {
    status: 200,
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${fileName}"`, "cache-control": "private, no-store" },
  });
});
