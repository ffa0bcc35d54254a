import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { eventDates, getEventReport } from "@/lib/data/event-report";
import { PrintCaution, PrintHeader, PrintSheet } from "@/components/record/print-bits";
import { EventReportBody } from "@/components/record/event-report-view";

export const metadata: Metadata = { title: "Event report (print)" };

export default async function PrintEventPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const ctx = await pageTeam({}, `/print/event/${id}`);
  const eventId = parseId(id);
  if (!eventId) notFound();
  const r = await getEventReport(ctx, eventId).catch((e) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  const bikes = [...new Set(r.rows.map((x) => x.bikeName).filter(Boolean))].join(", ") || null;
  const riders = [...new Set(r.rows.map((x) => x.riderName).filter(Boolean))].join(", ") || null;
  return (
    <PrintSheet title={`Event report · ${r.name}`} back={`/events/${r.id}/report`}>
      <PrintHeader team={ctx.teamName} bike={bikes} rider={riders} date={eventDates(r)} version={`Report of ${new Date().toISOString().slice(0, 10)}`} />
      <p>{r.trackName ?? "No track"}</p>
      {(r.findings.open > 0 || r.engines.some((e) => (e.usedPct ?? 0) >= 80)) && <PrintCaution />}
      <EventReportBody r={r} />
    </PrintSheet>
  );
}
