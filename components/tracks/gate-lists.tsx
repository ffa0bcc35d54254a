"use client";
/** The gate editor's lists: the gates with their distance along the lap, and the named corners. */
import type { Gate } from "@/lib/geo/types";
import type { TrackCorner } from "@/lib/geo/stored-track";
import type { GateRow } from "./gate-canvas";
import type { Target, Tool } from "./use-gate-editor";

export function GateList({
  gateRows,
  gateDistance,
  isSel,
  editable,
  onSelect,
  onFlip,
  onRemove,
  err,
}: {
  gateRows: GateRow[];
  gateDistance: (g: Gate) => number | null;
  isSel: (t: Target) => boolean;
  editable: boolean;
  onSelect: (t: Target, tool: Tool) => void;
  onFlip: (t: Target) => void;
  onRemove: (t: Target) => void;
  err: (key: string) => string | undefined;
}) {
  return (
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
                <button type="button" className={`text-left hover:underline ${active ? "font-semibold text-signal-400" : ""}`} aria-pressed={active} onClick={() => onSelect(r.sel, r.gate ? "move" : r.sel.kind === "sector" ? "move" : r.sel.kind)}>
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
                  <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => onFlip(r.sel)} aria-label={`Reverse direction of ${r.label}`}>Reverse</button>
                  <button type="button" className="btn-danger px-2 py-0.5 text-xs" onClick={() => onRemove(r.sel)} aria-label={`Delete ${r.label}`}>Delete</button>
                </>
              )}
              {err(r.errKey) && <p className="w-full text-xs text-alert-400">{err(r.errKey)}</p>}
            </li>
          );
        })}
      </ul>
      {editable && <p className="mt-1 text-xs text-ink-400">Sector gates are numbered in lap order from the start/finish gate.</p>}
    </div>
  );
}

export function CornerList({
  corners,
  isSel,
  editable,
  onSelect,
  onEdit,
  onRemove,
  err,
}: {
  corners: TrackCorner[];
  isSel: (t: Target) => boolean;
  editable: boolean;
  onSelect: (t: Target) => void;
  onEdit: (index: number, patch: Partial<TrackCorner>) => void;
  onRemove: (t: Target) => void;
  err: (key: string) => string | undefined;
}) {
  return (
    <div>
      <h2 className="mb-2 text-xs font-semibold uppercase tracking-wide text-ink-300">Corners</h2>
      {corners.length === 0 && <p className="text-sm text-ink-400">No corners named yet.{editable && " Use “+ Corner” and click the outline."}</p>}
      <ul className="space-y-1.5" data-testid="corner-list">
        {corners.map((c, i) => (
          <li key={i} className={`grid grid-cols-[1fr_7rem_auto] items-start gap-2 ${isSel({ kind: "corner", index: i }) ? "rounded bg-ink-850" : ""}`}>
            <div>
              <input aria-label={`Name of corner ${i + 1}`} className="field py-1" value={c.name} readOnly={!editable} disabled={!editable} onFocus={() => onSelect({ kind: "corner", index: i })} onChange={(e) => onEdit(i, { name: e.target.value })} />
              {err(`corners.${i}.name`) && <p className="mt-1 text-xs text-alert-400">{err(`corners.${i}.name`)}</p>}
            </div>
            <div>
              <div className="flex items-center gap-1">
                <input aria-label={`Distance of corner ${i + 1} along the lap (m)`} className="field num py-1 text-right" inputMode="numeric" value={c.distanceM} readOnly={!editable} disabled={!editable} onChange={(e) => onEdit(i, { distanceM: Number(e.target.value) || 0 })} />
                <span className="text-xs text-ink-400">m</span>
              </div>
              {err(`corners.${i}.distanceM`) && <p className="mt-1 text-xs text-alert-400">{err(`corners.${i}.distanceM`)}</p>}
            </div>
            {editable && <button type="button" className="btn-danger px-2 py-1 text-xs" onClick={() => onRemove({ kind: "corner", index: i })} aria-label={`Delete corner ${c.name}`}>Delete</button>}
          </li>
        ))}
      </ul>
    </div>
  );
}
