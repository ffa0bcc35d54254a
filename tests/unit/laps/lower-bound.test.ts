/**
 * lowerBound is the one binary search of the code base (laps, lap stats, Compare windows, pit
 * lane, brief). Its contract is C++'s std::lower_bound (ISO/IEC 14882, [lower.bound]) and
 * Python's bisect.bisect_left: the first index whose element is not less than the value.
 */
import { describe, expect, it } from "vitest";
import { lowerBound } from "@/lib/laps/lower-bound";

describe("lowerBound", () => {
  // Expected indices worked out with Python 3's bisect.bisect_left on the same lists.
  it.each([
    { a: [], v: 1, want: 0 },
    { a: [1, 2, 4, 4, 4, 7], v: 4, want: 2 }, // bisect_left([1,2,4,4,4,7], 4) == 2
    { a: [1, 2, 4, 4, 4, 7], v: 5, want: 5 },
    { a: [1, 2, 4, 4, 4, 7], v: 0, want: 0 },
    { a: [1, 2, 4, 4, 4, 7], v: 8, want: 6 },
    { a: [0.1, 0.2, 0.30000000000000004], v: 0.3, want: 2 },
  ])("bisect_left($a, $v) = $want", ({ a, v, want }) => {
    expect(lowerBound(a, v)).toBe(want);
  });

  it("honours a sub-range [from, to) like bisect_left(a, v, lo, hi)", () => {
    const a = [1, 3, 3, 5, 9, 9, 12];
    expect(lowerBound(a, 3, 2)).toBe(2); // bisect_left(a, 3, 2) == 2
    expect(lowerBound(a, 9, 0, 4)).toBe(4); // bisect_left(a, 9, 0, 4) == 4
    expect(lowerBound(a, 0, 3, 6)).toBe(3); // bisect_left(a, 0, 3, 6) == 3
  });

  it("agrees with a linear scan (the definition) on typed arrays of every size up to 64", () => {
    let seed = 7;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    for (let n = 0; n <= 64; n++) {
      const a = Float64Array.from({ length: n }, () => Math.floor(rnd() * 20)).sort();
      for (let v = -1; v <= 21; v += 0.5) {
        let want = 0;
        while (want < n && a[want] < v) want++;
        expect(lowerBound(a, v)).toBe(want);
      }
    }
  });
});
