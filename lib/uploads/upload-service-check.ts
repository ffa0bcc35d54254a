/**
 * Before handing out upload URLs, make sure the configured upload service answers at all: when it
 * is down, the browser would otherwise fail later with a bare network error. Any HTTP answer counts
 * (the service's root may well be a 404); only a refused or timed-out connection is "down". Checked
 * only when `UPLOADTHING_INGEST_URL` names the service (the local service, or a self-hosted one).
 */
import { UploadThingError } from "uploadthing/server";

export const UPLOAD_SERVICE_DOWN_MESSAGE =
  "The upload service is not answering, so nothing was stored. Try again in a moment; if it keeps failing, the upload service needs a restart.";

export async function assertUploadServiceAnswers(ingestUrl = process.env.UPLOADTHING_INGEST_URL, timeoutMs = 3000): Promise<void> {
  if (!ingestUrl) return;
  try {
    const r = await fetch(ingestUrl, { method: "HEAD", signal: AbortSignal.timeout(timeoutMs) });
    await r.body?.cancel();
  } catch {
    throw new UploadThingError({ code: "UPLOAD_FAILED", message: UPLOAD_SERVICE_DOWN_MESSAGE });
  }
}
