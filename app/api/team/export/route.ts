import { Readable } from "node:stream";
import { teamRoute } from "@/lib/http/route";
import { teamExportStream } from "@/lib/data/team-export";

/** GET /api/team/export — the owner's full export of the team as a zip, streamed as it is written. */
export const GET = teamRoute({ roles: ["owner"] }, async (_req, ctx) => {
  const { fileName, stream } = await teamExportStream(ctx);
  return new Response(Readable.toWeb(stream) as unknown as ReadableStream<Uint8Array>, {
    status: 200,
    headers: { "content-type": "application/zip", "content-disposition": `attachment; filename="${fileName}"`, "cache-control": "private, no-store" },
  });
});
export const dynamic = "force-dynamic";
