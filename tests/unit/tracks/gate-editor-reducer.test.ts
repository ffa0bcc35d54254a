/** The gate editor's reducer: each action changes what it names, marks unsaved changes, and keeps the selection on the thing moved. */
import { describe, expect, it } from "vitest";
import { gateEditorReducer, type GateEditorState } from "@/components/tracks/use-gate-editor";
import type { Gate } from "@/lib/geo/types";

const gate = (lat: number): Gate => ({ a: { lat, lon: 0 }, b: { lat, lon: 0.0003 } });
const start: GateEditorState = {
  gates: { startFinish: gate(1), sectors: [gate(2), gate(3)], pitEntry: null, pitExit: null },
  corners: [{ name: "Turn 1", distanceM: 120 }],
  sel: null,
  tool: "move",
  dirty: false,
};
/** Lap order by latitude, standing in for distance along the lap. */
const byLat = (list: Gate[]) => [...list].sort((x, y) => x.a.lat - y.a.lat);

describe("gate editor reducer", () => {
  it("a sector gate moved past another is re-ordered and stays selected", () => {
    const moved = gate(3.5);
    const s = gateEditorReducer(start, { type: "placeSector", index: 0, gate: moved, order: byLat });
    expect(s.gates.sectors).toEqual([gate(3), moved]);
    expect(s.sel).toEqual({ kind: "sector", index: 1 });
    expect(s.dirty).toBe(true);
    expect(start.gates.sectors[0]).toEqual(gate(2));
  });

  it("a new sector gate and a new corner are added and selected", () => {
    const s = gateEditorReducer(start, { type: "placeSector", index: null, gate: gate(2.5), order: byLat });
    expect(s.gates.sectors.map((g) => g.a.lat)).toEqual([2, 2.5, 3]);
    expect(s.sel).toEqual({ kind: "sector", index: 1 });
    const c = gateEditorReducer(start, { type: "placeCorner", index: null, distanceM: 800 });
    expect(c.corners).toEqual([{ name: "Turn 1", distanceM: 120 }, { name: "Turn 2", distanceM: 800 }]);
    expect(c.sel).toEqual({ kind: "corner", index: 1 });
  });

  it("reverse swaps the gate's ends, delete clears it and the selection, save clears unsaved changes", () => {
    const f = gateEditorReducer(start, { type: "flip", target: { kind: "startFinish" } });
    expect(f.gates.startFinish).toEqual({ a: gate(1).b, b: gate(1).a });
    const d = gateEditorReducer({ ...f, sel: { kind: "startFinish" } }, { type: "remove", target: { kind: "startFinish" } });
    expect(d.gates.startFinish).toBeNull();
    expect(d.sel).toBeNull();
    expect(d.dirty).toBe(true);
    expect(gateEditorReducer(d, { type: "saved" }).dirty).toBe(false);
  });

  it("editing a corner changes only that corner", () => {
    const s = gateEditorReducer(start, { type: "editCorner", index: 0, patch: { name: "Hairpin" } });
    expect(s.corners).toEqual([{ name: "Hairpin", distanceM: 120 }]);
    expect(s.gates).toBe(start.gates);
  });
});
