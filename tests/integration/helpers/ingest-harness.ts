/**
 * The real upload path for integration tests: the local upload fake, our real log-file router
 * (guard + registerUpload) behind the SDK's route handler, and the SDK's browser client.
 */
import { createRouteHandler } from "uploadthing/server";
import { genUploader } from "uploadthing/client";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { makeUploadthingToken, startUploadFake, type UploadFake } from "@/workers/services/upload-fake";
import { logFileRouter, type AppLogFileRouter } from "@/lib/uploads/log-file-router";
import { FetchBackedXhr, serve } from "./upload-harness";
import { at } from "../../fixtures/at";

export interface UploadHarness {
  upload(file: File, cookie: string): Promise<{ sessionId: number }>;
  close(): Promise<void>;
  storageDir: string;
}

export async function startUploadHarness(): Promise<UploadHarness> {
  (globalThis as Record<string, unknown>).XMLHttpRequest = FetchBackedXhr;
  const apiKey = "sk_ingest_test_key";
  const storageDir = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-ingest-"));
  const fake: UploadFake = await startUploadFake({ port: 0, storageDir, apiKey });
  // The app accepts file URLs only on the configured storage service: this run's fake.
  process.env.LAPBENCH_FILE_ORIGINS = fake.url;
  let handler: (req: Request) => Promise<Response> = async () => new Response(null, { status: 503 });
  const app = await serve((req) => handler(req));
  const h = createRouteHandler({
    router: logFileRouter,
    config: { token: makeUploadthingToken({ apiKey, appId: "lapbench-ingest-test" }), ingestUrl: fake.url, callbackUrl: app.url, isDev: false, logLevel: "Error" },
  });
  handler = (req) => h(req);
  const client = genUploader<AppLogFileRouter>({ url: app.url, package: "lapbench-ingest-test", fetch: (...a) => globalThis.fetch(...a) });
  return {
    storageDir,
    async upload(file, cookie) {
      const res = at(await client.uploadFiles("logFile", { files: [file], headers: { cookie } }), 0);
      return res.serverData as { sessionId: number };
    },
    async close() {
      await app.close();
      await fake.close();
      fs.rmSync(storageDir, { recursive: true, force: true });
    },
  };
}
