/**
 * The address of the client behind a request, as rewritten by workers/services/peer-address.mjs in
 * the web server process (the TCP peer, or the client behind a TRUSTED_PROXY). Null when that
 * rewrite is not installed: then no header can be believed.
 */
declare global {
  var __lapbenchClientAddress: boolean | undefined;
}

export function clientAddressOf(headers: Headers): string | null {
  if (globalThis.__lapbenchClientAddress !== true) return null;
  return headers.get("x-lapbench-client");
}

export function isLoopbackAddress(addr: string | null): boolean {
  if (!addr) return false;
  const a = addr.toLowerCase().replace(/^::ffff:/, "");
  return a === "::1" || /^127\.\d+\.\d+\.\d+$/.test(a);
}
