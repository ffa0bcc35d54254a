import type { Metadata } from "next";
import { SG_WINDOWS, type SuspensionAnalysis, type SuspensionSide } from "@/lib/data/analysis";
import { DEFAULT_LOW_HIGH_BOUNDARY_MS, DEFAULT_VELOCITY_WINDOW_MS } from "@/lib/suspension/suspension-use";
import { getSessionForViewer } from "@/lib/data/session-for-viewer";
import { suspensionForViewer } from "@/lib/data/viewer-analyses";
import { viewerSession } from "@/lib/auth/viewer-session";
import { AnalysisHeader } from "@/components/analysis/analysis-header";
import { CautionNote } from "@/components/analysis/caution-note";
import { HistogramSvg } from "@/components/analysis/histogram-svg";
import { listRecentSessions } from "@/lib/data/sessions";

export const metadata: Metadata = { title: "Suspension use" };

type SP = { lap?: string; window?: string; boundary?: string; cmpSession?: string; cmpLap?: string };

const num = (s: string | undefined) => (s && s !== "" && Number.isFinite(Number(s)) ? Number(s) : null);

export default async function SuspensionPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<SP> }) {
  const { id } = await params;
  const sp = await searchParams;
  const { ctx, session } = await viewerSession(id, `/sessions/${id}/suspension`);
  const window = num(sp.window) ?? DEFAULT_VELOCITY_WINDOW_MS;
  const boundaryMms = num(sp.boundary) ?? DEFAULT_LOW_HIGH_BOUNDARY_MS * 1000;
  const opts = { window, boundaryMs: boundaryMms / 1000 };
  const a = await suspensionForViewer(ctx, session.id, { ...opts, lap: num(sp.lap) });
  // The second column: another lap of this session, or a lap (or all) of another visible session.
  let b: (SuspensionAnalysis & { title: string }) | null = null;
  const cmpSessionId = num(sp.cmpSession);
  if (cmpSessionId != null || num(sp.cmpLap) != null) {
    // A session the caller may not see (or that is gone) leaves the second column empty.
    const other = cmpSessionId != null && cmpSessionId !== session.id ? await getSessionForViewer(ctx, cmpSessionId).catch(() => null) : session;
    if (other) b = { ...(await suspensionForViewer(ctx, other.id, { ...opts, lap: num(sp.cmpLap) })), title: other.title };
  }
  const others = (await listRecentSessions(ctx, 30)).filter((s) => s.status === "ready");
  return (
    <div className="space-y-6">
      <AnalysisHeader title="Suspension use" session={session} current="suspension">
        <CautionNote />
      </AnalysisHeader>
      <form method="get" className="card grid gap-4 text-sm sm:grid-cols-2 lg:grid-cols-6" aria-label="Suspension settings">
        <label>
          <span className="label">Lap</span>
          <select name="lap" defaultValue={sp.lap ?? ""} className="field">
            <option value="">Whole session</option>
            {a.laps.map((l) => (
              <option key={l.number} value={l.number}>Lap {l.number}{l.best ? " (best)" : ""}</option>
            ))}
          </select>
        </label>
        <label>
          <span className="label">Side by side: session</span>
          <select name="cmpSession" defaultValue={sp.cmpSession ?? ""} className="field">
            <option value="">This session</option>
            {others.map((s) => (
              <option key={s.id} value={s.id}>{s.title}</option>
            ))}
          </select>
        </label>
        <label>
          <span className="label">Side by side: lap</span>
          <input name="cmpLap" defaultValue={sp.cmpLap ?? ""} className="field" inputMode="numeric" placeholder="none" />
        </label>
        <label>
          <span className="label">Velocity window</span>
          <select name="window" defaultValue={String(a.window)} className="field">
            {SG_WINDOWS.map((w) => (
              <option key={w} value={w}>{w} ms</option>
            ))}
          </select>
        </label>
        <label>
          <span className="label">Low/high split (mm/s)</span>
          <input name="boundary" defaultValue={String(boundaryMms)} className="field" inputMode="decimal" />
        </label>
        <div className="flex items-end">
          <button type="submit" className="btn-primary w-full">Show</button>
        </div>
        <p className="text-xs text-ink-400 sm:col-span-2 lg:col-span-6">
          Velocity by Savitzky–Golay differentiation (quadratic fit over the window; Savitzky &amp; Golay 1964). The low/high-speed split of{" "}
          <span className="num">{DEFAULT_LOW_HIGH_BOUNDARY_MS * 1000} mm/s</span> is our default, not a published figure: there is no universal boundary, so set the one that matches your dampers. Side by side: leave the session as
          &quot;This session&quot; and give a lap number to put two laps beside each other, or pick another session (empty lap = that whole session).
        </p>
      </form>
      <div className={`grid gap-6 ${b ? "xl:grid-cols-2" : ""}`}>
        <Column a={a} title={`${session.title} · ${a.scope}`} />
        {b ? <Column a={b} title={`${b.title} · ${b.scope}`} /> : null}
      </div>
    </div>
  );
}

function Column({ a, title }: { a: SuspensionAnalysis; title: string }) {
  return (
    <section className="space-y-4" aria-label={title}>
      <h2 className="text-sm font-semibold text-ink-100">{title}</h2>
      {!a.fork && !a.shock ? <p className="card text-sm text-ink-400">No fork or shock travel channel in this session.</p> : null}
      <div className="grid gap-4 lg:grid-cols-2">
        {[a.fork, a.shock].map((s) => (s ? <Side key={s.label} s={s} /> : null))}
      </div>
    </section>
  );
}

function Side({ s }: { s: SuspensionSide }) {
  const mm = (x: number | null) => (x == null ? "—" : `${x.toFixed(1)} mm`);
  const b = s.split.boundaryMs * 1000;
  return (
    <div className="card space-y-3" data-testid={`suspension-${s.label.toLowerCase()}`}>
      <h3 className="font-semibold">{s.label}</h3>
      <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm">
        <dt className="text-ink-400">Stroke</dt>
        <dd className="num">{s.strokeMm.toFixed(0)} mm{s.strokeFromBike ? "" : " (deepest seen; set the stroke on the bike)"}</dd>
        <dt className="text-ink-400">Sag, riding</dt>
        <dd className="num">{mm(s.sagMm.rolling)}</dd>
        <dt className="text-ink-400">Sag, standing</dt>
        <dd className="num">{mm(s.sagMm.standing)}</dd>
        <dt className="text-ink-400">Maximum travel</dt>
        <dd className="num">{mm(s.maxTravelMm)} {s.maxTravelPct != null ? `(${s.maxTravelPct.toFixed(0)} %)` : ""}</dd>
        <dt className="text-ink-400">Logged at</dt>
        <dd className="num">{s.channelRateHz ? `${Math.round(s.channelRateHz)} Hz · window ${s.windowSamples} samples` : "—"}</dd>
        <dt className="text-ink-400">Bottoming</dt>
        <dd className={`num ${s.bottomingCount ? "text-alert-400" : ""}`} data-testid="bottoming-count">{s.strokeFromBike ? s.bottomingCount : "—"}</dd>
      </dl>
      <div>
        <p className="label">Position (% of stroke)</p>
        <HistogramSvg edges={s.position.edgesPct} values={s.position.timePct} label={`${s.label} position histogram`} unit="% of stroke" tickEvery={20} />
      </div>
      <div>
        <p className="label">Velocity (mm/s, rebound − / compression +)</p>
        {s.velocityNote ? <p className="text-sm text-alert-400" data-testid="velocity-note">{s.velocityNote}</p> : null}
        <HistogramSvg edges={s.velocity.edgesMms} values={s.velocity.timePct} label={`${s.label} velocity histogram`} unit="mm/s" split={[-b, b]} tickEvery={250} />
      </div>
      <table className="table-plain">
        <thead>
          <tr><th></th><th className="text-right">Low (&lt; {b} mm/s)</th><th className="text-right">High</th></tr>
        </thead>
        <tbody>
          <tr><td>Compression</td><td className="num whitespace-nowrap text-right">{s.split.compressionLowPct.toFixed(1)} %</td><td className="num whitespace-nowrap text-right">{s.split.compressionHighPct.toFixed(1)} %</td></tr>
          <tr><td>Rebound</td><td className="num whitespace-nowrap text-right">{s.split.reboundLowPct.toFixed(1)} %</td><td className="num whitespace-nowrap text-right">{s.split.reboundHighPct.toFixed(1)} %</td></tr>
        </tbody>
      </table>
    </div>
  );
}
