import type { Metadata } from "next";
import { Suspense } from "react";
import { notFound } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { roleCan } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { getSessionOverview, type SessionOverview } from "@/lib/data/session-overview";
import { sessionFormOptions } from "@/lib/data/session-edit";
import { SessionHeader } from "@/components/session/session-header";
import { SessionStatus } from "@/components/session/session-status";
import { ChannelTable } from "@/components/session/channel-table";
import { DetailsEditor } from "@/components/session/details-editor";
import { SessionLaps } from "@/components/session/session-laps";
import { SessionFindings } from "@/components/session/session-findings";
import { SessionAnalysisLinks } from "@/components/session/session-analysis-links";
import { getSetupSheetView } from "@/lib/data/setup-sheets";
import { getSessionNotes } from "@/lib/data/session-notes";
import { SetupSheet } from "@/components/session/setup-sheet";
import { SessionNotes } from "@/components/session/session-notes";
import { ReimportButton } from "@/components/session/reimport-button";
import { DuplicateChoice } from "@/components/session/duplicate-choice";
import { getHeldDuplicate, getSessionTrackPanel } from "@/lib/data/session-track";
import { SessionTrack } from "@/components/session/session-track";
import { SessionRecord } from "@/components/record/session-record";
import { listSessionFindings } from "@/lib/data/findings";
import { listSessionLaps } from "@/lib/data/laps";
import { listSessionActivity } from "@/lib/data/activity-log";

export const metadata: Metadata = { title: "Session" };

const block = <div className="h-24 animate-pulse rounded-lg bg-ink-900" />;

export default async function SessionPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const ctx = await pageTeam({}, `/sessions/${id}`);
  const sessionId = parseId(id);
  if (!sessionId) notFound();
  let o: SessionOverview;
  try {
    o = await getSessionOverview(ctx, sessionId);
  } catch (e) {
    // Another team's session, or one a rider may not see: not confirmed to exist.
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  }
  const canEdit = roleCan(ctx.role, { "session-data": ["upload"] });
  const canAcknowledge = roleCan(ctx.role, { finding: ["acknowledge"] });
  const options = canEdit ? await sessionFormOptions(ctx.teamId) : null;
  // Both apply whatever the import status: a setup is recorded and notes are written before a log is read.
  const [setup, notes] = await Promise.all([getSetupSheetView(ctx, sessionId), getSessionNotes(ctx, sessionId)]);
  const s = o.session;
  const ready = s.status === "ready";
  const duplicate = s.status === "uploaded" ? await getHeldDuplicate(ctx, s.id) : null;
  const trackPanel = ready ? await getSessionTrackPanel(ctx, s.id) : null;
  const canEditSetup = roleCan(ctx.role, { setup: ["edit"] });

  return (
    <div className="space-y-6">
      <SessionHeader o={o} />
      {duplicate ? (
        <DuplicateChoice sessionId={s.id} earlier={duplicate} canEdit={canEdit} />
      ) : (
        <SessionStatus initial={{ id: s.id, status: s.status, progress: s.progress, statusReason: s.statusReason }} canEdit={canEdit} repeatedTimeRows={o.repeatedTimeRows} />
      )}

      {ready && (
        <>
          <SessionAnalysisLinks sessionId={s.id} />
          {trackPanel && <SessionTrack sessionId={s.id} panel={trackPanel} canEdit={canEditSetup} defaultName={`Track of ${s.title ?? `session ${s.id}`}`.slice(0, 120)} />}
          {o.importNotes.length > 0 && (
            <section className="card" aria-labelledby="import-notes" data-testid="import-notes">
              <h2 id="import-notes" className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-300">Read from the file</h2>
              <ul className="list-disc space-y-1 pl-5 text-sm text-ink-200">
                {o.importNotes.map((n) => (
                  <li key={n}>{n}</li>
                ))}
              </ul>
            </section>
          )}
          <Suspense fallback={block}>
            <SessionFindings data={listSessionFindings(ctx, s.id)} canAcknowledge={canAcknowledge} />
          </Suspense>
          <Suspense fallback={block}>
            <SessionLaps data={listSessionLaps(ctx, s.id)} />
          </Suspense>
          <section className="card" aria-labelledby="channels">
            <h2 id="channels" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">Channels</h2>
            <ChannelTable channels={o.channels} />
          </section>
          {canEdit && o.format === "csv" && (
            <section className="card space-y-2" aria-labelledby="mapping-again" data-testid="map-again">
              <h2 id="mapping-again" className="text-sm font-semibold uppercase tracking-wide text-ink-300">Column mapping</h2>
              <p className="text-sm text-ink-400">
                A column read the wrong way? Map the file again: laps, findings and analyses are computed again from the kept file; setup sheets, notes and
                acknowledgements stay.
              </p>
              <ReimportButton sessionId={s.id} label="Map again" />
            </section>
          )}
        </>
      )}

      {canEdit && options && (
        <DetailsEditor
          sessionId={s.id}
          options={options}
          details={{
            title: s.title,
            kind: s.kind,
            eventId: s.eventId,
            bikeId: s.bikeId,
            engineId: s.engineId,
            riderId: s.riderId,
            startedAt: s.startedAt,
            conditions: s.conditions ?? "",
            sharedWithRiders: s.sharedWithRiders,
          }}
        />
      )}

      <SetupSheet view={setup} />
      <SessionNotes view={notes} />
      <Suspense fallback={block}>
        <SessionRecord entries={listSessionActivity(ctx, s.id)} sessionId={s.id} />
      </Suspense>
    </div>
  );
}
