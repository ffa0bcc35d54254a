import { teamRoute } from "@/lib/http/route";
import { lapSeriesQuerySchema } from "@/lib/series/lap-series-query";
import { loadLapSeries } from "@/lib/data/lap-series";
import { encodeSeries, SERIES_CONTENT_TYPE } from "@/lib/series/binary";

/**
 * GET /api/series?laps=12:3,12:5&roles=speed_front,throttle&x=distance&width=1200 — laps of any
 * visible sessions of the team as columnar binary (lib/series/binary.ts). Another team's laps and
 * sessions a rider may not see answer 404.
 */
export const GET = teamRoute({}, async (req, ctx) => {
  const query = lapSeriesQuerySchema.parse(Object.fromEntries(new URL(req.url).searchParams));
  const { meta, arrays } = await loadLapSeries(ctx, query);
  const body = encodeSeries(meta, arrays);
  return new Response(body.buffer as ArrayBuffer, {
    status: 200,
    headers: { "content-type": SERIES_CONTENT_TYPE, "cache-control": "private, no-store", "content-length": String(body.byteLength) },
  });
});
