"use client";
import { useActionState, useMemo, useState } from "react";
import type { FindingView } from "@/lib/data/findings";
import { FINDING_KIND_LABEL, SEVERITY_LABEL, CAUTION_KINDS, findingKindLabel } from "@/lib/findings/finding-labels";
import { displayValue } from "@/lib/findings/display-value";
import { CAUTION_TEXT } from "@/lib/findings/caution";
import { acknowledgeFindingAction, type AcknowledgeState } from "@/lib/actions/findings";
import { TrackOutlineSvg, type OutlineMark } from "@/components/analysis/track-outline-svg";

export interface PanelFinding extends FindingView {
  at: [number, number] | null;
}

const SEVERITY_STYLE: Record<string, string> = {
  critical: "border-alert-500/60 bg-alert-500/15 text-alert-400",
  warning: "border-signal-600/60 bg-signal-500/10 text-signal-400",
  info: "border-ink-600 bg-ink-800 text-ink-300",
};
const SEVERITY_TONE = { critical: "alert", warning: "signal", info: "ink" } as const;

function fmtTime(s: number | null): string {
  if (s == null) return "—";
  const m = Math.floor(s / 60);
  return `${m}:${(s - 60 * m).toFixed(1).padStart(4, "0")}`;
}

export function FindingsPanel({ findings, outline, canAcknowledge }: { findings: PanelFinding[]; outline: [number, number][] | null; canAcknowledge: boolean }) {
  const [kind, setKind] = useState("all");
  const [severity, setSeverity] = useState("all");
  const [ack, setAck] = useState("open");
  const [selected, setSelected] = useState<number | null>(null);
  const kinds = useMemo(() => [...new Set(findings.map((f) => f.kind))], [findings]);
  const shown = findings.filter(
    (f) => (kind === "all" || f.kind === kind) && (severity === "all" || f.severity === severity) && (ack === "all" || (ack === "open" ? !f.acknowledgedAt : !!f.acknowledgedAt)),
  );
  const numberOf = new Map(findings.map((f, i) => [f.id, i + 1]));
  if (findings.length === 0) return <p className="text-sm text-ink-400">Nothing looked wrong in this session with the current thresholds.</p>;
  const marks: OutlineMark[] = shown
    .filter((f) => f.at)
    .map((f) => ({ key: f.id, x: f.at![0], y: f.at![1], label: String(numberOf.get(f.id)), tone: f.acknowledgedAt ? "ok" : SEVERITY_TONE[f.severity], title: findingKindLabel(f.kind), active: selected === f.id }));
  return (
    <div className="grid gap-5 lg:grid-cols-[1fr_16rem]">
      <div className="min-w-0 space-y-3">
        <div className="flex flex-wrap gap-3" role="group" aria-label="Filter findings">
          <label className="text-xs">
            <span className="label">Kind</span>
            <select className="field" value={kind} onChange={(e) => setKind(e.target.value)} aria-label="Kind">
              <option value="all">All kinds</option>
              {kinds.map((k) => (
                <option key={k} value={k}>
                  {(FINDING_KIND_LABEL as Record<string, string>)[k] ?? k}
                </option>
              ))}
            </select>
          </label>
          <label className="text-xs">
            <span className="label">Severity</span>
            <select className="field" value={severity} onChange={(e) => setSeverity(e.target.value)} aria-label="Severity">
              <option value="all">All</option>
              <option value="critical">Critical</option>
              <option value="warning">Warning</option>
              <option value="info">Info</option>
            </select>
          </label>
          <label className="text-xs">
            <span className="label">Status</span>
            <select className="field" value={ack} onChange={(e) => setAck(e.target.value)} aria-label="Status">
              <option value="open">To review</option>
              <option value="done">Acknowledged</option>
              <option value="all">All</option>
            </select>
          </label>
          <p className="self-end pb-2 text-xs text-ink-400">
            {shown.length} of {findings.length} shown
          </p>
        </div>
        {shown.length === 0 ? <p className="text-sm text-ink-400">No findings match these filters.</p> : null}
        <ol className="space-y-3" data-testid="findings-list">
          {shown.map((f) => (
            <FindingItem key={f.id} f={f} n={numberOf.get(f.id)!} canAcknowledge={canAcknowledge} onFocus={() => setSelected(f.id)} />
          ))}
        </ol>
      </div>
      <aside className="lg:sticky lg:top-28 lg:self-start">
        {outline ? (
          <>
            <TrackOutlineSvg points={outline} marks={marks} label="Track outline with the findings shown" />
            <p className="mt-1 text-xs text-ink-400">Numbers match the list. Green: acknowledged.</p>
          </>
        ) : (
          <p className="text-xs text-ink-400">No GPS positions in this session, so no outline to show.</p>
        )}
      </aside>
    </div>
  );
}

function FindingItem({ f, n, canAcknowledge, onFocus }: { f: PanelFinding; n: number; canAcknowledge: boolean; onFocus: () => void }) {
  const [state, action, pending] = useActionState<AcknowledgeState, FormData>(acknowledgeFindingAction, {});
  const [open, setOpen] = useState(false);
  const measured = displayValue(f.measuredValue, f.unit);
  const limit = displayValue(f.thresholdValue, f.unit);
  return (
    <li className="rounded-md border border-ink-700 bg-ink-950/40 p-3" data-testid="finding" onMouseEnter={onFocus} onFocus={onFocus}>
      <div className="flex flex-wrap items-center gap-2 text-sm">
        <span className="num grid h-6 w-6 place-items-center rounded-full bg-ink-800 text-xs font-bold">{n}</span>
        <span className={`rounded border px-1.5 py-0.5 text-xs font-semibold ${SEVERITY_STYLE[f.severity]}`}>{SEVERITY_LABEL[f.severity]}</span>
        <span className="font-semibold">{findingKindLabel(f.kind)}</span>
        <span className="text-xs text-ink-400">
          {f.lapNumber != null ? `Lap ${f.lapNumber}` : "Outside a lap"} · <span className="num">{fmtTime(f.startTimeS)}</span>
          {f.distanceM != null ? <> · <span className="num">{Math.round(f.distanceM)} m</span> into the lap</> : null}
        </span>
      </div>
      {/* Stored messages may carry the caution already; it is shown once, in its own box. */}
      <p className="mt-1.5 text-sm text-ink-100">{f.message.replace(CAUTION_TEXT, "").trim()}</p>
      {measured ? (
        <p className="mt-1 text-sm">
          <span className="text-ink-400">Measured </span>
          <span className="num font-semibold text-ink-100">{measured.text}</span>
          {limit ? (
            <>
              <span className="text-ink-400"> against the threshold </span>
              <span className="num">{limit.text}</span>
            </>
          ) : null}
        </p>
      ) : null}
      {CAUTION_KINDS.has(f.kind) ? (
        <p role="note" className="mt-2 rounded border border-signal-600/40 bg-signal-500/10 px-2 py-1.5 text-xs text-signal-400">
          <span className="font-semibold">Caution. </span>
          {CAUTION_TEXT}
        </p>
      ) : null}
      {f.acknowledgedAt ? (
        <p className="mt-2 text-xs text-ok-400" data-testid="acknowledged">
          Acknowledged by {f.acknowledgedByName ?? "a team member"} on {new Date(f.acknowledgedAt).toISOString().slice(0, 16).replace("T", " ")} UTC
          {f.note ? <span className="block text-ink-300">“{f.note}”</span> : null}
        </p>
      ) : canAcknowledge ? (
        open ? (
          <form action={action} className="mt-3 space-y-2">
            <input type="hidden" name="findingId" value={f.id} />
            <label className="block">
              <span className="label">Note</span>
              <textarea name="note" rows={2} className="field" placeholder="What was checked, or why it is fine" aria-invalid={!!state.errors?.note} />
            </label>
            {state.errors?.note ? <p className="text-xs text-alert-400">{state.errors.note}</p> : null}
            {state.message && !state.ok ? (
              <p role="alert" className="text-xs text-alert-400">
                {state.message}
              </p>
            ) : null}
            <div className="flex gap-2">
              <button type="submit" className="btn-primary text-xs" disabled={pending}>
                {pending ? "Saving…" : "Acknowledge"}
              </button>
              <button type="button" className="btn-quiet text-xs" onClick={() => setOpen(false)}>
                Cancel
              </button>
            </div>
          </form>
        ) : (
          <button type="button" className="btn-quiet mt-2 text-xs" onClick={() => setOpen(true)}>
            Acknowledge with a note…
          </button>
        )
      ) : null}
    </li>
  );
}
