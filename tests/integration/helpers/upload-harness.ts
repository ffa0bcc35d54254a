/**
 * Test harness for uploads with the real SDK outside a browser and outside Next.
 */
import http from "node:http";
import { once } from "node:events";

/**
 * The browser client PUTs with XMLHttpRequest, which Node lacks. This adapter runs the same request
 * through fetch; progress is reported once, at the end.
 */
export class FetchBackedXhr {
  status = 0;
  statusText = "";
  response: unknown = null;
  responseType = "";
  readonly upload = new EventTarget();
  private readonly events = new EventTarget();
  private readonly headers = new Headers();
  private readonly abortController = new AbortController();
  private method = "GET";
  private url = "";
  open(method: string, url: string) { this.method = method; this.url = url; }
  setRequestHeader(name: string, value: string) { this.headers.set(name, value); }
  addEventListener(type: string, fn: EventListener) { this.events.addEventListener(type, fn); }
  abort() { this.abortController.abort(); }
  send(body: FormData) {
    const size = [...body.values()].reduce((n, v) => n + (typeof v === "string" ? v.length : v.size), 0);
    fetch(this.url, { method: this.method, headers: this.headers, body, signal: this.abortController.signal }).then(
      async (r) => {
        this.status = r.status;
        this.statusText = r.statusText;
        const text = await r.text();
        try { this.response = JSON.parse(text); } catch { this.response = null; }
        this.upload.dispatchEvent(Object.assign(new Event("progress"), { loaded: size }));
        this.events.dispatchEvent(new Event("load"));
      },
      () => this.events.dispatchEvent(new Event("error")),
    );
  }
}

/** A minimal node:http host for a web-standard handler, standing in for the Next route. */
export async function serve(handler: (req: Request) => Promise<Response>) {
  const server = http.createServer(async (req, res) => {
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    const headers = new Headers();
    for (const [k, v] of Object.entries(req.headers)) if (typeof v === "string") headers.set(k, v);
    const hasBody = req.method !== "GET" && req.method !== "HEAD";
    const response = await handler(new Request(`http://${req.headers.host}${req.url}`, { method: req.method, headers, body: hasBody ? Buffer.concat(chunks) : undefined }));
    res.writeHead(response.status, Object.fromEntries(response.headers));
    res.end(Buffer.from(await response.arrayBuffer()));
  });
  server.listen(0, "127.0.0.1");
  await once(server, "listening");
  const url = `http://127.0.0.1:${(server.address() as { port: number }).port}/api/uploadthing`;
  return { url, close: () => { server.closeAllConnections(); return new Promise<void>((ok) => server.close(() => ok())); } };
}

