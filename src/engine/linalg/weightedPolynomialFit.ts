/**
 * Weighted least-squares polynomial of degree k (0..3) at the points x,
 * by modified Gram-Schmidt on 1, t, ..., t^k with t = x mapped to [-1, 1]
 * (well conditioned for these degrees). Returns the fitted values. O(n k^2).
 * Unchecked: needs at least k + 1 distinct x.
 */
export function weightedPolynomialFit(x: Float64Array, y: ArrayLike<number>, w: ArrayLike<number>, k: number): Float64Array {
  const n = x.length;
  const lo = x[0], hi = x[n - 1];
  const mid = 0.5 * (lo + hi), half = 0.5 * (hi - lo) || 1;
  const cols: Float64Array[] = [];
  for (let d = 0; d <= k; d++) {
    const c = new Float64Array(n);
    for (let i = 0; i < n; i++) c[i] = Math.pow((x[i] - mid) / half, d);
    for (const q of cols) {
      let dot = 0;
      for (let i = 0; i < n; i++) dot += w[i] * q[i] * c[i];
      for (let i = 0; i < n; i++) c[i] -= dot * q[i];
    }
    let nrm = 0;
    for (let i = 0; i < n; i++) nrm += w[i] * c[i] * c[i];
    nrm = Math.sqrt(nrm);
    if (nrm > 0) for (let i = 0; i < n; i++) c[i] /= nrm;
    cols.push(c);
  }
  const fit = new Float64Array(n);
  for (const q of cols) {
    let dot = 0;
    for (let i = 0; i < n; i++) dot += w[i] * q[i] * y[i];
    for (let i = 0; i < n; i++) fit[i] += dot * q[i];
  }
  return fit;
}
