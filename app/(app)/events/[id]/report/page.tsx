import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { eventDates, getEventReport } from "@/lib/data/event-report";
import { EventReportBody } from "@/components/record/event-report-view";
import { SendReportButton } from "@/components/record/send-report-button";

export const metadata: Metadata = { title: "Event report" };

export default async function EventReportPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const ctx = await pageTeam({}, `/events/${id}/report`);
  const eventId = parseId(id);
  if (!eventId) notFound();
  const r = await getEventReport(ctx, eventId).catch((e) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">
          <Link href="/season" className="hover:underline">
            Season record
          </Link>
        </p>
        <h1 className="text-2xl font-semibold">Event report: {r.name}</h1>
        <p className="text-sm text-ink-400">
          {eventDates(r)} · {r.trackName ?? "no track"} ·{" "}
          <Link className="text-signal-400 hover:underline" href={`/print/event/${r.id}`}>
            Printable report (PDF through the browser&apos;s print)
          </Link>
        </p>
      </div>
      {(ctx.role === "owner" || ctx.role === "engineer") && <SendReportButton eventId={r.id} />}
      <div className="card">
        <EventReportBody r={r} tableClass="table-plain" />
      </div>
    </div>
  );
}
