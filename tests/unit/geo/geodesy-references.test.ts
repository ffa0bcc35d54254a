import { getDistance, getGreatCircleBearing, getPreciseDistance, sexagesimalToDecimal } from "geolib";
import { describe, expect, it } from "vitest";

// The distance library the app relies on, checked against published worked examples.
describe("geolib against published geodesic references", () => {
  // Vincenty (1975), Survey Review 23(176); worked example as published by Geoscience Australia:
  // Flinders Peak → Buninyong on GRS80, 54 972.271 m. geolib uses WGS-84, whose flattening differs
  // from GRS80 only in the 11th significant digit, far below a millimetre over 55 km.
  const flinders = { lat: -(37 + 57 / 60 + 3.7203 / 3600), lon: 144 + 25 / 60 + 29.5244 / 3600 };
  const buninyong = { lat: -(37 + 39 / 60 + 10.1561 / 3600), lon: 143 + 55 / 60 + 35.3839 / 3600 };

  it("getPreciseDistance reproduces Vincenty's worked example to 1 mm", () => {
    expect(Math.abs(getPreciseDistance(flinders, buninyong, 0.001) - 54972.271)).toBeLessThanOrEqual(0.001);
  });

  it("getDistance (sphere, R = 6 378 137 m) is ≈ 54 987 m, +0.027 % over the ellipsoid (Vincenty 1975 worked example; geolib docs: spherical, equatorial radius)", () => {
    const d = getDistance(flinders, buninyong);
    expect(Math.abs(d - 54987)).toBeLessThanOrEqual(2);
    expect((d - 54972.271) / 54972.271).toBeCloseTo(0.00027, 4);
  });

  it("geolib's own test values: Berlin-area → Dortmund-area points (421 786 m / 422 592 m)", () => {
    // geolib's own test suite values (getDistance / getPreciseDistance).
    const a = { lat: 52.518611, lon: 13.408056 };
    const b = { lat: 51.519475, lon: 7.46694444 };
    expect(getDistance(a, b)).toBe(421786);
    expect(getPreciseDistance(a, b)).toBe(422592);
  });

  it("LAX → JFK: 0.623585 rad = 2144 nm, initial course 66° (Aviation Formulary, Ed Williams)", () => {
    const lax = { lat: 33 + 57 / 60, lon: -(118 + 24 / 60) };
    const jfk = { lat: 40 + 38 / 60, lon: -(73 + 47 / 60) };
    // getDistance is spherical with R = 6 378 137 m, rounded to 1 m (1.6e-7 rad).
    const rad = getDistance(lax, jfk, 0.001) / 6378137;
    expect(Math.abs(rad - 0.623585)).toBeLessThan(1e-6);
    // 1 nm = 1 arc-minute on the formulary's sphere.
    expect(Math.round((rad * 180 * 60) / Math.PI)).toBe(2144);
    expect(Math.round(getGreatCircleBearing(lax, jfk))).toBe(66);
  });

  it("sexagesimal parsing agrees with the hand conversion used above", () => {
    expect(sexagesimalToDecimal(`37° 57' 3.7203" S`)).toBeCloseTo(-(37 + 57 / 60 + 3.7203 / 3600), 9);
  });
});
