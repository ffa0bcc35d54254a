import { savitzkyGolayCoefficients } from "./savitzky-golay-coefficients";

/**
 * Savitzky–Golay smoothing (derivative 0) or differentiation of an evenly sampled record,
 * in units of x per second^derivative. Interior samples use the centred window; the first and
 * last (window − 1)/2 samples use the end window evaluated off-centre, so there is no
 * shrinkage or padding at the ends. Any NaN inside a window gives NaN. A record shorter than
 * the window comes back all NaN.
 */
export function savitzkyGolayDerivative(
  x: ArrayLike<number>,
  dtS: number,
  window: number,
  order: number,
  derivative = 1,
): Float32Array {
  const n = x.length;
  const out = new Float32Array(n).fill(NaN);
  if (n < window) return out;
  const h = (window - 1) / 2;
  const scale = 1 / Math.pow(dtS, derivative);
  const centre = savitzkyGolayCoefficients(window, order, derivative, 0);
  for (let i = h; i < n - h; i++) {
    let acc = 0;
    const base = i - h;
    for (let k = 0; k < window; k++) acc += centre[k]! * x[base + k]!;
    out[i] = acc * scale;
  }
  for (let e = 0; e < h; e++) {
    // Sample e from the start sits at offset e − h in the first window; mirrored at the end.
    const head = savitzkyGolayCoefficients(window, order, derivative, e - h);
    const tail = savitzkyGolayCoefficients(window, order, derivative, h - e);
    let a = 0;
    let b = 0;
    for (let k = 0; k < window; k++) {
      a += head[k]! * x[k]!;
      b += tail[k]! * x[n - window + k]!;
    }
    out[e] = a * scale;
    out[n - 1 - e] = b * scale;
  }
  return out;
}
