import { createRouteHandler } from "uploadthing/next";
import { logFileRouter } from "@/lib/uploads/log-file-router";

// The SDK reads UPLOADTHING_TOKEN / UPLOADTHING_INGEST_URL / UPLOADTHING_CALLBACK_URL from the
// environment; `npm start` points them at the local upload service (workers/services/upload-fake.ts).
export const { GET, POST } = createRouteHandler({ router: logFileRouter });
