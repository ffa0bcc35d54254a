import type { Metadata } from "next";
import Link from "next/link";
import { cookies } from "next/headers";
import { pageTeam } from "@/lib/auth/page-guard";
import { getSeasonRecord } from "@/lib/data/season-record";
import { parseId } from "@/lib/http/parse-id";
import { UNIT_COOKIE, displayUnitIn, parseUnitSystem } from "@/lib/units/unit-system";
import { formatLapTime } from "@/lib/export/format-lap-time";
import { SeasonTable } from "@/components/record/season-table";
import { ProgressionChart } from "@/components/record/progression-chart";

export const metadata: Metadata = { title: "Season record" };

type Search = Promise<Record<string, string | string[] | undefined>>;

const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

export default async function SeasonPage({ searchParams }: { searchParams: Search }) {
  const ctx = await pageTeam({}, "/season");
  const sp = await searchParams;
  const year = Number(one(sp.year));
  const rec = await getSeasonRecord(ctx, {
    year: Number.isInteger(year) && year > 1900 && year < 3000 ? year : null,
    riderId: parseId(one(sp.rider)),
    bikeId: parseId(one(sp.bike)),
    trackId: parseId(one(sp.track)),
  });
  const speedUnit = displayUnitIn(parseUnitSystem((await cookies()).get(UNIT_COOKIE)?.value), "speed_front", "m/s");
  const select = (name: string, label: string, value: number | null, opts: { id: number; name: string }[]) => (
    <label className="text-sm">
      <span className="label">{label}</span>
      <select name={name} defaultValue={value ?? ""} className="field">
        <option value="">All</option>
        {opts.map((o) => (
          <option key={o.id} value={o.id}>
            {o.name}
          </option>
        ))}
      </select>
    </label>
  );
  return (
    <div className="space-y-6">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wider text-trace-400">{ctx.teamName}</p>
        <h1 className="text-2xl font-semibold">Season record</h1>
        <p className="mt-1 text-sm text-ink-400">
          Every analysed session by event: best lap, mean of the best three flying laps, conditions, the setup version it ran, findings and top speed.
          {rec.riderOnly && " You see the sessions you rode."}{" "}
          <Link className="text-signal-400 hover:underline" href="/season/setup-effects">
            Setup effects
          </Link>
        </p>
      </div>
      <form className="card flex flex-wrap items-end gap-4" method="get" aria-label="Filters">
        <label className="text-sm">
          <span className="label">Season</span>
          <select name="year" defaultValue={rec.filters.year ?? ""} className="field">
            <option value="">All</option>
            {rec.options.years.map((y) => (
              <option key={y} value={y}>
                {y}
              </option>
            ))}
          </select>
        </label>
        {select("rider", "Rider", rec.filters.riderId, rec.options.riders)}
        {select("bike", "Bike", rec.filters.bikeId, rec.options.bikes)}
        {select("track", "Track", rec.filters.trackId, rec.options.tracks)}
        <button className="btn-primary" type="submit">
          Show
        </button>
        <Link href="/season" className="btn-quiet">
          Clear
        </Link>
      </form>

      <section className="card" aria-labelledby="events-h">
        <h2 id="events-h" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">
          Events and sessions
        </h2>
        {rec.rows.length === 0 ? (
          <p className="text-sm text-ink-400">No analysed sessions match these filters.</p>
        ) : (
          <>
            <ol className="mb-4 flex flex-wrap gap-2 text-xs text-ink-300" data-testid="season-events">
              {rec.events.map((e) => (
                <li key={e.eventId ?? "none"} className="rounded border border-ink-700 px-2 py-1" data-testid="season-event">
                  <span className="num">{e.eventDate ?? "—"}</span> · {e.eventName} · {e.sessionIds.length} {e.sessionIds.length === 1 ? "session" : "sessions"}
                  {e.eventId != null && ctx.role !== "rider" && (
                    <>
                      {" · "}
                      <Link className="text-signal-400 hover:underline" href={`/events/${e.eventId}/report`}>
                        report
                      </Link>
                    </>
                  )}
                </li>
              ))}
            </ol>
            <SeasonTable rows={rec.rows} speedUnit={speedUnit} />
          </>
        )}
      </section>

      <div className="grid gap-6 lg:grid-cols-2">
        <section className="card" aria-labelledby="bests-h">
          <h2 id="bests-h" className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-300">
            Best lap per track
          </h2>
          {rec.trackBests.length === 0 && <p className="text-sm text-ink-400">No laps yet.</p>}
          {rec.trackBests.map((t) => (
            <div key={t.trackId} className="mb-4" data-testid="track-bests">
              <h3 className="text-sm font-semibold">{t.trackName}</h3>
              <table className="table-plain mt-1">
                <thead>
                  <tr>
                    <th>Rider</th>
                    <th>Bike</th>
                    <th>Best lap</th>
                    <th>From</th>
                  </tr>
                </thead>
                <tbody>
                  {t.bests.map((b) => (
                    <tr key={b.sessionId} data-testid="track-best">
                      <td>{b.riderName ?? "—"}</td>
                      <td>{b.bikeName ?? "—"}</td>
                      <td className="num">{formatLapTime(b.bestLapMs)}</td>
                      <td>
                        <Link className="text-signal-400 hover:underline" href={`/sessions/${b.sessionId}`}>
                          {b.title}
                        </Link>
                        <span className="block text-xs text-ink-400">{b.eventName ?? ""} · lap {b.bestLapNumber}</span>
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          ))}
        </section>
        <section className="card" aria-labelledby="prog-h">
          <h2 id="prog-h" className="mb-1 text-sm font-semibold uppercase tracking-wide text-ink-300">
            Progression{rec.progression ? ` at ${rec.progression.trackName}` : ""}
          </h2>
          <p className="mb-3 text-xs text-ink-400">Quickest best lap and best-three mean of each event at this track, among the sessions shown. Pick a rider and bike to follow one pair.</p>
          {rec.progression && rec.progression.points.length > 0 ? <ProgressionChart points={rec.progression.points} /> : <p className="text-sm text-ink-400">No events with laps at this track yet.</p>}
        </section>
      </div>
    </div>
  );
}
