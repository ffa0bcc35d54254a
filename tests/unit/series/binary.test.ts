/** The series wire format (lib/series/binary.ts): round trip, 8-byte alignment, header layout. */
import { describe, it, expect } from "vitest";
import { encodeSeries, decodeSeries } from "@/lib/series/binary";
import { at } from "../../fixtures/at";

describe("encodeSeries / decodeSeries", () => {
  it("round-trips Float32 and Float64 arrays bit for bit, NaN and ±Infinity included", () => {
    const a = new Float64Array([0, 1.5, Math.PI, -0, Number.MAX_VALUE, 5e-324]);
    const b = new Float32Array([NaN, Infinity, -Infinity, 1.1, 3]);
    const c = new Float32Array(0);
    const meta = { x: "distance", laps: [{ sessionId: 3, lap: 7, title: "Früh – ✓" }] };
    const { meta: m, arrays } = decodeSeries<typeof meta>(encodeSeries(meta, [a, b, c]));
    expect(m).toEqual(meta);
    expect(arrays[0]).toBeInstanceOf(Float64Array);
    expect(arrays[1]).toBeInstanceOf(Float32Array);
    expect(new Uint8Array(at(arrays, 0).buffer, at(arrays, 0).byteOffset, at(arrays, 0).byteLength)).toEqual(new Uint8Array(a.buffer));
    expect(new Uint8Array(at(arrays, 1).buffer, at(arrays, 1).byteOffset, at(arrays, 1).byteLength)).toEqual(new Uint8Array(b.buffer));
    expect(at(arrays, 2).length).toBe(0);
    expect(Object.is(at(arrays, 0)[3], -0)).toBe(true);
  });

  it("starts with the header's byte length as uint32 little-endian, then UTF-8 JSON", () => {
    const msg = encodeSeries({ hello: "wörld" }, [new Float32Array([1])]);
    const len = at(msg, 0) | (at(msg, 1) << 8) | (at(msg, 2) << 16) | (at(msg, 3) << 24);
    const header = JSON.parse(new TextDecoder().decode(msg.subarray(4, 4 + len)));
    expect(header.v).toBe(1);
    expect(header.meta).toEqual({ hello: "wörld" });
    expect(header.arrays).toEqual([{ type: "f32", offset: header.arrays[0].offset, length: 1 }]);
    expect(header.arrays[0].offset).toBeGreaterThanOrEqual(4 + len);
  });

  it("puts every array on an 8-byte boundary whatever the header and array lengths", () => {
    for (let pad = 0; pad < 20; pad++) {
      const arrays = [new Float32Array(3), new Float64Array(2), new Float32Array(1), new Float64Array(5)];
      const msg = encodeSeries({ pad: "x".repeat(pad) }, arrays);
      const len = new DataView(msg.buffer).getUint32(0, true);
      const header = JSON.parse(new TextDecoder().decode(msg.subarray(4, 4 + len)));
      for (const d of header.arrays) expect(d.offset % 8).toBe(0);
      expect(msg.byteLength % 8).toBe(0);
      // Views are zero-copy over the message.
      const dec = decodeSeries(msg);
      expect(at(dec.arrays, 1).buffer).toBe(msg.buffer);
    }
  });

  it("decodes from a misaligned slice by copying once", () => {
    const msg = encodeSeries({ n: 1 }, [new Float64Array([42, 43])]);
    const shifted = new Uint8Array(msg.byteLength + 3);
    shifted.set(msg, 3);
    const dec = decodeSeries(shifted.subarray(3));
    expect(Array.from(at(dec.arrays, 0))).toEqual([42, 43]);
  });

  it("refuses truncated or foreign messages", () => {
    const msg = encodeSeries({ n: 1 }, [new Float64Array(10)]);
    expect(() => decodeSeries(msg.slice(0, 2))).toThrow(RangeError);
    expect(() => decodeSeries(msg.slice(0, msg.byteLength - 8))).toThrow(/past the end/);
    const other = encodeSeries({ n: 1 }, []);
    const otherLen = new DataView(other.buffer).getUint32(0, true);
    const text = new TextDecoder().decode(other.subarray(4, 4 + otherLen)).replace('"v":1', '"v":9');
    const forged = new Uint8Array(4 + new TextEncoder().encode(text).length);
    new DataView(forged.buffer).setUint32(0, forged.length - 4, true);
    forged.set(new TextEncoder().encode(text), 4);
    expect(() => decodeSeries(forged)).toThrow(/version/);
  });
});
