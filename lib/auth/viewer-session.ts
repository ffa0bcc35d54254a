import "server-only";
import { notFound } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { getSessionForViewer, type SessionDetail } from "@/lib/data/session-for-viewer";
import type { TeamContext } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";

/**
 * The signed-in member and a session they may see, or the 404 page: the session must be in their
 * team, and a rider sees only their own sessions and the ones shared with riders.
 */
export async function viewerSession(idParam: string, from: string): Promise<{ ctx: TeamContext; session: SessionDetail }> {
  const ctx = await pageTeam({}, from);
  const id = Number(idParam);
  if (!Number.isInteger(id) || id <= 0) notFound();
  try {
    return { ctx, session: await getSessionForViewer(ctx, id) };
  } catch (e) {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  }
}
