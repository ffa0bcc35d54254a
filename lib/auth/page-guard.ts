import "server-only";
/** The guard for server components and server actions: same checks, page-shaped outcomes. */
import { headers } from "next/headers";
import { redirect, notFound } from "next/navigation";
import { NoTeamError, requireTeam, type GuardOptions, type TeamContext } from "./guard";
import { HttpError } from "@/lib/http/http-error";
import { safeReturnPath } from "@/lib/http/safe-return-path";

export async function pageTeam(opts: GuardOptions = {}, fromPath?: string): Promise<TeamContext> {
  const h = await headers();
  // proxy.ts passes the requested path; only same-site paths are used as a return address.
  const asked = h.get("x-lapbench-path");
  const from = fromPath ?? safeReturnPath(asked, "/home");
  try {
    return await requireTeam(h, opts);
  } catch (e) {
    if (e instanceof HttpError) {
      if (e.status === 401) redirect(`/sign-in?next=${encodeURIComponent(from)}`);
      if (e instanceof NoTeamError) redirect("/teams/new");
      if (e.status === 403) redirect(`/forbidden?from=${encodeURIComponent(from)}`);
      if (e.status === 404) notFound();
    }
    throw e;
  }
}

/** For server actions: returns the context or an error message for the form. */
export async function actionTeam(opts: GuardOptions = {}): Promise<{ ctx: TeamContext; error?: undefined } | { ctx?: undefined; error: string; status: number }> {
  try {
    return { ctx: await requireTeam(await headers(), opts) };
  } catch (e) {
    if (e instanceof HttpError) return { error: e.message, status: e.status };
    throw e;
  }
}
