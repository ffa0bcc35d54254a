import "server-only";
/**
 * Route-handler wrapper: guard (session → team → role), then the handler; errors become JSON with
 * a real HTTP status (never an error inside a 200).
 */
import { NextResponse } from "next/server";
import { ZodError } from "zod";
import { requireTeam, type GuardOptions, type TeamContext } from "@/lib/auth/guard";
import { HttpError } from "./http-error";

type Handler<P> = (req: Request, ctx: TeamContext, params: P) => Promise<Response>;

export function errorResponse(e: unknown): Response {
  if (e instanceof HttpError) return NextResponse.json({ error: e.message, details: e.details }, { status: e.status });
  if (e instanceof ZodError)
    return NextResponse.json({ error: "The request is not valid.", details: e.issues.map((i) => ({ path: i.path.join("."), message: i.message })) }, { status: 422 });
  console.error(e);
  return NextResponse.json({ error: "Internal error. Nothing was changed." }, { status: 500 });
}

export function teamRoute<P = Record<string, string>>(opts: GuardOptions, handler: Handler<P>) {
  return async (req: Request, segment: { params: Promise<P> }): Promise<Response> => {
    try {
      const ctx = await requireTeam(req.headers, opts);
      return await handler(req, ctx, await segment.params);
    } catch (e) {
      return errorResponse(e);
    }
  };
}
