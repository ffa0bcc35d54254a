import { NextResponse, type NextRequest } from "next/server";
import { securityHeaders, uploadOriginsFromEnv } from "./lib/security/headers";

/** The page CSP, from the running server's environment (the upload service may move after a build). */
function contentSecurityPolicy(): string {
  const appUrl = process.env.BETTER_AUTH_URL ?? process.env.LAPBENCH_APP_URL ?? `http://localhost:${process.env.PORT ?? 3000}`;
  const all = securityHeaders({ dev: process.env.NODE_ENV === "development", appUrl, uploadOrigins: uploadOriginsFromEnv(process.env) });
  return all.find((h) => h.key === "Content-Security-Policy")?.value ?? "";
}

/**
 * Passes the requested path to server components (layouts cannot read it), so a signed-out visitor
 * is sent to sign in and then back to the page they asked for.
 */
export function proxy(req: NextRequest) {
  const headers = new Headers(req.headers);
  headers.set("x-lapbench-path", req.nextUrl.pathname + req.nextUrl.search);
  const res = NextResponse.next({ request: { headers } });
  const csp = contentSecurityPolicy();
  if (csp) res.headers.set("Content-Security-Policy", csp);
  return res;
}

export const config = { matcher: ["/((?!api/|_next/|icon.svg|favicon.ico).*)"] };
