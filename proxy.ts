import { NextResponse, type NextRequest } from "next/server";

/**
 * Passes the requested path to server components (layouts cannot read it), so a signed-out visitor
 * is sent to sign in and then back to the page they asked for.
 */
export function proxy(req: NextRequest) {
  const headers = new Headers(req.headers);
  headers.set("x-lapbench-path", req.nextUrl.pathname + req.nextUrl.search);
  return NextResponse.next({ request: { headers } });
}

export const config = { matcher: ["/((?!api/|_next/|icon.svg|favicon.ico).*)"] };
