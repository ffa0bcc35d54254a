"use client";
/**
 * The gate editor: the recorded outline drawn in local metres (no map tiles), with the
 * start/finish, sector and pit gates and the named corners. Click the outline to place or move the
 * selected gate, drag a gate along the path, delete or flip it; name corners by their distance
 * along the lap; save sends the whole track to the server action, which re-analyses its sessions.
 */
import { useActionState, useMemo, useRef, useState, type MouseEvent as ReactMouseEvent, type PointerEvent as ReactPointerEvent } from "react";
import { saveTrackAction } from "@/lib/actions/tracks";
import type { SetupActionState } from "@/lib/actions/setup-state";
import type { TrackEditorData } from "@/lib/data/track-editor";
import type { Gate } from "@/lib/geo/types";
import type { TrackCorner, TrackGates } from "@/lib/geo/stored-track";
import { Feedback } from "@/components/setup/form-bits";
import { flipGate, gateAtSnap, gateShape, pointAt, projectionFor, snapToPath, toPath, type Snap } from "@/lib/geo/gate-snapping";

type GateKey = "startFinish" | "pitEntry" | "pitExit";
type Selection = { kind: GateKey } | { kind: "sector"; index: number } | { kind: "corner"; index: number } | null;
type Tool = "move" | GateKey | "sector" | "corner";

/** Lapbench's default gate lengths: across a track with run-off to spare, and across a pit lane only. */
const TRACK_GATE_M = 30;
const PIT_GATE_M = 20;
/** A click further than this from the path (in screen pixels) is not on it. */
const HIT_PX = 18;

const LABEL: Record<GateKey, string> = { startFinish: "Start/finish", pitEntry: "Pit entry", pitExit: "Pit exit" };

export function GateEditor({ data, editable }: { data: TrackEditorData; editable: boolean }) {
  const [gates, setGates] = useState<TrackGates>(data.gates);
  // Metre precision is what a corner name needs; stored values may carry more digits.
  const [corners, setCorners] = useState<TrackCorner[]>(() => data.corners.map((c) => ({ ...c, distanceM: Math.round(c.distanceM) })));
  const [name, setName] = useState(data.name);
  const [pitLimit, setPitLimit] = useState(data.pitSpeedLimitKmh == null ? "" : String(data.pitSpeedLimitKmh));
  const [timeZone, setTimeZone] = useState(data.timeZone ?? "");
  const [keepOutline, setKeepOutline] = useState(data.outlineSource === "session");
  const [sel, setSel] = useState<Selection>(editable && data.gates.sectors.length ? { kind: "sector", index: 0 } : null);
  const [tool, setTool] = useState<Tool>(data.gates.startFinish ? "move" : "startFinish");
  const [dirty, setDirty] = useState(false);
  const [state, action, pending] = useActionState<SetupActionState, FormData>(saveTrackAction, {});
  const svgRef = useRef<SVGSVGElement>(null);
  const drag = useRef<Selection>(null);

  // A successful save clears "unsaved changes": adjusted while rendering when the action state
  // changes (React's pattern for state that follows other state), not in an effect.
  const [seenState, setSeenState] = useState(state);
  if (seenState !== state) {
    setSeenState(state);
    if (state.ok) setDirty(false);
  }

  const geo = useMemo(() => {
    const base = data.outline.length > 1 ? data.outline : (data.trace ?? []);
    const proj = projectionFor(base);
    const outline = toPath(proj, data.outline);
    const trace = data.trace ? toPath(proj, data.trace) : null;
    let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
    for (const p of [outline, trace]) {
      if (!p) continue;
      for (let i = 0; i < p.x.length; i++) {
        minX = Math.min(minX, p.x[i]); maxX = Math.max(maxX, p.x[i]);
        minY = Math.min(minY, p.y[i]); maxY = Math.max(maxY, p.y[i]);
      }
    }
    // Room for corner names drawn right of points on the edge.
    const pad = Math.max(60, 0.09 * Math.max(maxX - minX, maxY - minY));
    const box = Number.isFinite(minX) ? { x: minX - pad, y: -maxY - pad, w: maxX - minX + 2 * pad, h: maxY - minY + 2 * pad } : { x: -100, y: -100, w: 200, h: 200 };
    const d = (p: { x: Float64Array; y: Float64Array }) => {
      let s = "";
      for (let i = 0; i < p.x.length; i++) s += `${i ? "L" : "M"}${p.x[i].toFixed(1)},${(-p.y[i]).toFixed(1)}`;
      return s;
    };
    return { proj, outline, trace, box, outlineD: outline.x.length > 1 ? d(outline) : "", traceD: trace ? d(trace) : "" };
  }, [data.outline, data.trace]);

  const lapLengthM = geo.outline.d.length ? geo.outline.d[geo.outline.d.length - 1] : 0;
  const hasOutline = geo.outline.x.length > 1;

  /** Distance along the outline of the start/finish gate: the zero of "distance along the lap". */
  const sfAlong = useMemo(() => {
    if (!gates.startFinish || !hasOutline) return 0;
    const s = gateShape(geo.proj, gates.startFinish);
    return snapToPath(geo.outline, s.cx, s.cy)?.along ?? 0;
  }, [gates.startFinish, geo, hasOutline]);

  const lapDistance = (along: number) => (lapLengthM > 0 ? (((along - sfAlong) % lapLengthM) + lapLengthM) % lapLengthM : along);
  const gateDistance = (g: Gate) => {
    const s = gateShape(geo.proj, g);
    const snap = hasOutline ? snapToPath(geo.outline, s.cx, s.cy) : null;
    return snap ? lapDistance(snap.along) : null;
  };

  function sortSectors(list: Gate[], keep?: Gate): { list: Gate[]; index: number } {
    const withD = list.map((g) => ({ g, d: gateDistance(g) ?? 0 }));
    withD.sort((a, b) => a.d - b.d);
    const sorted = withD.map((x) => x.g);
    return { list: sorted, index: keep ? sorted.indexOf(keep) : -1 };
  }

  function toLocal(ev: { clientX: number; clientY: number }): { x: number; y: number; mPerPx: number } | null {
    const svg = svgRef.current;
    const m = svg?.getScreenCTM();
    if (!svg || !m) return null;
    const pt = new DOMPoint(ev.clientX, ev.clientY).matrixTransform(m.inverse());
    return { x: pt.x, y: -pt.y, mPerPx: 1 / m.a };
  }

  function snapFor(kind: Tool | "sectorMove", ev: { clientX: number; clientY: number }): Snap | null {
    const p = toLocal(ev);
    if (!p) return null;
    // Pit gates sit on the pit lane, which only the session's whole trace shows; track gates on the lap.
    const path = (kind === "pitEntry" || kind === "pitExit") && geo.trace ? geo.trace : geo.outline;
    const s = snapToPath(path, p.x, p.y);
    return s && s.off <= HIT_PX * p.mPerPx ? s : null;
  }

  function placeAt(target: Exclude<Selection, null> | { kind: "newSector" } | { kind: "newCorner" }, s: Snap) {
    setDirty(true);
    if (target.kind === "corner" || target.kind === "newCorner") {
      const along = snapToPath(geo.outline, s.x, s.y)?.along ?? s.along;
      const distanceM = Math.round(lapDistance(along));
      if (target.kind === "newCorner") {
        const next = [...corners, { name: `Turn ${corners.length + 1}`, distanceM }];
        setCorners(next);
        setSel({ kind: "corner", index: next.length - 1 });
      } else setCorners(corners.map((c, i) => (i === target.index ? { ...c, distanceM } : c)));
      return;
    }
    const isPit = target.kind === "pitEntry" || target.kind === "pitExit";
    const g = gateAtSnap(geo.proj, s, isPit ? PIT_GATE_M : TRACK_GATE_M);
    if (target.kind === "sector" || target.kind === "newSector") {
      const base = target.kind === "sector" ? gates.sectors.map((x, i) => (i === target.index ? g : x)) : [...gates.sectors, g];
      const { list, index } = sortSectors(base, g);
      setGates({ ...gates, sectors: list });
      setSel({ kind: "sector", index });
    } else {
      setGates({ ...gates, [target.kind]: g });
      setSel({ kind: target.kind });
    }
  }

  function onSvgClick(ev: ReactMouseEvent<SVGSVGElement>) {
    if (!editable || drag.current) return;
    const kind = tool === "move" ? (sel?.kind ?? null) : tool;
    if (!kind) return;
    const s = snapFor(kind, ev);
    if (!s) return;
    if (tool === "sector") placeAt({ kind: "newSector" }, s);
    else if (tool === "corner") placeAt({ kind: "newCorner" }, s);
    else if (tool !== "move") placeAt({ kind: tool }, s);
    else if (sel) placeAt(sel, s);
    setTool("move");
  }

  function startDrag(ev: ReactPointerEvent, target: Exclude<Selection, null>) {
    if (!editable) return;
    ev.stopPropagation();
    setSel(target);
    setTool("move");
    // Marks the press as on a gate or corner, so the click that follows selects without moving it.
    drag.current = target;
    const move = (e: PointerEvent) => {
      const s = snapFor(target.kind === "sector" || target.kind === "corner" ? "move" : target.kind, e);
      if (!s) return;
      placeAt(target, s);
    };
    const up = () => {
      window.removeEventListener("pointermove", move);
      window.removeEventListener("pointerup", up);
      // Let the click that ends the drag pass without placing again.
      setTimeout(() => (drag.current = null), 0);
    };
    window.addEventListener("pointermove", move);
    window.addEventListener("pointerup", up);
  }

  function remove(target: Exclude<Selection, null>) {
    setDirty(true);
    if (target.kind === "sector") setGates({ ...gates, sectors: gates.sectors.filter((_, i) => i !== target.index) });
    else if (target.kind === "corner") setCorners(corners.filter((_, i) => i !== target.index));
    else setGates({ ...gates, [target.kind]: null });
    setSel(null);
  }

  function flip(target: Exclude<Selection, null>) {
    setDirty(true);
    if (target.kind === "sector") setGates({ ...gates, sectors: gates.sectors.map((g, i) => (i === target.index ? flipGate(g) : g)) });
    else if (target.kind !== "corner") {
      const g = gates[target.kind];
      if (g) setGates({ ...gates, [target.kind]: flipGate(g) });
    }
  }

  const payload = JSON.stringify({
    name,
    gates,
    corners,
    timeZone: timeZone.trim() === "" ? null : timeZone.trim(),
    pitSpeedLimitKmh: pitLimit.trim() === "" ? null : Number.isFinite(Number(pitLimit.replace(",", "."))) ? Number(pitLimit.replace(",", ".")) : pitLimit,
    outlineSessionId: keepOutline && data.outlineSource === "session" ? data.sessionId : null,
  });

  const isSel = (t: Exclude<Selection, null>) => sel?.kind === t.kind && (!("index" in t) || (sel && "index" in sel && sel.index === t.index));
  const err = (k: string) => state.errors?.[k];
  const shown = new Set(["name", "pitSpeedLimitKmh", "timeZone", "gates.startFinish", "gates.pitEntry", "gates.pitExit", ...gates.sectors.map((_, i) => `gates.sectors.${i}`), ...corners.flatMap((_, i) => [`corners.${i}.name`, `corners.${i}.distanceM`])]);
  const otherErrors = Object.entries(state.errors ?? {}).filter(([k]) => !shown.has(k));
  const vb = geo.box;
  const strokeM = Math.max(vb.w, vb.h) / 260;

  const gateRows: { sel: Exclude<Selection, null>; label: string; gate: Gate | null; errKey: string; colour: string }[] = [
    { sel: { kind: "startFinish" }, label: "Start/finish", gate: gates.startFinish, errKey: "gates.startFinish", colour: "bg-signal-500" },
    ...gates.sectors.map((g, i) => ({ sel: { kind: "sector" as const, index: i }, label: `Sector gate ${i + 1}`, gate: g, errKey: `gates.sectors.${i}`, colour: "bg-trace-400" })),
    { sel: { kind: "pitEntry" }, label: "Pit entry", gate: gates.pitEntry, errKey: "gates.pitEntry", colour: "bg-ink-100" },
    { sel: { kind: "pitExit" }, label: "Pit exit", gate: gates.pitExit, errKey: "gates.pitExit", colour: "bg-ink-100" },
  ];

  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <section className="card self-start p-3" aria-label="Track outline">
        {editable && hasOutline && (
          <div className="mb-3 flex flex-wrap items-center gap-2" role="toolbar" aria-label="Place on the outline">
            <span className="text-xs font-semibold uppercase tracking-wide text-ink-400">Place</span>
            {(["startFinish", "sector", "pitEntry", "pitExit", "corner"] as const).map((t) => (
              <button
                key={t}
                type="button"
                aria-pressed={tool === t}
                onClick={() => setTool(tool === t ? "move" : t)}
                className={`btn-quiet px-2.5 py-1 text-xs ${tool === t ? "border-signal-500 bg-signal-500/15 text-signal-400" : ""}`}
              >
                {t === "sector" ? "+ Sector gate" : t === "corner" ? "+ Corner" : LABEL[t]}
              </button>
            ))}
          </div>
        )}
        {hasOutline || geo.trace ? (
          <svg
            ref={svgRef}
            role="img"
            aria-label={`Outline of ${data.name}`}
            data-testid="track-outline"
            viewBox={`${vb.x} ${vb.y} ${vb.w} ${vb.h}`}
            className={`h-[min(68vh,640px)] w-full rounded-md bg-ink-950 ${editable ? "cursor-crosshair" : ""}`}
            onClick={onSvgClick}
          >
            {geo.traceD && <path d={geo.traceD} fill="none" stroke="var(--color-ink-600)" strokeWidth={strokeM * 0.6} strokeLinejoin="round" />}
            {geo.outlineD && <path data-testid="outline-path" d={geo.outlineD} fill="none" stroke="var(--color-ink-300)" strokeWidth={strokeM * 1.6} strokeLinejoin="round" strokeLinecap="round" />}
            {corners.map((c, i) => {
              const p = pointAt(geo.outline, c.distanceM + sfAlong);
              if (!p) return null;
              const active = isSel({ kind: "corner", index: i });
              return (
                <g key={`c${i}`} onPointerDown={(e) => startDrag(e, { kind: "corner", index: i })} className={editable ? "cursor-grab" : ""}>
                  <circle cx={p.x} cy={-p.y} r={strokeM * (active ? 3.2 : 2.4)} fill={active ? "var(--color-signal-400)" : "var(--color-ink-800)"} stroke="var(--color-ink-100)" strokeWidth={strokeM * 0.6} />
                  <text x={p.x + strokeM * 4} y={-p.y - strokeM * 3} fontSize={strokeM * 7} fill="var(--color-ink-100)" stroke="var(--color-ink-950)" strokeWidth={strokeM * 1.6} paintOrder="stroke">{c.name}</text>
                </g>
              );
            })}
            {gateRows.map((r) => {
              if (!r.gate) return null;
              const s = gateShape(geo.proj, r.gate);
              const active = isSel(r.sel);
              const colour = r.sel.kind === "startFinish" ? "var(--color-signal-500)" : r.sel.kind === "sector" ? "var(--color-trace-400)" : "var(--color-ink-100)";
              const arrow = strokeM * 9;
              const pit = r.sel.kind === "pitEntry" || r.sel.kind === "pitExit";
              // Pit labels at the other end than track-gate labels, so neighbours do not overlap.
              const lx = pit ? s.ax : s.bx;
              const ly = pit ? s.ay : s.by;
              return (
                <g key={r.label} data-testid={`gate-${r.label}`} onPointerDown={(e) => startDrag(e, r.sel)} className={editable ? "cursor-grab" : ""}>
                  {active && <circle cx={s.cx} cy={-s.cy} r={22} fill="var(--color-signal-500)" fillOpacity={0.15} stroke="var(--color-signal-400)" strokeWidth={strokeM * 0.5} />}
                  {/* A wide transparent line makes the gate easy to grab. */}
                  <line x1={s.ax} y1={-s.ay} x2={s.bx} y2={-s.by} stroke="transparent" strokeWidth={strokeM * 8} />
                  <line x1={s.ax} y1={-s.ay} x2={s.bx} y2={-s.by} stroke={colour} strokeWidth={strokeM * (active ? 2.6 : 1.8)} strokeDasharray={r.sel.kind === "pitEntry" || r.sel.kind === "pitExit" ? `${strokeM * 3} ${strokeM * 2}` : undefined} />
                  <line x1={s.cx} y1={-s.cy} x2={s.cx + arrow * s.tx} y2={-(s.cy + arrow * s.ty)} stroke={colour} strokeWidth={strokeM} markerEnd="url(#gate-arrow)" />
                  <circle cx={s.cx} cy={-s.cy} r={strokeM * 2} fill={colour} stroke="var(--color-ink-950)" strokeWidth={strokeM * 0.5} />
                  <text x={lx + strokeM * 2} y={-ly} fontSize={strokeM * 7} fill={colour} stroke="var(--color-ink-950)" strokeWidth={strokeM * 1.6} paintOrder="stroke">
                    {r.sel.kind === "sector" ? `S${r.sel.index + 1}` : r.sel.kind === "startFinish" ? "S/F" : r.sel.kind === "pitEntry" ? "Pit in" : "Pit out"}
                  </text>
                </g>
              );
            })}
            <defs>
              <marker id="gate-arrow" viewBox="0 0 10 10" refX="6" refY="5" markerWidth="4" markerHeight="4" orient="auto-start-reverse">
                <path d="M0,0 L10,5 L0,10 z" fill="context-stroke" />
              </marker>
            </defs>
          </svg>
        ) : (
          <p className="p-6 text-sm text-ink-400">
            No outline yet: this track has none stored and no analysed session with GPS positions. Upload a session on this track, or make the
            track from a session on the Tracks page.
          </p>
        )}
        <p className="mt-2 px-1 text-xs text-ink-400">
          {data.outlineSource === "session" ? "Outline: one lap of the chosen session's GPS." : data.outlineSource === "track" ? "Outline: stored with the track." : ""}
          {hasOutline && <> Lap <span className="num">{Math.round(lapLengthM)}</span> m.</>}
          {geo.trace && " The grey trace is the whole session, pit lane included."}
          {editable && hasOutline && " Pick a gate in the list, then click the outline to move it there, or drag it. Arrows show the direction of travel."}
        </p>
      </section>

      <div className="space-y-4">
        <form action={action} className="card space-y-4" aria-label="Track settings" noValidate>
          <input type="hidden" name="trackId" value={data.id} />
          <input type="hidden" name="payload" value={payload} />
          <div className="grid gap-3 sm:grid-cols-[2fr_1fr]">
            <div>
              <label className="label" htmlFor="track-name">Name</label>
              <input id="track-name" className="field" value={name} readOnly={!editable} disabled={!editable} onChange={(e) => { setName(e.target.value); setDirty(true); }} />
              {err("name") && <p className="mt-1 text-xs text-alert-400">{err("name")}</p>}
            </div>
            <div>
              <label className="label" htmlFor="pit-limit">Pit-lane limit <span className="normal-case tracking-normal text-ink-400">(km/h)</span></label>
              <input id="pit-limit" className="field num" inputMode="decimal" value={pitLimit} readOnly={!editable} disabled={!editable} onChange={(e) => { setPitLimit(e.target.value); setDirty(true); }} placeholder="none" />
              {err("pitSpeedLimitKmh") && <p className="mt-1 text-xs text-alert-400">{err("pitSpeedLimitKmh")}</p>}
            </div>
            <div>
              <label className="label" htmlFor="track-zone">Time zone <span className="normal-case tracking-normal text-ink-400">(IANA, e.g. Europe/Madrid)</span></label>
              <input id="track-zone" className="field" value={timeZone} readOnly={!editable} disabled={!editable} onChange={(e) => { setTimeZone(e.target.value); setDirty(true); }} placeholder="UTC" />
              {err("timeZone") && <p className="mt-1 text-xs text-alert-400">{err("timeZone")}</p>}
            </div>
          </div>

          <div>
            <h2 className="mb-2 text-xs font-semibold uppercase tracking-wide text-ink-300">Gates</h2>
            <ul className="divide-y divide-ink-800 text-sm" data-testid="gate-list">
              {gateRows.map((r) => {
                const d = r.gate ? gateDistance(r.gate) : null;
                const active = isSel(r.sel);
                return (
                  <li key={r.label} className={`flex flex-wrap items-center gap-2 py-1.5 ${active ? "bg-ink-850" : ""}`}>
                    <span className={`h-2.5 w-2.5 rounded-full ${r.colour}`} aria-hidden />
                    {editable ? (
                      <button type="button" className={`text-left hover:underline ${active ? "font-semibold text-signal-400" : ""}`} aria-pressed={active} onClick={() => { setSel(r.sel); setTool(r.gate ? "move" : r.sel.kind === "sector" ? "move" : r.sel.kind); }}>
                        {r.label}
                      </button>
                    ) : (
                      <span>{r.label}</span>
                    )}
                    <span className="num ml-auto text-ink-300" data-testid={`distance-${r.label}`}>
                      {r.gate ? (d === null ? "placed" : `${Math.round(d)} m`) : "not placed"}
                    </span>
                    {editable && r.gate && (
                      <>
                        <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => flip(r.sel)} aria-label={`Reverse direction of ${r.label}`}>Reverse</button>
                        <button type="button" className="btn-danger px-2 py-0.5 text-xs" onClick={() => remove(r.sel)} aria-label={`Delete ${r.label}`}>Delete</button>
                      </>
                    )}
                    {err(r.errKey) && <p className="w-full text-xs text-alert-400">{err(r.errKey)}</p>}
                  </li>
                );
              })}
            </ul>
            {editable && <p className="mt-1 text-xs text-ink-400">Sector gates are numbered in lap order from the start/finish gate.</p>}
          </div>

          <div>
            <h2 className="mb-2 text-xs font-semibold uppercase tracking-wide text-ink-300">Corners</h2>
            {corners.length === 0 && <p className="text-sm text-ink-400">No corners named yet.{editable && " Use “+ Corner” and click the outline."}</p>}
            <ul className="space-y-1.5" data-testid="corner-list">
              {corners.map((c, i) => (
                <li key={i} className={`grid grid-cols-[1fr_7rem_auto] items-start gap-2 ${isSel({ kind: "corner", index: i }) ? "rounded bg-ink-850" : ""}`}>
                  <div>
                    <input aria-label={`Name of corner ${i + 1}`} className="field py-1" value={c.name} readOnly={!editable} disabled={!editable} onFocus={() => setSel({ kind: "corner", index: i })} onChange={(e) => { setCorners(corners.map((x, j) => (j === i ? { ...x, name: e.target.value } : x))); setDirty(true); }} />
                    {err(`corners.${i}.name`) && <p className="mt-1 text-xs text-alert-400">{err(`corners.${i}.name`)}</p>}
                  </div>
                  <div>
                    <div className="flex items-center gap-1">
                      <input aria-label={`Distance of corner ${i + 1} along the lap (m)`} className="field num py-1 text-right" inputMode="numeric" value={c.distanceM} readOnly={!editable} disabled={!editable} onChange={(e) => { setCorners(corners.map((x, j) => (j === i ? { ...x, distanceM: Number(e.target.value) || 0 } : x))); setDirty(true); }} />
                      <span className="text-xs text-ink-400">m</span>
                    </div>
                    {err(`corners.${i}.distanceM`) && <p className="mt-1 text-xs text-alert-400">{err(`corners.${i}.distanceM`)}</p>}
                  </div>
                  {editable && <button type="button" className="btn-danger px-2 py-1 text-xs" onClick={() => remove({ kind: "corner", index: i })} aria-label={`Delete corner ${c.name}`}>Delete</button>}
                </li>
              ))}
            </ul>
          </div>

          {otherErrors.length > 0 && (
            <ul className="space-y-1 text-xs text-alert-400" role="alert">
              {otherErrors.map(([k, m]) => <li key={k}>{m}</li>)}
            </ul>
          )}

          {editable && (
            <div className="space-y-3 border-t border-ink-800 pt-3">
              {data.outlineSource === "session" && (
                <label className="flex items-center gap-2 text-sm text-ink-300">
                  <input type="checkbox" checked={keepOutline} onChange={(e) => { setKeepOutline(e.target.checked); setDirty(true); }} />
                  Keep this session&apos;s lap as the track outline
                </label>
              )}
              <div className="flex flex-wrap items-center gap-3">
                <button className="btn-primary" disabled={pending}>{pending ? "Saving and re-analysing…" : "Save track"}</button>
                {dirty && !pending && <span className="text-xs text-signal-400">Unsaved changes</span>}
                <Feedback state={state} />
              </div>
              <p className="text-xs text-ink-400">Saving analyses this track&apos;s sessions again with the new gates: laps, sectors and pit passes are recomputed.</p>
            </div>
          )}
        </form>
      </div>
    </div>
  );
}
