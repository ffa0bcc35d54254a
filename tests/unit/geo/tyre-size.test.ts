/**
 * Nominal tyre size from the sidewall marking. Reference formula:
 * D = 25.4·rim + 2·width·aspect/100 (ISO 5751 / ETRTO practice — formula recalled from memory,
 * the standards are not open); the worked figures below are plain arithmetic on it.
 */
import { describe, it, expect } from "vitest";
import { tyreSize } from "@/lib/bike/tyre-size";

describe("tyreSize", () => {
  it.each([
    // marking, D (mm), π·D (mm) — ISO 5751 / ETRTO practice (formula from memory), plain arithmetic
    ["190/55 ZR17", 640.8, 2013.1],
    ["120/70 ZR17", 599.8, 1884.3],
    // plain arithmetic on the same formula: 25.4·17 + 2·200·55/100 = 431.8 + 220 = 651.8
    ["200/55ZR17", 651.8, 2047.7],
    ["180/55 R17", 629.8, 1978.6],
  ])("%s → D %f mm, circumference %f mm", (marking, d, c) => {
    const t = tyreSize(marking)!;
    expect(t).not.toBeNull();
    expect(t.diameterMm).toBeCloseTo(d, 1);
    expect(t.circumferenceMm).toBeCloseTo(c, 1);
  });

  it("reads width, aspect and rim", () => {
    expect(tyreSize("120/70 ZR17")).toMatchObject({ widthMm: 120, aspectPct: 70, rimIn: 17 });
  });

  it.each(["", "120/70", "ZR17", "120-70-17", "12/70 ZR17", "120/70 ZR99"])("refuses %j", (m) => {
    expect(tyreSize(m)).toBeNull();
  });
});
