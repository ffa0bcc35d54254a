// @ts-check
/**
 * Who is really on the other end of a request. Next.js passes a client-supplied X-Forwarded-For
 * through untouched (it only fills it in when missing), so anyone could pick the address the sign-in
 * rate limit and the mail page see. Loaded into the web server process (`node --import
 * ./workers/services/peer-address-preload.mjs next start`), this rewrites, before Next.js sees a
 * request:
 *   - `x-forwarded-for` and `x-lapbench-client` to ONE address: the TCP peer, or — when the peer
 *     is a proxy listed in TRUSTED_PROXY — the nearest address in its X-Forwarded-For chain that is
 *     not itself a trusted proxy;
 *   - sets globalThis.__lapbenchClientAddress = true so the app knows the header can be believed.
 * Plain JavaScript: the web server runs without a TypeScript loader.
 */
import http from "node:http";
import net from "node:net";

/** "::ffff:10.0.0.1" → "10.0.0.1". */
export function normalizeAddress(addr) {
  if (!addr) return "";
  const a = addr.trim().replace(/^\[|\]$/g, "");
  const m = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(a);
  return (m ? m[1] : a).toLowerCase();
}

/** TRUSTED_PROXY: comma-separated addresses or CIDR ranges of the reverse proxies in front of the app. */
export function parseTrustedProxies(value) {
  const list = new net.BlockList();
  let count = 0;
  for (const raw of String(value ?? "").split(",").map((s) => s.trim()).filter(Boolean)) {
    const [addr, prefix] = raw.split("/");
    const a = normalizeAddress(addr);
    const type = net.isIPv6(a) ? "ipv6" : net.isIPv4(a) ? "ipv4" : null;
    if (!type) throw new Error(`TRUSTED_PROXY: "${raw}" is not an IP address or CIDR range`);
    if (prefix === undefined) list.addAddress(a, type);
    else {
      const p = Number(prefix);
      if (!Number.isInteger(p) || p < 0 || p > (type === "ipv4" ? 32 : 128)) throw new Error(`TRUSTED_PROXY: "${raw}" has an invalid prefix length`);
      list.addSubnet(a, p, type);
    }
    count++;
  }
  return { count, has: (addr) => { const a = normalizeAddress(addr); const t = net.isIPv6(a) ? "ipv6" : net.isIPv4(a) ? "ipv4" : null; return !!t && list.check(a, t); } };
}

/**
 * The client address of one request.
 * @param {string | undefined} remoteAddress the TCP peer
 * @param {string | string[] | undefined} forwardedFor the incoming X-Forwarded-For
 * @param {{ count: number, has(a: string): boolean }} trusted
 */
export function clientAddress(remoteAddress, forwardedFor, trusted) {
  const peer = normalizeAddress(remoteAddress);
  if (trusted.count === 0 || !trusted.has(peer)) return peer;
  const chain = (Array.isArray(forwardedFor) ? forwardedFor.join(",") : String(forwardedFor ?? ""))
    .split(",").map(normalizeAddress).filter(Boolean);
  for (let i = chain.length - 1; i >= 0; i--) {
    if (!net.isIP(chain[i])) return peer; // a garbled chain: fall back to the proxy itself
    if (!trusted.has(chain[i])) return chain[i];
  }
  return chain[0] ?? peer;
}

/** Rewrites the request's headers in place (see above). */
export function rewriteRequest(req, trusted) {
  const addr = clientAddress(req.socket?.remoteAddress, req.headers["x-forwarded-for"], trusted);
  req.headers["x-forwarded-for"] = addr;
  req.headers["x-lapbench-client"] = addr;
  delete req.headers["x-real-ip"];
}

export function install(env = process.env) {
  const trusted = parseTrustedProxies(env.TRUSTED_PROXY);
  const original = http.createServer;
  // same signature, listener wrapped
  http.createServer = function createServer(...args) {
    const i = args.findIndex((a) => typeof a === "function");
    if (i >= 0) {
      const listener = args[i];
      args[i] = function (req, res) { rewriteRequest(req, trusted); return listener.call(this, req, res); };
    }
    return original.apply(this, args);
  };
  globalThis.__lapbenchClientAddress = true;
}
