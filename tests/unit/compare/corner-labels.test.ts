import { describe, expect, it } from "vitest";
import { cornerLabels, shortCornerName } from "@/lib/compare/corner-labels";

/**
 * A monospace measure: every character 6.6 px wide (11 px type with a 0.6 em advance, the usual
 * width of monospace faces — common practice, from memory). Checks below are interval arithmetic
 * worked by hand: label i spans [pos − w/2, pos + w/2].
 */
const mono = (t: string) => t.length * 6.6;

/** Drawn labels never overlap and keep the gap: checked on every pair of neighbours drawn. */
function assertApart(pos: number[], texts: string[], gap: number) {
  const drawn = texts.map((t, i) => ({ t, p: pos[i] })).filter((d) => d.t !== "");
  for (let i = 1; i < drawn.length; i++) expect(drawn[i - 1].p + mono(drawn[i - 1].t) / 2 + gap).toBeLessThanOrEqual(drawn[i].p - mono(drawn[i].t) / 2);
}

describe("shortCornerName", () => {
  it("shortens numbered, multi-word and long single-word names", () => {
    expect(shortCornerName("Turn 5")).toBe("T5");
    expect(shortCornerName("turn 12a")).toBe("T12a");
    expect(shortCornerName("Back Straight Kink")).toBe("BSK");
    expect(shortCornerName("Hairpin")).toBe("Hai.");
    expect(shortCornerName("Dip")).toBe("Dip");
  });
});

describe("cornerLabels", () => {
  it("keeps full names when they fit", () => {
    // "Turn 1" is 39.6 px wide: centres 100 px apart leave 60.4 px between labels.
    const pos = [100, 200, 300];
    expect(cornerLabels(pos.map((p, i) => ({ pos: p, name: `Turn ${i + 1}` })), mono)).toEqual(["Turn 1", "Turn 2", "Turn 3"]);
  });

  it("switches every label to its short form when two full names would touch (Turn 5 / Turn 6 at 40 px)", () => {
    // Full: 100 + 19.8 + 6 = 125.8 > 140 − 19.8 = 120.2 → overlap. Short "T5" is 13.2 px: 100 + 6.6 + 6 = 112.6 ≤ 133.4.
    const pos = [20, 100, 140, 300];
    const out = cornerLabels(pos.map((p, i) => ({ pos: p, name: `Turn ${i + 4}` })), mono);
    expect(out).toEqual(["T4", "T5", "T6", "T7"]);
    assertApart(pos, out, 6);
  });

  it("leaves out a label that would still touch the last one drawn", () => {
    // Short labels 13.2 px wide need centres ≥ 19.2 px apart: 100 → 110 is too close, 100 → 130 is not.
    const pos = [100, 110, 130, 135, 160];
    const marks = pos.map((p, i) => ({ pos: p, name: `Turn ${i + 1}` }));
    const out = cornerLabels(marks, mono);
    expect(out).toEqual(["T1", "", "T3", "", "T5"]);
    assertApart(pos, out, 6);
  });

  it("never overlaps for any spacing (a sweep of 400 random layouts)", () => {
    let seed = 7;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    for (let k = 0; k < 400; k++) {
      const n = 2 + Math.floor(rnd() * 14);
      const pos: number[] = [];
      let p = 0;
      for (let i = 0; i < n; i++) pos.push((p += 2 + rnd() * 80));
      const out = cornerLabels(pos.map((q, i) => ({ pos: q, name: i % 3 === 0 ? `Turn ${i + 1}` : `Corner ${i + 10}` })), mono, 4);
      assertApart(pos, out, 4);
      expect(out[0]).not.toBe("");
    }
  });
});
