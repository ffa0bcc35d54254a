/**
 * Columnar binary transport for sample series (STYLE habit 5), shared by server and browser:
 *
 *   [uint32 LE: header byte length H][H bytes UTF-8 JSON header][zero padding to 8][arrays…]
 *
 * The header carries the caller's `meta` and, per array, its element type, absolute byte offset
 * and element count. Every array starts on an 8-byte boundary, so the receiver wraps the body it
 * fetched in Float32Array/Float64Array views without copying a sample.
 */
export type SeriesArray = Float32Array | Float64Array;
export type SeriesArrayType = "f32" | "f64";

export interface ArrayDescriptor {
  type: SeriesArrayType;
  /** Byte offset from the start of the whole message (a multiple of 8). */
  offset: number;
  /** Number of elements. */
  length: number;
}

export interface SeriesHeader<M> {
  /** Format version, bumped on any incompatible change. */
  v: 1;
  meta: M;
  arrays: ArrayDescriptor[];
}

export const SERIES_CONTENT_TYPE = "application/octet-stream";
export const SERIES_FORMAT_VERSION = 1;
const ALIGN = 8;

const align = (n: number) => Math.ceil(n / ALIGN) * ALIGN;

/** Encode `meta` and the arrays into one message (one allocation, one copy per array). */
export function encodeSeries<M>(meta: M, arrays: readonly SeriesArray[]): Uint8Array {
  // The header's offsets depend on the header's own length, which depends on the digits of the
  // offsets: lay out with a guess, then redo once if the header grew past the next alignment.
  let headerBytes = new Uint8Array(0);
  let descriptors: ArrayDescriptor[] = [];
  let dataStart = 0;
  for (let guess = 0, attempt = 0; attempt < 4; attempt++) {
    dataStart = align(4 + guess);
    let off = dataStart;
    descriptors = arrays.map((a) => {
      const d: ArrayDescriptor = { type: a instanceof Float64Array ? "f64" : "f32", offset: off, length: a.length };
      off = align(off + a.byteLength);
      return d;
    });
    const header: SeriesHeader<M> = { v: SERIES_FORMAT_VERSION, meta, arrays: descriptors };
    headerBytes = new TextEncoder().encode(JSON.stringify(header));
    if (align(4 + headerBytes.length) === dataStart) break;
    guess = headerBytes.length;
  }
  const last = descriptors[descriptors.length - 1];
  const total = last ? align(last.offset + arrays[arrays.length - 1]!.byteLength) : dataStart;
  const out = new Uint8Array(total);
  new DataView(out.buffer).setUint32(0, headerBytes.length, true);
  out.set(headerBytes, 4);
  for (let i = 0; i < arrays.length; i++) {
    const a = arrays[i]!;
    out.set(new Uint8Array(a.buffer, a.byteOffset, a.byteLength), descriptors[i]!.offset);
  }
  return out;
}

export interface DecodedSeries<M> {
  meta: M;
  arrays: SeriesArray[];
}

/**
 * Decode a message. Views share the message's memory when it starts on an 8-byte boundary (a
 * fetched ArrayBuffer always does); otherwise the bytes are copied once into an aligned buffer.
 */
export function decodeSeries<M>(message: ArrayBuffer | Uint8Array): DecodedSeries<M> {
  let bytes = message instanceof Uint8Array ? message : new Uint8Array(message);
  if (bytes.byteOffset % ALIGN !== 0) bytes = bytes.slice();
  if (bytes.byteLength < 4) throw new RangeError("series message shorter than its length prefix");
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const headerLength = view.getUint32(0, true);
  if (4 + headerLength > bytes.byteLength) throw new RangeError("series header runs past the end of the message");
  const header = JSON.parse(new TextDecoder().decode(bytes.subarray(4, 4 + headerLength))) as SeriesHeader<M>;
  if (header.v !== SERIES_FORMAT_VERSION) throw new RangeError(`series format version ${String(header.v)} is not supported`);
  const arrays = header.arrays.map((d) => {
    const width = d.type === "f64" ? 8 : 4;
    if (d.offset % ALIGN !== 0) throw new RangeError(`array at byte ${d.offset} is not 8-byte aligned`);
    if (d.offset + d.length * width > bytes.byteLength) throw new RangeError(`array at byte ${d.offset} runs past the end of the message`);
    const at = bytes.byteOffset + d.offset;
    return d.type === "f64" ? new Float64Array(bytes.buffer, at, d.length) : new Float32Array(bytes.buffer, at, d.length);
  });
  return { meta: header.meta, arrays };
}
