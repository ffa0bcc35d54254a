/**
 * A local stand-in for the hosted upload service that the real uploadthing 7.7.4 SDK talks to
 * (server route handler, browser upload client, UTApi). There is no network here, so `npm start`
 * and the tests run this on loopback. Protocol: shared/notes/upload-service.md.
 *
 * Files live on disk as `<storageDir>/<key>` plus `<key>.json` (name, size, type, customId, hash).
 * State about uploads in flight (route metadata, callback results) is in memory only.
 */
import { createHash, createHmac, timingSafeEqual } from "node:crypto";
import fs from "node:fs";
import fsp from "node:fs/promises";
import http from "node:http";
import path from "node:path";
import { once } from "node:events";
import { config } from "../../lib/config";

export const DEFAULT_MAX_FILE_SIZE = 512 * 1024 * 1024;
/** Development credentials shared by the start script (app token) and the fake. */
export const DEV_UPLOAD_API_KEY = "sk_lapbench_local_development_only";
export const DEV_UPLOAD_APP_ID = "lapbench-local";

export interface UploadFakeOptions {
  port: number;
  host?: string;
  storageDir?: string;
  apiKey: string;
  maxFileSize?: number;
  /** How long a PUT waits for the app's onUploadComplete result (dev mode; otherwise at most 5 s). */
  callbackTimeoutMs?: number;
}
export interface UploadFake {
  url: string;
  close(): Promise<void>;
}

/** UPLOADTHING_TOKEN for the app: base64 JSON the SDK decodes (it insists on an `sk_` key). */
export function makeUploadthingToken(o: { apiKey: string; appId: string; regions?: string[] }): string {
  if (!o.apiKey.startsWith("sk_")) throw new Error(`Upload API key must start with "sk_", got "${o.apiKey.slice(0, 6)}…"`);
  return Buffer.from(JSON.stringify({ apiKey: o.apiKey, appId: o.appId, regions: o.regions ?? ["local"] })).toString("base64");
}

interface Registration {
  metadata: unknown;
  callbackUrl: string;
  callbackSlug: string;
  awaitServerData: boolean;
  devStream?: { res: http.ServerResponse; pending: Set<string> };
}
interface StoredFile {
  key: string; name: string; size: number; type: string; customId: string | null; fileHash: string; uploadedAt: number;
}
class HttpError extends Error {
  constructor(readonly status: number, message: string) { super(message); }
}

const KEY_RE = /^[A-Za-z0-9_-]{1,128}$/;
const sign = (body: string, apiKey: string) => `hmac-sha256=${createHmac("sha256", apiKey).update(body).digest("hex")}`;
const mb = (bytes: number) => `${(bytes / 1048576).toFixed(bytes < 1048576 ? 3 : 1)} MB (${bytes} bytes)`;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function sameSignature(a: string, b: string): boolean {
  const x = Buffer.from(a), y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

function send(res: http.ServerResponse, status: number, body: unknown) {
  if (res.headersSent) return void res.end();
  res.writeHead(status, { "content-type": "application/json" }).end(JSON.stringify(body));
}

async function readJson(req: http.IncomingMessage): Promise<Record<string, unknown>> {
  let raw = "";
  for await (const chunk of req) {
    raw += chunk;
    if (raw.length > 1_000_000) throw new HttpError(413, "JSON body larger than 1 MB");
  }
  try {
    return raw ? JSON.parse(raw) : {};
  } catch {
    throw new HttpError(400, "Request body is not valid JSON");
  }
}

/**
 * Streams the single `file` field of a multipart body into `out`, without buffering the file:
 * everything but a delimiter-sized tail is written as it arrives. Returns the bytes written.
 * Past `limit` it stops writing but keeps reading, so the client still gets to see the error.
 */
async function receiveFilePart(req: http.IncomingMessage, out: fs.WriteStream, limit: number, tooBig: string): Promise<number> {
  const boundary = /boundary=(?:"([^"]+)"|([^;]+))/i.exec(req.headers["content-type"] ?? "");
  if (!boundary) throw new HttpError(400, "Expected a multipart/form-data body with a `file` field");
  const delimiter = Buffer.from(`\r\n--${boundary[1] ?? boundary[2]}`);
  let buf = Buffer.alloc(0), inBody = false, done = false, written = 0, dropped = 0;
  let failure: HttpError | undefined;
  const write = async (b: Buffer) => {
    written += b.length;
    if (written > limit) failure = new HttpError(413, tooBig);
    else if (!out.write(b)) await once(out, "drain");
  };
  for await (const chunk of req) {
    if (done || failure) {
      if ((dropped += chunk.length) > 64 << 20) break; // not worth reading on: drop the connection
      continue;
    }
    buf = buf.length ? Buffer.concat([buf, chunk]) : chunk;
    if (!inBody) {
      const end = buf.indexOf("\r\n\r\n");
      if (end < 0) { if (buf.length > 16_384) throw new HttpError(400, "Multipart headers too long"); continue; }
      if (!/name="file"/.test(buf.subarray(0, end).toString("latin1"))) throw new HttpError(400, "Multipart body has no `file` field");
      inBody = true;
      buf = buf.subarray(end + 4);
    }
    const at = buf.indexOf(delimiter);
    if (at >= 0) { await write(buf.subarray(0, at)); done = true; continue; }
    const keep = delimiter.length - 1; // a delimiter may straddle two chunks
    if (buf.length > keep) { await write(buf.subarray(0, buf.length - keep)); buf = buf.subarray(buf.length - keep); }
  }
  if (failure) throw failure;
  if (!done) throw new HttpError(400, "Upload ended before the multipart body was complete");
  return written;
}

async function md5File(file: string): Promise<string> {
  const h = createHash("md5");
  for await (const chunk of fs.createReadStream(file)) h.update(chunk);
  return h.digest("hex");
}

export async function startUploadFake(opts: UploadFakeOptions): Promise<UploadFake> {
  const host = opts.host ?? "127.0.0.1";
  const dir = opts.storageDir ?? path.join(config.dataDir, "uploads");
  const maxFileSize = opts.maxFileSize ?? DEFAULT_MAX_FILE_SIZE;
  const callbackTimeoutMs = opts.callbackTimeoutMs ?? 60_000;
  const { apiKey } = opts;
  await fsp.mkdir(dir, { recursive: true });

  const registrations = new Map<string, Registration>();
  const results = new Map<string, (r: { callbackData?: unknown; error?: string }) => void>();
  const devStreams = new Set<http.ServerResponse>();
  let base = "";
  const filePath = (key: string) => path.join(dir, key);

  const requireApiKey = (req: http.IncomingMessage) => {
    if (req.headers["x-uploadthing-api-key"] !== apiKey) throw new HttpError(401, "Missing or wrong x-uploadthing-api-key");
  };

  /** Checks the presigned URL (HMAC over everything before `&signature=`, keyed with the API key). */
  function verifyPresigned(req: http.IncomingMessage, url: URL) {
    const raw = req.url ?? "";
    const at = raw.lastIndexOf("&signature=");
    const given = url.searchParams.get("signature");
    if (at < 0 || !given) throw new HttpError(403, "Upload URL is not signed");
    const signed = [`http://${req.headers.host}${raw.slice(0, at)}`, `${base}${raw.slice(0, at)}`];
    if (!signed.some((s) => sameSignature(sign(s, apiKey), given))) throw new HttpError(403, "Invalid upload URL signature");
    if (!(Number(url.searchParams.get("expires")) > Date.now())) throw new HttpError(403, "Upload URL has expired");
    // The SDK URI-encodes each value before URLSearchParams encodes it again.
    const param = (n: string) => { const v = url.searchParams.get(`x-ut-${n}`); return v === null ? null : decodeURIComponent(v); };
    return { name: param("file-name") ?? "file", size: Number(param("file-size")), type: param("file-type") ?? "", customId: param("custom-id"), slug: param("slug") };
  }

  /** Delivers the signed completion hook: over the app's dev stream, or as a POST to its callback URL. */
  async function deliverCallback(key: string, reg: Registration, body: object) {
    const hook = "callback";
    const payload = JSON.stringify(body);
    const signature = sign(payload, apiKey);
    if (reg.devStream) {
      if (reg.devStream.res.writableEnded || reg.devStream.res.destroyed) throw new HttpError(502, "The app closed its dev-mode callback stream");
      reg.devStream.res.write(JSON.stringify({ payload, signature, hook }) + "\n");
      reg.devStream.pending.delete(key);
      if (reg.devStream.pending.size === 0) reg.devStream.res.end();
      return;
    }
    const url = new URL(reg.callbackUrl);
    url.searchParams.set("slug", reg.callbackSlug);
    const r = await fetch(url, {
      method: "POST",
      headers: { "content-type": "application/json", "uploadthing-hook": hook, "x-uploadthing-signature": signature },
      body: payload,
    });
    if (!r.ok) throw new HttpError(502, `The app rejected the ${hook} hook (${r.status}): ${(await r.text()).slice(0, 300)}`);
  }

  async function waitForRegistration(key: string): Promise<Registration | undefined> {
    // In dev mode the browser's PUT can overtake the app's route-metadata request.
    for (let i = 0; i < 50 && !registrations.has(key); i++) await sleep(100);
    return registrations.get(key);
  }

  async function handlePut(req: http.IncomingMessage, res: http.ServerResponse, key: string, url: URL) {
    const file = verifyPresigned(req, url);
    if (!(file.size >= 0)) throw new HttpError(400, "Upload URL has no valid x-ut-file-size");
    if (file.size > maxFileSize) throw new HttpError(413, `File "${file.name}" is ${mb(file.size)}; the upload limit is ${mb(maxFileSize)}`);
    const reg = file.slug ? await waitForRegistration(key) : undefined;
    if (file.slug && !reg) throw new HttpError(400, `No route metadata was registered for file ${key}`);
    const range = /bytes=(\d+)-/.exec(String(req.headers.range ?? "")) ?? [];
    const start = Number(req.headers["x-ut-range-start"] ?? range[1] ?? 0);
    const part = filePath(key) + ".part";
    const have = await fsp.stat(part).then((s) => s.size, () => 0);
    if (start > have) throw new HttpError(416, `Resume offset ${start} is beyond the ${have} bytes received so far`);
    const out = fs.createWriteStream(part, { flags: start > 0 ? "r+" : "w", start });
    let received: number;
    try {
      const tooBig = `File "${file.name}" sent more than the ${file.size} bytes declared for this upload`;
      received = await receiveFilePart(req, out, file.size - start, tooBig);
    } catch (e) {
      out.destroy();
      if (e instanceof HttpError && e.status === 413) await fsp.rm(part, { force: true });
      // A dropped connection keeps the bytes so far: the client resumes after a HEAD.
      if (req.destroyed && !(e instanceof HttpError)) return;
      throw e;
    }
    await new Promise<void>((ok, fail) => out.end((err?: Error | null) => (err ? fail(err) : ok())));
    if (start + received !== file.size) {
      await fsp.truncate(part, start + received);
      throw new HttpError(400, `Received ${start + received} of ${file.size} bytes; resume from ${start + received}`);
    }
    const stored: StoredFile = { key, name: file.name, size: file.size, type: file.type, customId: file.customId, fileHash: await md5File(part), uploadedAt: Date.now() };
    // Sidecar first: a file that can be served always has its metadata.
    await fsp.writeFile(filePath(key) + ".json", JSON.stringify(stored, null, 2));
    await fsp.rename(part, filePath(key));
    const ufsUrl = `${base}/f/${key}`;
    const reply = { url: ufsUrl, appUrl: ufsUrl, ufsUrl, fileHash: stored.fileHash, serverData: null as unknown };
    if (!reg) return send(res, 200, reply); // UTApi uploads carry no route and get no callback

    registrations.delete(key);
    const result = new Promise<{ callbackData?: unknown; error?: string }>((resolve) => results.set(key, resolve));
    const body = { status: "uploaded", file: { ...stored, url: ufsUrl, appUrl: ufsUrl, ufsUrl }, origin: base, metadata: reg.metadata };
    const delivered = deliverCallback(key, reg, body);
    if (!reg.awaitServerData) {
      delivered.catch((e) => console.error(`[upload-fake] ${e.message}`));
      return send(res, 200, reply);
    }
    await delivered;
    // Outside dev mode the app answers the callback only after onUploadComplete has run and posted
    // its result, so a result still missing shortly after means onUploadComplete failed.
    const waitMs = reg.devStream ? callbackTimeoutMs : Math.min(5_000, callbackTimeoutMs);
    const giveUp = new Promise<{ error: string }>((r) =>
      setTimeout(() => r({ error: `The app reported no result for this upload within ${waitMs} ms (did its onUploadComplete fail?)` }), waitMs).unref());
    const outcome: { callbackData?: unknown; error?: string } = await Promise.race([result, giveUp]);
    results.delete(key);
    if (outcome.error) throw new HttpError(502, outcome.error);
    send(res, 200, { ...reply, serverData: outcome.callbackData ?? null });
  }

  async function route(req: http.IncomingMessage, res: http.ServerResponse) {
    const url = new URL(req.url ?? "/", base);
    const p = url.pathname;
    if (req.method === "OPTIONS") return void res.writeHead(204).end();
    if (req.method === "POST" && p === "/route-metadata") {
      requireApiKey(req);
      const b = await readJson(req);
      if (!Array.isArray(b.fileKeys) || typeof b.callbackUrl !== "string") throw new HttpError(400, "route-metadata needs fileKeys and callbackUrl");
      const reg: Registration = { metadata: b.metadata ?? {}, callbackUrl: b.callbackUrl, callbackSlug: String(b.callbackSlug ?? ""), awaitServerData: b.awaitServerData !== false };
      if (b.isDev === true) {
        // Dev mode: the app holds this response open and re-posts each line to its own callback URL.
        reg.devStream = { res, pending: new Set(b.fileKeys as string[]) };
        res.writeHead(200, { "content-type": "application/x-ndjson" }).flushHeaders();
        devStreams.add(res);
        res.on("close", () => devStreams.delete(res));
      }
      for (const k of b.fileKeys as string[]) registrations.set(k, reg);
      return reg.devStream ? undefined : send(res, 200, { ok: true });
    }
    if (req.method === "POST" && p === "/callback-result") {
      requireApiKey(req);
      const b = await readJson(req);
      results.get(String(b.fileKey))?.(b.error ? { error: String(b.error) } : { callbackData: b.callbackData });
      return send(res, 200, { ok: true });
    }
    if (req.method === "POST" && p === "/v6/listFiles") {
      requireApiKey(req);
      const b = await readJson(req);
      const all = (await Promise.all((await fsp.readdir(dir)).filter((n) => n.endsWith(".json")).map(
        async (n) => JSON.parse(await fsp.readFile(path.join(dir, n), "utf8")) as StoredFile,
      ))).sort((a, z) => z.uploadedAt - a.uploadedAt);
      const offset = Number(b.offset ?? 0), limit = Number(b.limit ?? 500);
      const files = all.slice(offset, offset + limit).map((f) => ({ id: f.key, customId: f.customId, key: f.key, name: f.name, size: f.size, status: "Uploaded", uploadedAt: f.uploadedAt }));
      return send(res, 200, { hasMore: offset + limit < all.length, files });
    }
    if (req.method === "POST" && p === "/v6/deleteFiles") {
      requireApiKey(req);
      const b = await readJson(req);
      let keys = Array.isArray(b.fileKeys) ? (b.fileKeys as string[]) : [];
      if (Array.isArray(b.customIds)) {
        const ids = new Set(b.customIds as string[]);
        for (const n of (await fsp.readdir(dir)).filter((n) => n.endsWith(".json"))) {
          const f = JSON.parse(await fsp.readFile(path.join(dir, n), "utf8")) as StoredFile;
          if (f.customId && ids.has(f.customId)) keys.push(f.key);
        }
      }
      keys = keys.filter((k) => KEY_RE.test(k) && fs.existsSync(filePath(k)));
      for (const k of keys) await Promise.all([fsp.rm(filePath(k)), fsp.rm(filePath(k) + ".json", { force: true })]);
      return send(res, 200, { success: true, deletedCount: keys.length });
    }
    if ((req.method === "GET" || req.method === "HEAD") && p.startsWith("/f/")) {
      const key = p.slice(3);
      if (!KEY_RE.test(key) || !fs.existsSync(filePath(key))) throw new HttpError(404, `No file with key "${key}"`);
      const meta = JSON.parse(await fsp.readFile(filePath(key) + ".json", "utf8")) as StoredFile;
      res.writeHead(200, {
        "content-type": meta.type || "application/octet-stream",
        "content-length": String(meta.size),
        // Served as a download, never rendered: an uploaded "log" could be HTML or script.
        "content-disposition": `attachment; filename*=UTF-8''${encodeURIComponent(meta.name)}`,
        "x-content-type-options": "nosniff",
      });
      if (req.method === "HEAD") return void res.end();
      return void fs.createReadStream(filePath(key)).pipe(res);
    }
    const key = p.slice(1);
    if (!KEY_RE.test(key)) throw new HttpError(404, `Unknown endpoint ${req.method} ${p}`);
    if (req.method === "HEAD") {
      verifyPresigned(req, url);
      const have = await fsp.stat(filePath(key) + ".part").then((s) => s.size, () => 0);
      return void res.writeHead(200, { "x-ut-range-start": String(have) }).end();
    }
    if (req.method === "PUT") return handlePut(req, res, key, url);
    throw new HttpError(405, `Method ${req.method} not allowed on ${p}`);
  }

  const server = http.createServer((req, res) => {
    // Browsers upload cross-origin, straight from the app's page to this service.
    res.setHeader("access-control-allow-origin", req.headers.origin ?? "*");
    res.setHeader("access-control-allow-methods", "GET, HEAD, PUT, POST, OPTIONS");
    res.setHeader("access-control-allow-headers", req.headers["access-control-request-headers"] ?? "*");
    res.setHeader("access-control-expose-headers", "x-ut-range-start");
    res.setHeader("access-control-max-age", "600");
    route(req, res).catch((e: unknown) => {
      const status = e instanceof HttpError ? e.status : 500;
      if (status === 500) console.error("[upload-fake]", e);
      // Read (and drop) what the client is still sending so it gets to see the error reply.
      if (!req.complete) { let dropped = 0; req.on("data", (c: Buffer) => { if ((dropped += c.length) > 64 << 20) req.destroy(); }); req.resume(); }
      send(res, status, { error: e instanceof Error ? e.message : String(e) });
    });
  });
  server.listen(opts.port, host);
  await once(server, "listening");
  const addr = server.address() as { port: number };
  base = `http://${host.includes(":") ? `[${host}]` : host}:${addr.port}`;

  return {
    url: base,
    async close() {
      for (const r of devStreams) r.end();
      server.closeAllConnections();
      await new Promise<void>((ok) => server.close(() => ok()));
    },
  };
}

function apiKeyFromEnv(): string {
  const token = process.env.UPLOADTHING_TOKEN;
  if (token) {
    const parsed = JSON.parse(Buffer.from(token, "base64").toString("utf8")) as { apiKey?: string };
    if (!parsed.apiKey?.startsWith("sk_")) throw new Error("UPLOADTHING_TOKEN does not hold an apiKey starting with sk_");
    return parsed.apiKey;
  }
  return process.env.LAPBENCH_UPLOAD_API_KEY ?? DEV_UPLOAD_API_KEY;
}

// CLI: `npx tsx workers/services/upload-fake.ts` (used by the start script).
if (process.argv[1] && /upload-fake\.ts$/.test(process.argv[1])) {
  const maxRaw = process.env.LAPBENCH_UPLOAD_MAX_BYTES;
  const maxFileSize = maxRaw ? Number(maxRaw) : undefined;
  if (maxFileSize !== undefined && !(Number.isInteger(maxFileSize) && maxFileSize > 0)) {
    throw new Error(`LAPBENCH_UPLOAD_MAX_BYTES must be a positive integer, got "${maxRaw}"`);
  }
  const storageDir = path.join(config.dataDir, "uploads");
  startUploadFake({ port: config.uploadFake.port, storageDir, apiKey: apiKeyFromEnv(), maxFileSize }).then((fake) => {
    console.log(`[upload-fake] listening on ${fake.url}, files in ${storageDir}`);
    const stop = () => void fake.close().then(() => process.exit(0));
    process.on("SIGINT", stop);
    process.on("SIGTERM", stop);
  });
}
