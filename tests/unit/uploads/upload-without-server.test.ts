/**
 * The log-file route handler's middleware and completion paths with no upload service running:
 * msw stands in for the hosted service's endpoints (route-metadata, callback-result, /v6 API).
 */
import { createHmac } from "node:crypto";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { createRouteHandler, UTApi } from "uploadthing/server";
import { createLogFileRouter, memoryGrantStore, uploadDenied, type CompletedLogFile, type Uploader } from "../../../lib/uploads/file-router";
import { makeUploadthingToken } from "../../../workers/services/upload-fake";
import { at } from "../../fixtures/at";

const INGEST = "http://ingest.lapbench.test";
const API = "http://api.lapbench.test";
const APP = "http://app.lapbench.test/api/uploadthing";
const apiKey = "sk_unit_test_key";
const token = makeUploadthingToken({ apiKey, appId: "lapbench-unit" });
const hmac = (s: string, key = apiKey) => `hmac-sha256=${createHmac("sha256", key).update(s).digest("hex")}`;

interface Seen { path: string; apiKey: string | null; body: Record<string, unknown> }
let seen: Seen[] = [];
let completed: Array<{ metadata: Uploader; file: CompletedLogFile }> = [];

const service = setupServer(
  ...["/route-metadata", "/callback-result"].map((p) =>
    http.post(`${INGEST}${p}`, async ({ request }) => {
      seen.push({ path: p, apiKey: request.headers.get("x-uploadthing-api-key"), body: (await request.json()) as Record<string, unknown> });
      return HttpResponse.json({ ok: true });
    }),
  ),
  http.post(`${API}/v6/listFiles`, ({ request }) =>
    request.headers.get("x-uploadthing-api-key") === apiKey
      ? HttpResponse.json({ hasMore: false, files: [{ id: "k1", customId: null, key: "k1", name: "fp1.csv", size: 10, status: "Uploaded", uploadedAt: 1 }] })
      : HttpResponse.json({ error: "bad key" }, { status: 401 }),
  ),
);

const grants = memoryGrantStore();
const router = createLogFileRouter({
  grants,
  fileOrigins: () => [INGEST],
  authorize(req) {
    if (req.headers.get("x-test-user") === "outsider") throw uploadDenied("Not a member of this team");
    return { userId: "user-1", teamId: "team-9" };
  },
  async onComplete(args) {
    completed.push(args);
    return { sessionId: 501 };
  },
});
let handler: (req: Request) => Promise<Response>;

beforeAll(() => {
  service.listen({ onUnhandledRequest: "error" });
  // Made after listen(), so the SDK's fetch is the one msw has patched.
  handler = createRouteHandler({ router, config: { token, ingestUrl: INGEST, isDev: false, logLevel: "None" } });
});
afterEach(() => service.resetHandlers());
afterAll(() => service.close());
beforeEach(() => {
  seen = [];
  completed = [];
});

function requestUpload(files: Array<{ name: string; size: number; type: string }>, headers: Record<string, string> = {}) {
  return handler(
    new Request(`${APP}?actionType=upload&slug=logFile`, {
      method: "POST",
      // Without UPLOADTHING_CALLBACK_URL the SDK builds the callback URL from the Host header.
      headers: { "content-type": "application/json", host: "app.lapbench.test", ...headers },
      body: JSON.stringify({ files: files.map((f) => ({ ...f, lastModified: 1 })), input: null }),
    }),
  );
}

function callback(payload: string, signature: string) {
  return handler(
    new Request(`${APP}?slug=logFile`, {
      method: "POST",
      headers: { "content-type": "application/json", "uploadthing-hook": "callback", "x-uploadthing-signature": signature },
      body: payload,
    }),
  );
}

// The service returns the metadata the app registered: only the id of the server-side upload grant.
const uploadedPayload = (grant: string) => JSON.stringify({
  status: "uploaded",
  file: { key: "abc123", name: "fp1.csv", size: 1234, type: "text/csv", customId: null, url: `${INGEST}/f/abc123`, appUrl: `${INGEST}/f/abc123`, ufsUrl: `${INGEST}/f/abc123`, fileHash: "d41d8cd98f00b204e9800998ecf8427e" },
  origin: INGEST,
  metadata: { grant },
});

describe("log-file route handler with msw as the upload service", () => {
  it("authorised upload request: signed presigned URL, and route metadata registered with the service", async () => {
    const res = await requestUpload([{ name: "fp1.csv", size: 1234, type: "text/csv" }]);
    expect(res.status).toBe(200);
    const presigned = at((await res.json()) as Array<{ url: string; key: string; name: string }>, 0);
    expect(presigned.name).toBe("fp1.csv");

    const url = new URL(presigned.url);
    expect(`${url.origin}${url.pathname}`).toBe(`${INGEST}/${presigned.key}`);
    expect(url.searchParams.get("x-ut-file-size")).toBe("1234");
    expect(url.searchParams.get("x-ut-slug")).toBe("logFile");
    const sigAt = presigned.url.lastIndexOf("&signature=");
    expect(url.searchParams.get("signature")).toBe(hmac(presigned.url.slice(0, sigAt)));

    expect(seen).toEqual([
      {
        path: "/route-metadata",
        apiKey,
        // Team and user stay on the server: the service only carries the grant's random id.
        body: { fileKeys: [presigned.key], metadata: { grant: expect.stringMatching(/^grant-/) }, isDev: false, callbackUrl: APP, callbackSlug: "logFile", awaitServerData: true },
      },
    ]);
  });

  it("refused by the middleware: 403 with the reason, nothing registered with the service", async () => {
    const res = await requestUpload([{ name: "fp1.csv", size: 1234, type: "text/csv" }], { "x-test-user": "outsider" });
    expect(res.status).toBe(403);
    expect(await res.json()).toEqual({ message: "Not a member of this team" });
    expect(seen).toEqual([]);
  });

  it("refuses a GPX file above its own limit (GPX is parsed whole) before anything is stored", async () => {
    const big = await requestUpload([{ name: "day.gpx", size: 65 * 1024 * 1024, type: "application/gpx+xml" }]);
    expect(big.status).toBe(400);
    expect(((await big.json()) as { message: string }).message).toBe('"day.gpx" is 65.0 MiB; a GPX file is read whole, so the limit is 64 MiB. Split the track, or export it as NMEA 0183 or CSV.');
    // The same size as CSV or NMEA is fine (streamed).
    expect((await requestUpload([{ name: "day.nmea", size: 65 * 1024 * 1024, type: "text/plain" }])).status).toBe(200);
    expect(seen.filter((x) => x.path === "/route-metadata")).toHaveLength(1);
  });

  it("refuses a second file and a non-log file", async () => {
    const two = await requestUpload([{ name: "a.csv", size: 1, type: "text/csv" }, { name: "b.csv", size: 1, type: "text/csv" }]);
    expect(two.status).toBe(400);
    expect(await two.json()).toEqual({ message: "Invalid config: FileCountMismatch" });

    const photo = await requestUpload([{ name: "grid.png", size: 10, type: "image/png" }]);
    expect(photo.status).toBe(400);
    expect(((await photo.json()) as { message: string }).message).toMatch(/^"grid.png" is not a log file Lapbench can read/);
    expect(seen).toEqual([]);
  });

  it("signed completion callback runs onComplete and reports serverData to the service", async () => {
    const payload = uploadedPayload(await grants.issue({ userId: "user-1", teamId: "team-9" }));
    const res = await callback(payload, hmac(payload));
    expect(res.status).toBe(200);
    expect(completed).toEqual([
      {
        metadata: { userId: "user-1", teamId: "team-9" },
        file: { key: "abc123", name: "fp1.csv", size: 1234, ufsUrl: `${INGEST}/f/abc123`, fileHash: "d41d8cd98f00b204e9800998ecf8427e" },
      },
    ]);
    expect(seen).toEqual([{ path: "/callback-result", apiKey, body: { fileKey: "abc123", callbackData: { sessionId: 501 } } }]);
  });

  it("completion callback with a wrong or missing signature is rejected without running onComplete", async () => {
    const payload = uploadedPayload(await grants.issue({ userId: "user-1", teamId: "team-9" }));
    for (const signature of [hmac(payload, "sk_not_our_key"), ""]) {
      const res = await callback(payload, signature);
      expect(res.status).toBe(400);
      expect(await res.json()).toEqual({ message: "Invalid signature" });
    }
    expect(completed).toEqual([]);
    expect(seen).toEqual([]);
  });

  it("UTApi calls reach msw when the UTApi is made after listen()", async () => {
    const utapi = new UTApi({ token, apiUrl: API, logLevel: "None" });
    expect((await utapi.listFiles()).files.map((f) => f.name)).toEqual(["fp1.csv"]);
  });
});
