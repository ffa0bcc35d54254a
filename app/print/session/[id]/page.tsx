import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { pageTeam } from "@/lib/auth/page-guard";
import { HttpError } from "@/lib/http/http-error";
import { parseId } from "@/lib/http/parse-id";
import { getSessionOverview } from "@/lib/data/session-overview";
import { getSetupSheetView } from "@/lib/data/setup-sheets";
import { listSessionLaps } from "@/lib/data/laps";
import { listSessionFindings } from "@/lib/data/findings";
import { lapFigures } from "@/lib/record/lap-figures";
import { formatLapTime } from "@/lib/export/format-lap-time";
import { PrintCaution, PrintHeader, PrintSheet } from "@/components/record/print-bits";

export const metadata: Metadata = { title: "Session summary (print)" };

export default async function PrintSessionPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const ctx = await pageTeam({}, `/print/session/${id}`);
  const sessionId = parseId(id);
  if (!sessionId) notFound();
  const [o, view, { laps }, { findings }] = await Promise.all([getSessionOverview(ctx, sessionId), getSetupSheetView(ctx, sessionId), listSessionLaps(ctx, sessionId), listSessionFindings(ctx, sessionId)]).catch((e) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  const f = lapFigures(laps.map((l) => ({ number: l.number, lapTimeMs: l.lapTimeMs, isOutLap: l.outLap, isInLap: l.inLap, isInvalid: l.invalid, pitPass: l.pitPass, topSpeedMps: l.topSpeedMps })));
  const sectors = Math.max(0, ...laps.map((l) => l.sectorTimesMs.length));
  const setup = view.versions[0];
  return (
    <PrintSheet title={`Session summary · ${o.session.title}`} back={`/sessions/${sessionId}`}>
      <PrintHeader team={ctx.teamName} bike={o.bikeName} rider={o.riderName} date={(o.session.startedAt ?? o.session.createdAt).slice(0, 10)} version={setup ? `Setup v${setup.version}` : "no setup recorded"} />
      <p>
        {o.eventName ?? "No event"} · {o.trackName ?? "no track"} · {o.session.kind} · engine {o.engineSerial ?? "—"} · {o.session.conditions ?? "conditions not recorded"}
      </p>
      <p>
        Best lap <strong className="num">{formatLapTime(f.bestLapMs) || "—"}</strong> (lap {f.bestLapNumber ?? "—"}) · best-three mean <span className="num">{formatLapTime(f.bestThreeMeanMs) || "—"}</span> · {f.flyingLapCount} flying laps · top speed{" "}
        <span className="num">{f.topSpeedMps == null ? "—" : `${(f.topSpeedMps * 3.6).toFixed(1)} km/h`}</span>
      </p>
      <h2>Laps</h2>
      <table>
        <thead>
          <tr>
            <th>Lap</th>
            <th>Time</th>
            {Array.from({ length: sectors }, (_, k) => (
              <th key={k}>S{k + 1}</th>
            ))}
            <th>Top speed</th>
            <th>Flags</th>
          </tr>
        </thead>
        <tbody>
          {laps.map((l) => (
            <tr key={l.number} className={l.number === f.bestLapNumber ? "print-changed" : undefined}>
              <td className="num">{l.number}</td>
              <td className="num">{formatLapTime(l.lapTimeMs)}</td>
              {Array.from({ length: sectors }, (_, k) => (
                <td key={k} className="num">
                  {formatLapTime(l.sectorTimesMs[k] ?? null) || "—"}
                </td>
              ))}
              <td className="num">{l.topSpeedMps == null ? "—" : (l.topSpeedMps * 3.6).toFixed(1)}</td>
              <td>{[l.outLap && "out", l.inLap && "in", l.pitPass && "pit", l.invalid && "invalid"].filter(Boolean).join(", ")}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <h2>Findings ({findings.length})</h2>
      {findings.length > 0 && <PrintCaution />}
      {findings.length === 0 ? (
        <p>None.</p>
      ) : (
        <table>
          <tbody>
            {findings.map((x) => (
              <tr key={x.id}>
                <td className="num">{x.lapNumber ?? "—"}</td>
                <td>{x.message}</td>
                <td>{x.acknowledgedAt ? `acknowledged by ${x.acknowledgedByName ?? "a former member"}` : "open"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </PrintSheet>
  );
}
