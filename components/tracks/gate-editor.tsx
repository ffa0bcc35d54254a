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
import { Feedback } from "@/components/setup/form-bits";
import { gateAtSnap, gateShape, projectionFor, snapToPath, toPath, type Snap } from "@/lib/geo/gate-snapping";
import { useGateEditor, type Target, type Tool } from "./use-gate-editor";
import { GateCanvas, type GateRow } from "./gate-canvas";
import { CornerList, GateList } from "./gate-lists";

/** Lapbench's default gate lengths: across a track with run-off to spare, and across a pit lane only. */
const TRACK_GATE_M = 30;
const PIT_GATE_M = 20;
/** A click further than this from the path (in screen pixels) is not on it. */
const HIT_PX = 18;

export function GateEditor({ data, editable }: { data: TrackEditorData; editable: boolean }) {
  const [{ gates, corners, sel, tool, dirty }, dispatch] = useGateEditor({ gates: data.gates, corners: data.corners, editable });
  const [name, setName] = useState(data.name);
  const [pitLimit, setPitLimit] = useState(data.pitSpeedLimitKmh == null ? "" : String(data.pitSpeedLimitKmh));
  const [timeZone, setTimeZone] = useState(data.timeZone ?? "");
  const [keepOutline, setKeepOutline] = useState(data.outlineSource === "session");
  const [state, action, pending] = useActionState<SetupActionState, FormData>(saveTrackAction, {});
  const svgRef = useRef<SVGSVGElement>(null);
  const drag = useRef<Target | null>(null);

  // A successful save clears "unsaved changes": adjusted while rendering when the action state
  // changes (React's pattern for state that follows other state), not in an effect.
  const [seenState, setSeenState] = useState(state);
  if (seenState !== state) {
    setSeenState(state);
    if (state.ok) dispatch({ type: "saved" });
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

  /** Sector gates in lap order from the start/finish gate. */
  const lapOrder = (list: Gate[]): Gate[] =>
    list
      .map((g) => ({ g, d: gateDistance(g) ?? 0 }))
      .sort((x, y) => x.d - y.d)
      .map((x) => x.g);

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

  function placeAt(target: Target | { kind: "newSector" } | { kind: "newCorner" }, s: Snap) {
    if (target.kind === "corner" || target.kind === "newCorner") {
      const along = snapToPath(geo.outline, s.x, s.y)?.along ?? s.along;
      dispatch({ type: "placeCorner", index: target.kind === "corner" ? target.index : null, distanceM: Math.round(lapDistance(along)) });
      return;
    }
    const isPit = target.kind === "pitEntry" || target.kind === "pitExit";
    const g = gateAtSnap(geo.proj, s, isPit ? PIT_GATE_M : TRACK_GATE_M);
    if (target.kind === "sector" || target.kind === "newSector") dispatch({ type: "placeSector", index: target.kind === "sector" ? target.index : null, gate: g, order: lapOrder });
    else dispatch({ type: "placeGate", key: target.kind, gate: g });
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
    dispatch({ type: "tool", tool: "move" });
  }

  function startDrag(ev: ReactPointerEvent, target: Target) {
    if (!editable) return;
    ev.stopPropagation();
    dispatch({ type: "select", sel: target, tool: "move" });
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

  const payload = JSON.stringify({
    name,
    gates,
    corners,
    timeZone: timeZone.trim() === "" ? null : timeZone.trim(),
    pitSpeedLimitKmh: pitLimit.trim() === "" ? null : Number.isFinite(Number(pitLimit.replace(",", "."))) ? Number(pitLimit.replace(",", ".")) : pitLimit,
    outlineSessionId: keepOutline && data.outlineSource === "session" ? data.sessionId : null,
  });

  const isSel = (t: Target) => sel?.kind === t.kind && (!("index" in t) || (sel && "index" in sel && sel.index === t.index));
  const err = (k: string) => state.errors?.[k];
  const shown = new Set(["name", "pitSpeedLimitKmh", "timeZone", "gates.startFinish", "gates.pitEntry", "gates.pitExit", ...gates.sectors.map((_, i) => `gates.sectors.${i}`), ...corners.flatMap((_, i) => [`corners.${i}.name`, `corners.${i}.distanceM`])]);
  const otherErrors = Object.entries(state.errors ?? {}).filter(([k]) => !shown.has(k));
  const gateRows: GateRow[] = [
    { sel: { kind: "startFinish" }, label: "Start/finish", gate: gates.startFinish, errKey: "gates.startFinish", colour: "bg-signal-500" },
    ...gates.sectors.map((g, i) => ({ sel: { kind: "sector" as const, index: i }, label: `Sector gate ${i + 1}`, gate: g, errKey: `gates.sectors.${i}`, colour: "bg-trace-400" })),
    { sel: { kind: "pitEntry" }, label: "Pit entry", gate: gates.pitEntry, errKey: "gates.pitEntry", colour: "bg-ink-100" },
    { sel: { kind: "pitExit" }, label: "Pit exit", gate: gates.pitExit, errKey: "gates.pitExit", colour: "bg-ink-100" },
  ];

  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <GateCanvas
        name={data.name}
        outlineSource={data.outlineSource}
        editable={editable}
        geo={geo}
        corners={corners}
        gateRows={gateRows}
        sfAlong={sfAlong}
        lapLengthM={lapLengthM}
        tool={tool}
        onTool={(t) => dispatch({ type: "tool", tool: t })}
        isSel={isSel}
        svgRef={svgRef}
        onSvgClick={onSvgClick}
        startDrag={startDrag}
      />

      <div className="space-y-4">
        <form action={action} className="card space-y-4" aria-label="Track settings" noValidate>
          <input type="hidden" name="trackId" value={data.id} />
          <input type="hidden" name="payload" value={payload} />
          <div className="grid gap-3 sm:grid-cols-[2fr_1fr]">
            <div>
              <label className="label" htmlFor="track-name">Name</label>
              <input id="track-name" className="field" value={name} readOnly={!editable} disabled={!editable} onChange={(e) => { setName(e.target.value); dispatch({ type: "edited" }); }} />
              {err("name") && <p className="mt-1 text-xs text-alert-400">{err("name")}</p>}
            </div>
            <div>
              <label className="label" htmlFor="pit-limit">Pit-lane limit <span className="normal-case tracking-normal text-ink-400">(km/h)</span></label>
              <input id="pit-limit" className="field num" inputMode="decimal" value={pitLimit} readOnly={!editable} disabled={!editable} onChange={(e) => { setPitLimit(e.target.value); dispatch({ type: "edited" }); }} placeholder="none" />
              {err("pitSpeedLimitKmh") && <p className="mt-1 text-xs text-alert-400">{err("pitSpeedLimitKmh")}</p>}
            </div>
            <div>
              <label className="label" htmlFor="track-zone">Time zone <span className="normal-case tracking-normal text-ink-400">(IANA, e.g. Europe/Madrid)</span></label>
              <input id="track-zone" className="field" value={timeZone} readOnly={!editable} disabled={!editable} onChange={(e) => { setTimeZone(e.target.value); dispatch({ type: "edited" }); }} placeholder="UTC" />
              {err("timeZone") && <p className="mt-1 text-xs text-alert-400">{err("timeZone")}</p>}
            </div>
          </div>

          <GateList
            gateRows={gateRows}
            gateDistance={gateDistance}
            isSel={isSel}
            editable={editable}
            onSelect={(t, tool) => dispatch({ type: "select", sel: t, tool })}
            onFlip={(t) => dispatch({ type: "flip", target: t })}
            onRemove={(t) => dispatch({ type: "remove", target: t })}
            err={err}
          />

          <CornerList
            corners={corners}
            isSel={isSel}
            editable={editable}
            onSelect={(t) => dispatch({ type: "select", sel: t })}
            onEdit={(index, patch) => dispatch({ type: "editCorner", index, patch })}
            onRemove={(t) => dispatch({ type: "remove", target: t })}
            err={err}
          />

          {otherErrors.length > 0 && (
            <ul className="space-y-1 text-xs text-alert-400" role="alert">
              {otherErrors.map(([k, m]) => <li key={k}>{m}</li>)}
            </ul>
          )}

          {editable && (
            <div className="space-y-3 border-t border-ink-800 pt-3">
              {data.outlineSource === "session" && (
                <label className="flex items-center gap-2 text-sm text-ink-300">
                  <input type="checkbox" checked={keepOutline} onChange={(e) => { setKeepOutline(e.target.checked); dispatch({ type: "edited" }); }} />
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
