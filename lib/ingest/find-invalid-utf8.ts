/**
 * Byte offset of the first invalid UTF-8 sequence in `bytes`, or -1.
 * Hand-written because TextDecoder({ fatal: true }) only says *that* the bytes are invalid, not
 * *where*; users need the offset (and line) to find the stray Latin-1 character. Callers use the
 * native decoder on the fast path and this only to locate an error.
 * `allowTruncatedEnd`: a sequence cut by the end of the buffer is not an error (a chunk boundary).
 * Rules: RFC 3629 §4 (no overlongs, no surrogates, nothing above U+10FFFF).
 */
export function findInvalidUtf8(bytes: Uint8Array, allowTruncatedEnd = false): number {
  const n = bytes.length;
  let i = 0;
  while (i < n) {
    const b = bytes[i];
    if (b < 0x80) {
      i++;
      continue;
    }
    let need: number;
    let lo = 0x80;
    let hi = 0xbf;
    if (b >= 0xc2 && b <= 0xdf) need = 1;
    else if (b >= 0xe0 && b <= 0xef) {
      need = 2;
      if (b === 0xe0) lo = 0xa0;
      if (b === 0xed) hi = 0x9f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      need = 3;
      if (b === 0xf0) lo = 0x90;
      if (b === 0xf4) hi = 0x8f;
    } else return i;
    for (let k = 1; k <= need; k++) {
      if (i + k >= n) return allowTruncatedEnd ? -1 : i;
      const c = bytes[i + k];
      const min = k === 1 ? lo : 0x80;
      const max = k === 1 ? hi : 0xbf;
      if (c < min || c > max) return i;
    }
    i += need + 1;
  }
  return -1;
}

/** 1-based line number of a byte offset (counts LF bytes before it). */
export function lineOfOffset(bytes: Uint8Array, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset && i < bytes.length; i++) if (bytes[i] === 0x0a) line++;
  return line;
}
