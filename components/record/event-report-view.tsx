/** The event report's body, shared by the screen and the printed sheet. */
import Link from "next/link";
import type { EventReport } from "@/lib/data/event-report";
import { formatLapTime } from "@/lib/export/format-lap-time";

export function EventReportBody({ r, tableClass = "" }: { r: EventReport; tableClass?: string }) {
  return (
    <div className="space-y-4">
      <section>
        <h2 className="text-sm font-semibold uppercase tracking-wide">Best laps per rider and bike</h2>
        <table className={tableClass} data-testid="event-best-laps">
          <thead>
            <tr>
              <th>Rider</th>
              <th>Bike</th>
              <th>Best lap</th>
              <th>Best-3 mean</th>
              <th>Session</th>
            </tr>
          </thead>
          <tbody>
            {r.bestLaps.map((b) => (
              <tr key={b.sessionId}>
                <td>{b.riderName ?? "—"}</td>
                <td>{b.bikeName ?? "—"}</td>
                <td className="num">{formatLapTime(b.bestLapMs) || "—"}</td>
                <td className="num">{formatLapTime(b.bestThreeMeanMs) || "—"}</td>
                <td>
                  <Link href={`/sessions/${b.sessionId}`}>{b.title}</Link>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <section>
        <h2 className="text-sm font-semibold uppercase tracking-wide">Sessions</h2>
        <table className={tableClass}>
          <thead>
            <tr>
              <th>Session</th>
              <th>Rider</th>
              <th>Bike</th>
              <th>Best lap</th>
              <th>Setup</th>
              <th>Findings open / ack.</th>
              <th>Conditions</th>
            </tr>
          </thead>
          <tbody>
            {r.rows.map((s) => (
              <tr key={s.sessionId}>
                <td>{s.title}</td>
                <td>{s.riderName ?? "—"}</td>
                <td>{s.bikeName ?? "—"}</td>
                <td className="num">{formatLapTime(s.bestLapMs) || "—"}</td>
                <td className="num">{s.setupVersion == null ? "—" : `v${s.setupVersion}`}</td>
                <td className="num">
                  {s.findingsOpen} / {s.findingsAcknowledged}
                </td>
                <td>{s.conditions ?? "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <p className="text-sm">
          Findings: {r.findings.open} open, {r.findings.acknowledged} acknowledged.
        </p>
      </section>
      {r.engines.length > 0 && (
        <section>
          <h2 className="text-sm font-semibold uppercase tracking-wide">Engine use</h2>
          <table className={tableClass}>
            <thead>
              <tr>
                <th>Engine</th>
                <th>Hours at this event</th>
                <th>km at this event</th>
                <th>Over-revs</th>
                <th>Interval used</th>
              </tr>
            </thead>
            <tbody>
              {r.engines.map((e) => (
                <tr key={e.id}>
                  <td className="num">{e.serial}</td>
                  <td className="num">{e.hours.toFixed(2)}</td>
                  <td className="num">{e.km.toFixed(0)}</td>
                  <td className="num">{e.overRevs}</td>
                  <td className="num">{e.usedPct == null ? "—" : `${e.usedPct.toFixed(0)} %`}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}
    </div>
  );
}
