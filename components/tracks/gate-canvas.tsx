"use client";
/**
 * The gate editor's drawing: the outline in local metres (no map tiles) with the gates, their
 * direction arrows and the named corners, and the toolbar that picks what a click places.
 */
import type { MouseEvent as ReactMouseEvent, PointerEvent as ReactPointerEvent, RefObject } from "react";
import type { Gate } from "@/lib/geo/types";
import type { TrackCorner } from "@/lib/geo/stored-track";
import type { LocalProjection } from "@/lib/geo/to-local-metres";
import { gateShape, pointAt, type Path } from "@/lib/geo/gate-snapping";
import type { GateKey, Target, Tool } from "./use-gate-editor";

export const LABEL: Record<GateKey, string> = { startFinish: "Start/finish", pitEntry: "Pit entry", pitExit: "Pit exit" };

/** The outline and the session's whole trace in local metres, with the view box and SVG paths. */
export interface OutlineGeometry {
  proj: LocalProjection;
  outline: Path;
  trace: Path | null;
  box: { x: number; y: number; w: number; h: number };
  outlineD: string;
  traceD: string;
}

/** One row of the gate list, also drawn on the canvas. */
export interface GateRow {
  sel: Target;
  label: string;
  gate: Gate | null;
  errKey: string;
  colour: string;
}

export function GateCanvas({
  name,
  outlineSource,
  editable,
  geo,
  corners,
  gateRows,
  sfAlong,
  lapLengthM,
  tool,
  onTool,
  isSel,
  svgRef,
  onSvgClick,
  startDrag,
}: {
  name: string;
  outlineSource: string | null;
  editable: boolean;
  geo: OutlineGeometry;
  corners: TrackCorner[];
  gateRows: GateRow[];
  sfAlong: number;
  lapLengthM: number;
  tool: Tool;
  onTool: (t: Tool) => void;
  isSel: (t: Target) => boolean;
  svgRef: RefObject<SVGSVGElement | null>;
  onSvgClick: (ev: ReactMouseEvent<SVGSVGElement>) => void;
  startDrag: (ev: ReactPointerEvent, target: Target) => void;
}) {
  const hasOutline = geo.outline.x.length > 1;
  const vb = geo.box;
  const strokeM = Math.max(vb.w, vb.h) / 260;
  return (
  <section className="card self-start p-3" aria-label="Track outline">
    {editable && hasOutline && (
      <div className="mb-3 flex flex-wrap items-center gap-2" role="toolbar" aria-label="Place on the outline">
        <span className="text-xs font-semibold uppercase tracking-wide text-ink-400">Place</span>
        {(["startFinish", "sector", "pitEntry", "pitExit", "corner"] as const).map((t) => (
          <button
            key={t}
            type="button"
            aria-pressed={tool === t}
            onClick={() => onTool(tool === t ? "move" : t)}
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
        aria-label={`Outline of ${name}`}
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
      {outlineSource === "session" ? "Outline: one lap of the chosen session's GPS." : outlineSource === "track" ? "Outline: stored with the track." : ""}
      {hasOutline && <> Lap <span className="num">{Math.round(lapLengthM)}</span> m.</>}
      {geo.trace && " The grey trace is the whole session, pit lane included."}
      {editable && hasOutline && " Pick a gate in the list, then click the outline to move it there, or drag it. Arrows show the direction of travel."}
    </p>
  </section>
  );
}
