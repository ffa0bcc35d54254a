"use client";
/**
 * The gate editor's state (gates, corners, the selection, the placing tool, unsaved changes) as a
 * reducer: every change the canvas or the lists make is one named action.
 */
import { useReducer } from "react";
import type { Gate } from "@/lib/geo/types";
import type { TrackCorner, TrackGates } from "@/lib/geo/stored-track";
import { flipGate } from "@/lib/geo/gate-snapping";

export type GateKey = "startFinish" | "pitEntry" | "pitExit";
export type Target = { kind: GateKey } | { kind: "sector"; index: number } | { kind: "corner"; index: number };
export type Selection = Target | null;
export type Tool = "move" | GateKey | "sector" | "corner";

export interface GateEditorState {
  gates: TrackGates;
  corners: TrackCorner[];
  sel: Selection;
  tool: Tool;
  dirty: boolean;
}

export type GateEditorAction =
  /** A start/finish or pit gate placed (or moved). */
  | { type: "placeGate"; key: GateKey; gate: Gate }
  /** A sector gate placed (index null: a new one); `order` puts the sector gates in lap order. */
  | { type: "placeSector"; index: number | null; gate: Gate; order: (list: Gate[]) => Gate[] }
  /** A corner placed at a distance along the lap (index null: a new one). */
  | { type: "placeCorner"; index: number | null; distanceM: number }
  | { type: "editCorner"; index: number; patch: Partial<TrackCorner> }
  | { type: "remove"; target: Target }
  | { type: "flip"; target: Target }
  | { type: "select"; sel: Selection; tool?: Tool }
  | { type: "tool"; tool: Tool }
  /** A track setting (name, pit limit, time zone, outline) changed outside the gates and corners. */
  | { type: "edited" }
  | { type: "saved" };

export function gateEditorReducer(s: GateEditorState, a: GateEditorAction): GateEditorState {
  switch (a.type) {
    case "placeGate":
      return { ...s, dirty: true, gates: { ...s.gates, [a.key]: a.gate }, sel: { kind: a.key } };
    case "placeSector": {
      const base = a.index === null ? [...s.gates.sectors, a.gate] : s.gates.sectors.map((x, i) => (i === a.index ? a.gate : x));
      const list = a.order(base);
      return { ...s, dirty: true, gates: { ...s.gates, sectors: list }, sel: { kind: "sector", index: list.indexOf(a.gate) } };
    }
    case "placeCorner":
      if (a.index === null) {
        const corners = [...s.corners, { name: `Turn ${s.corners.length + 1}`, distanceM: a.distanceM }];
        return { ...s, dirty: true, corners, sel: { kind: "corner", index: corners.length - 1 } };
      }
      return { ...s, dirty: true, corners: s.corners.map((c, i) => (i === a.index ? { ...c, distanceM: a.distanceM } : c)) };
    case "editCorner":
      return { ...s, dirty: true, corners: s.corners.map((c, i) => (i === a.index ? { ...c, ...a.patch } : c)) };
    case "remove": {
      const t = a.target;
      if (t.kind === "sector") return { ...s, dirty: true, sel: null, gates: { ...s.gates, sectors: s.gates.sectors.filter((_, i) => i !== t.index) } };
      if (t.kind === "corner") return { ...s, dirty: true, sel: null, corners: s.corners.filter((_, i) => i !== t.index) };
      return { ...s, dirty: true, sel: null, gates: { ...s.gates, [t.kind]: null } };
    }
    case "flip": {
      const t = a.target;
      if (t.kind === "sector") return { ...s, dirty: true, gates: { ...s.gates, sectors: s.gates.sectors.map((g, i) => (i === t.index ? flipGate(g) : g)) } };
      if (t.kind === "corner") return { ...s, dirty: true };
      const g = s.gates[t.kind];
      return g ? { ...s, dirty: true, gates: { ...s.gates, [t.kind]: flipGate(g) } } : { ...s, dirty: true };
    }
    case "select":
      return { ...s, sel: a.sel, tool: a.tool ?? s.tool };
    case "tool":
      return { ...s, tool: a.tool };
    case "edited":
      return { ...s, dirty: true };
    case "saved":
      return { ...s, dirty: false };
  }
}

export function useGateEditor(init: { gates: TrackGates; corners: TrackCorner[]; editable: boolean }) {
  return useReducer(gateEditorReducer, init, (i): GateEditorState => ({
    gates: i.gates,
    // Metre precision is what a corner name needs; stored values may carry more digits.
    corners: i.corners.map((c) => ({ ...c, distanceM: Math.round(c.distanceM) })),
    sel: i.editable && i.gates.sectors.length ? { kind: "sector", index: 0 } : null,
    tool: i.gates.startFinish ? "move" : "startFinish",
    dirty: false,
  }));
}
