/**
 * Contract test for the upload path with the REAL uploadthing SDK (route handler, browser upload
 * client, UTApi) against the local upload fake, no Next involved. If an SDK upgrade changes the
 * internal protocol, this is the test that breaks.
 */
import { createHash, createHmac } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { createRouteHandler, UploadThingError, UTApi } from "uploadthing/server";
import { genUploader } from "uploadthing/client";
import { createLogFileRouter, isStoredFileUrl, memoryGrantStore, uploadDenied, type CompletedLogFile, type LogFileRouter, type Uploader } from "../../lib/uploads/file-router";
import { makeUploadthingToken, startUploadFake, type UploadFake } from "../../workers/services/upload-fake";
import { FetchBackedXhr, serve } from "./helpers/upload-harness";
import { at } from "../fixtures/at";

const apiKey = "sk_contract_test_key";
const token = makeUploadthingToken({ apiKey, appId: "lapbench-contract" });
const FAKE_LIMIT = 256 * 1024; // below the router's 1MB limit, so each side's check can be hit alone

function csvFile(name: string, bytes: number): File {
  let body = "time [s];speed_rear [km/h];engine_rpm\n";
  for (let i = 0; body.length < bytes; i++) body += `${(i / 100).toFixed(2)};${(120 + Math.sin(i / 50) * 40).toFixed(1)};${9000 + (i % 4000)}\n`;
  return new File([body.slice(0, bytes)], name, { type: "text/csv" });
}

const sha256 = (b: ArrayBuffer | Buffer) => createHash("sha256").update(Buffer.from(b as ArrayBuffer)).digest("hex");
const signBody = (body: string, key: string) => `hmac-sha256=${createHmac("sha256", key).update(body).digest("hex")}`;

let storageDir: string;
let fake: UploadFake;
let app: Awaited<ReturnType<typeof serve>>;
let devApp: Awaited<ReturnType<typeof serve>>;
let completed: Array<{ metadata: Uploader; file: CompletedLogFile }> = [];
let nextSessionId = 100;
const originalXhr = (globalThis as Record<string, unknown>).XMLHttpRequest;

const grants = memoryGrantStore();
const router = createLogFileRouter({
  maxFileSize: "1MB",
  grants,
  fileOrigins: () => [fake.url],
  authorize(req) {
    if (req.headers.get("x-test-user") === "anonymous") throw uploadDenied("Sign in to upload");
    if (req.headers.get("x-test-user") === "outsider") throw uploadDenied("Not a member of this team");
    // A code uploadthing 7 does not have (older SDKs had UNAUTHORIZED): must still refuse.
    if (req.headers.get("x-test-user") === "legacy") throw new UploadThingError({ code: "UNAUTHORIZED" as "FORBIDDEN", message: "Session expired" });
    return { userId: "user-7", teamId: "team-3" };
  },
  async onComplete(args) {
    if (args.file.name === "corrupt.csv") throw new Error("could not create the session");
    completed.push(args);
    return { sessionId: nextSessionId++ };
  },
});

const postCallback = (payload: string, signature: string) =>
  fetch(`${app.url}?slug=logFile`, { method: "POST", headers: { "content-type": "application/json", "uploadthing-hook": "callback", "x-uploadthing-signature": signature }, body: payload });
async function waitFor(cond: () => boolean, ms = 5_000) {
  const deadline = Date.now() + ms;
  while (!cond()) {
    if (Date.now() > deadline) throw new Error("condition not met in time");
    await new Promise((r) => setTimeout(r, 25));
  }
}

function client(url: string) {
  return genUploader<LogFileRouter>({ url, package: "lapbench-contract-test", fetch: (...a) => globalThis.fetch(...a) });
}
const storedKeys = () => fs.readdirSync(storageDir).filter((n) => !n.includes("."));

beforeAll(async () => {
  (globalThis as Record<string, unknown>).XMLHttpRequest = FetchBackedXhr;
  storageDir = fs.mkdtempSync(path.join(os.tmpdir(), "lapbench-uploads-"));
  fake = await startUploadFake({ port: 0, storageDir, apiKey, maxFileSize: FAKE_LIMIT, callbackTimeoutMs: 1_500 });
  // Both modes exist in the product: `next start` (callback POSTed to the app) and `next dev`
  // (callbacks streamed back on the app's route-metadata request).
  const common = { token, ingestUrl: fake.url, logLevel: "Error" as const };
  let prodHandler: (req: Request) => Promise<Response> = async () => new Response(null, { status: 503 });
  let devHandler = prodHandler;
  app = await serve((req) => prodHandler(req));
  devApp = await serve((req) => devHandler(req));
  prodHandler = createRouteHandler({ router, config: { ...common, callbackUrl: app.url, isDev: false } });
  devHandler = createRouteHandler({ router, config: { ...common, callbackUrl: devApp.url, isDev: true } });
});

afterAll(async () => {
  (globalThis as Record<string, unknown>).XMLHttpRequest = originalXhr;
  await app?.close();
  await devApp?.close();
  await fake?.close();
  fs.rmSync(storageDir, { recursive: true, force: true });
});

beforeEach(() => {
  completed = [];
});

describe("upload contract: real SDK ↔ local upload fake", () => {
  it("uploads a log file: middleware metadata reaches onComplete, serverData reaches the browser, bytes round-trip", async () => {
    const file = csvFile("Practice 1 – rear.csv", 200_000);
    const result = at(await client(app.url).uploadFiles("logFile", { files: [file] }), 0);

    expect(completed).toHaveLength(1);
    expect(at(completed, 0).metadata).toEqual({ userId: "user-7", teamId: "team-3" });
    expect(at(completed, 0).file).toMatchObject({ key: result.key, name: "Practice 1 – rear.csv", size: 200_000, ufsUrl: result.ufsUrl });
    expect(result.serverData).toEqual({ sessionId: nextSessionId - 1 });

    const served = await fetch(result.ufsUrl);
    expect(served.status).toBe(200);
    // A download, never rendered by the browser as the type it guesses.
    expect(served.headers.get("content-disposition")).toBe(`attachment; filename*=UTF-8''${encodeURIComponent(file.name)}`);
    expect(served.headers.get("x-content-type-options")).toBe("nosniff");
    const bytes = await served.arrayBuffer();
    expect(sha256(bytes)).toBe(sha256(await file.arrayBuffer()));
    // fileHash is the md5 of the content, as the hosted service reports it.
    expect(result.fileHash).toBe(createHash("md5").update(Buffer.from(bytes)).digest("hex"));
    expect(fs.existsSync(path.join(storageDir, result.key))).toBe(true);
    expect(JSON.parse(fs.readFileSync(path.join(storageDir, `${result.key}.json`), "utf8"))).toMatchObject({ name: file.name, size: 200_000, type: "text/csv" });
  });

  it("delivers the completion through the dev-mode stream (isDev) as well", async () => {
    const file = csvFile("warmup.csv", 5_000);
    const result = at(await client(devApp.url).uploadFiles("logFile", { files: [file] }), 0);
    expect(result.serverData).toEqual({ sessionId: nextSessionId - 1 });
    expect(completed.map((c) => c.file.key)).toEqual([result.key]);
    expect(sha256(await (await fetch(result.ufsUrl)).arrayBuffer())).toBe(sha256(await file.arrayBuffer()));
  });

  it("refuses uploads the middleware does not authorise, storing nothing", async () => {
    const before = storedKeys();
    const upload = (who: string) => client(app.url).uploadFiles("logFile", { files: [csvFile("x.csv", 100)], headers: { "x-test-user": who } });
    await expect(upload("anonymous")).rejects.toMatchObject({ code: "FORBIDDEN", message: "Sign in to upload" });
    await expect(upload("outsider")).rejects.toMatchObject({ code: "FORBIDDEN", message: "Not a member of this team" });
    await expect(upload("legacy")).rejects.toMatchObject({ code: "FORBIDDEN", message: "Session expired" });
    expect(completed).toEqual([]);
    expect(storedKeys()).toEqual(before);
  });

  it("refuses files that are not log files with a specific message", async () => {
    const photo = new File([new Uint8Array(100)], "paddock.jpg", { type: "image/jpeg" });
    await expect(client(app.url).uploadFiles("logFile", { files: [photo] })).rejects.toThrow(/"paddock.jpg" is not a log file.*\.csv/);
  });

  it("refuses a file over the route's size limit before any bytes are sent", async () => {
    const before = storedKeys();
    await expect(client(app.url).uploadFiles("logFile", { files: [csvFile("big.csv", 1024 * 1024 + 1)] })).rejects.toThrow(/FileSizeMismatch/);
    expect(storedKeys()).toEqual(before);
  });

  it("refuses a file over the upload service's own size limit with a clear error", async () => {
    const before = storedKeys();
    const err = await client(app.url).uploadFiles("logFile", { files: [csvFile("long-race.csv", FAKE_LIMIT + 1)] }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Error);
    expect((err as { data?: { error?: string } }).data?.error).toBe(`File "long-race.csv" is 0.250 MB (262145 bytes); the upload limit is 0.250 MB (262144 bytes)`);
    expect(completed).toEqual([]);
    expect(storedKeys()).toEqual(before);
  });

  it("tells the browser when the app's onComplete fails instead of reporting success", async () => {
    const err = await client(app.url).uploadFiles("logFile", { files: [csvFile("corrupt.csv", 1_000)] }).catch((e: unknown) => e);
    expect((err as { data?: { error?: string } }).data?.error).toBe("The app reported no result for this upload within 1500 ms (did its onUploadComplete fail?)");
    expect(completed).toEqual([]);
  });

  it("route handler rejects a completion callback with a bad signature, accepts a good one", async () => {
    const grant = await grants.issue({ userId: "user-7", teamId: "team-3" });
    const payload = JSON.stringify({
      status: "uploaded",
      file: { key: "signedkey123", name: "signed.csv", size: 3, type: "text/csv", customId: null, url: "x", appUrl: "x", ufsUrl: `${fake.url}/f/signedkey123`, fileHash: "00" },
      origin: fake.url,
      metadata: { grant },
    });
    const forged = await postCallback(payload, signBody(payload, "sk_someone_elses_key"));
    expect(forged.status).toBe(400);
    expect(await forged.json()).toEqual({ message: "Invalid signature" });
    expect(completed).toEqual([]);

    const genuine = await postCallback(payload, signBody(payload, apiKey));
    expect(genuine.status).toBe(200);
    await waitFor(() => completed.length === 1);
    expect(completed.map((c) => c.metadata)).toEqual([{ userId: "user-7", teamId: "team-3" }]);
  });

  it("a correctly signed callback cannot choose the team or user, reuse a grant, or point the server at another host", async () => {
    const body = (metadata: Record<string, unknown>, ufsUrl: string, key = "plantedkey1") =>
      JSON.stringify({
        status: "uploaded",
        file: { key, name: "planted.csv", size: 3, type: "text/csv", customId: null, url: ufsUrl, appUrl: ufsUrl, ufsUrl, fileHash: "00" },
        origin: fake.url,
        metadata,
      });
    const send = (b: string) => postCallback(b, signBody(b, apiKey));

    // Team and user in the body, no grant: refused (before, this planted a session in team-3).
    await send(body({ userId: "attacker", teamId: "team-3" }, `${fake.url}/f/plantedkey1`));
    // A grant, but the file is elsewhere (the server would fetch any URL): refused, grant kept.
    const grant = await grants.issue({ userId: "user-7", teamId: "team-3" });
    for (const url of ["http://169.254.169.254/f/plantedkey1", `${fake.url}/f/anotherkey`, `${fake.url}/f/plantedkey1?x=1`, `http://user:pw@${new URL(fake.url).host}/f/plantedkey1`]) {
      await send(body({ grant }, url));
    }
    await new Promise((r) => setTimeout(r, 300)); // onUploadComplete runs after the reply
    expect(completed).toEqual([]);

    // The grant with the right file: accepted, and the team comes from the grant, not the body.
    await send(body({ grant, teamId: "team-other", userId: "attacker" }, `${fake.url}/f/plantedkey1`));
    await waitFor(() => completed.length === 1);
    expect(at(completed, 0).metadata).toEqual({ userId: "user-7", teamId: "team-3" });
    // Used once: a replay of the same grant is refused.
    await send(body({ grant }, `${fake.url}/f/plantedkey2`, "plantedkey2"));
    await new Promise((r) => setTimeout(r, 300));
    expect(completed).toHaveLength(1);
  });

  it("accepts file URLs only on the storage origins, at /f/<key>", () => {
    const origins = ["http://127.0.0.1:4100"];
    expect(isStoredFileUrl("http://127.0.0.1:4100/f/abc", "abc", origins)).toBe(true);
    expect(isStoredFileUrl("http://127.0.0.1:4101/f/abc", "abc", origins)).toBe(false);
    expect(isStoredFileUrl("http://localhost:4100/f/abc", "abc", origins)).toBe(false);
    expect(isStoredFileUrl("file:///etc/passwd", "abc", origins)).toBe(false);
    expect(isStoredFileUrl("http://127.0.0.1:4100/f/abc/../../admin", "abc", origins)).toBe(false);
    expect(isStoredFileUrl("not a url", "abc", origins)).toBe(false);
  });

  it("presigned URLs: tampering is refused, and an interrupted upload resumes from the HEAD offset", async () => {
    const file = csvFile("resume.csv", 100_000);
    const bytes = Buffer.from(await file.arrayBuffer());
    const presign = await fetch(`${app.url}?actionType=upload&slug=logFile`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ files: [{ name: file.name, size: file.size, type: file.type, lastModified: 1 }], input: null }),
    });
    const { url, key } = at((await presign.json()) as Array<{ url: string; key: string }>, 0);
    const put = (target: string, part: Buffer, start: number) => {
      const form = new FormData();
      form.append("file", new Blob([new Uint8Array(part)]));
      return fetch(target, { method: "PUT", headers: { Range: `bytes=${start}-` }, body: form });
    };

    const tampered = await put(url.replace("x-ut-file-size=100000", "x-ut-file-size=99999"), bytes, 0);
    expect(tampered.status).toBe(403);
    expect(await tampered.json()).toEqual({ error: "Invalid upload URL signature" });

    const cut = await put(url, bytes.subarray(0, 40_000), 0);
    expect(cut.status).toBe(400);
    expect((await cut.json()).error).toBe("Received 40000 of 100000 bytes; resume from 40000");
    const head = await fetch(url, { method: "HEAD" });
    expect(head.headers.get("x-ut-range-start")).toBe("40000");

    const rest = await put(url, bytes.subarray(40_000), 40_000);
    expect(rest.status).toBe(200);
    const reply = (await rest.json()) as { ufsUrl: string; serverData: unknown };
    expect(reply.serverData).toEqual({ sessionId: nextSessionId - 1 });
    expect(completed.map((c) => c.file.key)).toEqual([key]);
    expect(sha256(await (await fetch(reply.ufsUrl)).arrayBuffer())).toBe(sha256(bytes));
  });

  it("answers browser CORS preflights and exposes the resume header", async () => {
    const r = await fetch(`${fake.url}/somekey`, {
      method: "OPTIONS",
      headers: { origin: "http://localhost:3000", "access-control-request-method": "PUT", "access-control-request-headers": "range,x-uploadthing-version" },
    });
    expect(r.status).toBe(204);
    expect(r.headers.get("access-control-allow-origin")).toBe("http://localhost:3000");
    expect(r.headers.get("access-control-allow-methods")).toContain("PUT");
    expect(r.headers.get("access-control-allow-headers")).toBe("range,x-uploadthing-version");
    expect(r.headers.get("access-control-expose-headers")).toBe("x-ut-range-start");
  });

  it("UTApi: server-side upload, listFiles and deleteFiles against the fake", async () => {
    const utapi = new UTApi({ token, apiUrl: fake.url, ingestUrl: fake.url, logLevel: "Error" });
    const up = await utapi.uploadFiles(csvFile("from-server.csv", 1_000));
    expect(up.error).toBeNull();
    const key = up.data!.key;
    expect(await (await fetch(up.data!.ufsUrl)).text()).toBe(await csvFile("from-server.csv", 1_000).text());
    expect(completed).toEqual([]); // no route, so no callback

    const listed = await utapi.listFiles();
    expect(listed.files.map((f) => f.key)).toContain(key);
    expect(listed.files.find((f) => f.key === key)).toMatchObject({ name: "from-server.csv", size: 1_000, status: "Uploaded" });

    expect(await utapi.deleteFiles(key)).toMatchObject({ success: true, deletedCount: 1 });
    expect((await fetch(up.data!.ufsUrl)).status).toBe(404);
    expect((await utapi.listFiles()).files.map((f) => f.key)).not.toContain(key);
  });

  it("rejects service API calls without the app's API key", async () => {
    const r = await fetch(`${fake.url}/v6/listFiles`, { method: "POST", headers: { "x-uploadthing-api-key": "sk_wrong" }, body: "{}" });
    expect(r.status).toBe(401);
    expect(await r.json()).toEqual({ error: "Missing or wrong x-uploadthing-api-key" });
  });
});
