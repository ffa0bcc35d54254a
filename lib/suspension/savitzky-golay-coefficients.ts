/**
 * Savitzky–Golay convolution coefficients computed by least squares, so any odd window and
 * polynomial order works (Savitzky & Golay, Anal. Chem. 36(8), 1964; Numerical Recipes §14.8).
 *
 * A polynomial of degree `polyOrder` is fitted to `windowSize` equally spaced samples at
 * z = −h … h (h = (windowSize − 1)/2, unit spacing); the coefficients c give
 * Σ c[k]·y[k] = value of the fit's `derivative`-th derivative at z = `evalAt` (0 = centre;
 * off-centre points are used at the ends of a record). Divide by spacing^derivative for
 * physical units. Coefficient k multiplies the k-th sample of the window, oldest first.
 */
export function savitzkyGolayCoefficients(
  windowSize: number,
  polyOrder: number,
  derivative = 0,
  evalAt = 0,
): Float64Array {
  if (!Number.isInteger(windowSize) || windowSize < 1 || windowSize % 2 === 0) {
    throw new RangeError(`Savitzky–Golay window must be a positive odd integer, got ${windowSize}`);
  }
  if (!Number.isInteger(polyOrder) || polyOrder < 0 || polyOrder >= windowSize) {
    throw new RangeError(`polynomial order must be 0 … ${windowSize - 1}, got ${polyOrder}`);
  }
  if (!Number.isInteger(derivative) || derivative < 0 || derivative > polyOrder) {
    throw new RangeError(`derivative must be 0 … ${polyOrder}, got ${derivative}`);
  }
  const m = windowSize;
  const p = polyOrder + 1;
  const h = (m - 1) / 2;
  // Scale z to [−1, 1] to keep the normal equations well conditioned for wide windows.
  const s = Math.max(h, 1);

  // Normal matrix M = AᵀA (p×p) beside B = Aᵀ (p×m), with A[k][j] = u_k^j, u_k = (k − h)/s.
  const M = new Float64Array(p * p);
  const B = new Float64Array(p * m);
  for (let k = 0; k < m; k++) {
    const u = (k - h) / s;
    let pw = 1;
    for (let j = 0; j < p; j++) {
      B[j * m + k] = pw;
      pw *= u;
    }
  }
  for (let r = 0; r < p; r++) {
    for (let c = 0; c < p; c++) {
      let acc = 0;
      for (let k = 0; k < m; k++) acc += B[r * m + k]! * B[c * m + k]!;
      M[r * p + c] = acc;
    }
  }
  // Gauss–Jordan with partial pivoting: M·X = B → X = (AᵀA)⁻¹Aᵀ, the fit's coefficient map.
  for (let col = 0; col < p; col++) {
    let piv = col;
    for (let r = col + 1; r < p; r++) if (Math.abs(M[r * p + col]!) > Math.abs(M[piv * p + col]!)) piv = r;
    if (piv !== col) {
      for (let c = 0; c < p; c++) [M[col * p + c]!, M[piv * p + c]!] = [M[piv * p + c]!, M[col * p + c]!];
      for (let c = 0; c < m; c++) [B[col * m + c]!, B[piv * m + c]!] = [B[piv * m + c]!, B[col * m + c]!];
    }
    const d = M[col * p + col]!;
    for (let c = 0; c < p; c++) M[col * p + c]! /= d;
    for (let c = 0; c < m; c++) B[col * m + c]! /= d;
    for (let r = 0; r < p; r++) {
      if (r === col) continue;
      const f = M[r * p + col]!;
      if (f === 0) continue;
      for (let c = 0; c < p; c++) M[r * p + c]! -= f * M[col * p + c]!;
      for (let c = 0; c < m; c++) B[r * m + c]! -= f * B[col * m + c]!;
    }
  }
  // d-th derivative of Σ a_j u^j at u0: Σ_{j≥d} a_j · j!/(j−d)! · u0^(j−d); then d/dz = (d/du)/s.
  const u0 = evalAt / s;
  const out = new Float64Array(m);
  for (let j = derivative; j < p; j++) {
    let w = 1;
    for (let q = j; q > j - derivative; q--) w *= q;
    w *= j - derivative === 0 ? 1 : Math.pow(u0, j - derivative);
    if (w === 0) continue;
    for (let k = 0; k < m; k++) out[k]! += w * B[j * m + k]!;
  }
  const scale = Math.pow(s, derivative);
  for (let k = 0; k < m; k++) out[k]! /= scale;
  return out;
}
