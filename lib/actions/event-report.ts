"use server";
/** Mail an event's report to the team owner (engineers and the owner send it). */
import { actionTeam } from "@/lib/auth/page-guard";
import { sendEventReport } from "@/lib/data/event-report";
import { parseId } from "@/lib/http/parse-id";
import { HttpError } from "@/lib/http/http-error";

export interface SendReportState {
  ok?: boolean;
  message?: string;
}

export async function sendEventReportAction(_prev: SendReportState, form: FormData): Promise<SendReportState> {
  const g = await actionTeam({ roles: ["owner", "engineer"] });
  if (!g.ctx) return { ok: false, message: g.error };
  const id = parseId(String(form.get("eventId") ?? ""));
  if (!id) return { ok: false, message: "Event was not found in your team." };
  try {
    const to = await sendEventReport(g.ctx, id);
    return to.length ? { ok: true, message: `Report sent to ${to.join(", ")}.` } : { ok: false, message: "No owner wants event reports (see each owner's settings)." };
  } catch (e) {
    if (e instanceof HttpError) return { ok: false, message: e.message };
    return { ok: false, message: `The mail service did not take the report: ${e instanceof Error ? e.message : String(e)}` };
  }
}
