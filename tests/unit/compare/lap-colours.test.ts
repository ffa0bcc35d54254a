import { describe, expect, it } from "vitest";
import { differenceCiede2000, filterDeficiencyDeuter, filterDeficiencyProt, filterDeficiencyTrit, parse, type Color } from "culori";
import { LAP_COLOURS, OUTLINE_RAMP, rampColour } from "@/components/compare/lap-colours";
import { at } from "../../fixtures/at";

// Colour-vision deficiency simulated with culori's filters, which implement Machado, Oliveira &
// Fernandes (2009), "A physiologically-based model for simulation of color vision deficiency"
// (IEEE TVCG 15(6)), at full severity; differences in CIEDE2000 (CIE 142-2001).
const deltaE = differenceCiede2000();
const sim = (f: (c: Color) => Color) => (c: string): Color => f(parse(c)!);
const VISION = { normal: sim((c) => c), protanopia: sim(filterDeficiencyProt(1)), deuteranopia: sim(filterDeficiencyDeuter(1)), tritanopia: sim(filterDeficiencyTrit(1)) };

function minPairDifference(colours: readonly string[], see: (c: string) => Color): number {
  let min = Infinity;
  for (let i = 0; i < colours.length; i++) for (let j = i + 1; j < colours.length; j++) min = Math.min(min, deltaE(see(at(colours, i)), see(at(colours, j))));
  return min;
}

describe("lap colours", () => {
  it("start with our amber for the reference and our teal for the second lap", () => {
    expect(LAP_COLOURS[0]).toBe("#f59e1b");
    expect(LAP_COLOURS[1]).toBe("#4fd1c5");
  });

  it("the rest are Okabe–Ito colours (Okabe & Ito 2008) or our own graphite", () => {
    const okabeIto = ["#E69F00", "#56B4E9", "#009E73", "#F0E442", "#0072B2", "#D55E00", "#CC79A7", "#000000"];
    for (const c of LAP_COLOURS.slice(2)) expect(okabeIto.includes(c) || c === "#e4e8ed").toBe(true);
  });

  it.each(Object.entries(VISION))("the first six stay apart (ΔE2000 ≥ 10) for %s, all eight ≥ 7", (_name, see) => {
    // ΔE2000 ≈ 10 is a clearly visible difference between two thin lines (common practice for
    // categorical palettes; a just-noticeable difference is ≈ 1–2).
    expect(minPairDifference(LAP_COLOURS.slice(0, 6), see)).toBeGreaterThanOrEqual(10);
    expect(minPairDifference(LAP_COLOURS, see)).toBeGreaterThanOrEqual(7);
  });
});

describe("outline ramp", () => {
  it("runs graphite → teal → amber", () => {
    expect(rampColour(0)).toBe(`rgb(${at(OUTLINE_RAMP, 0).join(",")})`);
    expect(rampColour(0.5)).toBe("rgb(43,179,166)");
    expect(rampColour(1)).toBe("rgb(245,158,27)");
    // Halfway between graphite and teal, by linear interpolation of the stops.
    expect(rampColour(0.25)).toBe(`rgb(${[0, 1, 2].map((k) => Math.round((at(at(OUTLINE_RAMP, 0), k) + at(at(OUTLINE_RAMP, 1), k)) / 2)).join(",")})`);
  });
});
