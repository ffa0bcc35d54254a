import type { SessionOverview } from "@/lib/data/session-overview";
import { formatInZone, isTimeZone } from "@/lib/ingest/zoned-time";

export function formatUtc(iso: string | null): string | null {
  return iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC` : null;
}

/** 1834.2 s → "30:34"; an hour or more → "1:02:05". */
export function formatDuration(s: number | null): string | null {
  if (s == null || !Number.isFinite(s) || s < 0) return null;
  const total = Math.round(s);
  const h = Math.floor(total / 3600);
  const m = Math.floor((total % 3600) / 60);
  const sec = total % 60;
  const mm = h > 0 ? String(m).padStart(2, "0") : String(m);
  return `${h > 0 ? `${h}:` : ""}${mm}:${String(sec).padStart(2, "0")}`;
}

export function SessionHeader({ o }: { o: SessionOverview }) {
  const s = o.session;
  const facts: [string, string | null][] = [
    ["Event", o.eventName],
    ["Track", o.trackName],
    ["Rider", o.riderName],
    ["Bike", o.bikeName],
    ["Engine", o.engineSerial],
    ["Date", o.trackTimeZone && s.startedAt && isTimeZone(o.trackTimeZone) ? `${formatInZone(s.startedAt, o.trackTimeZone)} local (${formatUtc(s.startedAt)})` : formatUtc(s.startedAt)],
    ["Duration", formatDuration(s.durationS)],
    ["Conditions", s.conditions],
  ];
  return (
    <header className="space-y-3">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">
          <span className="capitalize">{s.kind}</span>
          {s.sharedWithRiders && <span className="ml-2 rounded bg-ink-800 px-1.5 py-0.5 text-[10px] text-ink-300">shared with riders</span>}
        </p>
        <h1 className="text-2xl font-semibold">{s.title}</h1>
        {o.fileName && (
          <p className="mt-0.5 text-xs text-ink-400">
            From <span className="font-mono">{o.fileName}</span>
            {o.format ? ` · ${o.format === "csv" ? "CSV" : o.format === "gpx" ? "GPX 1.1" : "NMEA 0183"}` : ""} · uploaded {formatUtc(s.createdAt)}
          </p>
        )}
      </div>
      <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-4" data-testid="session-facts">
        {facts.map(([k, v]) => (
          <div key={k}>
            <dt className="text-xs font-semibold uppercase tracking-wide text-ink-400">{k}</dt>
            <dd className={v ? "text-ink-100" : "text-ink-400"}>{v ?? "—"}</dd>
          </div>
        ))}
      </dl>
    </header>
  );
}
