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
  // each pass over the points is a kernel of its own (DEVELOPERS.md, "Long loops and the first call")
  const cols: Float64Array[] = [];
  for (let d = 0; d <= k; d++) {
    const c = powerColumn(x, mid, half, d);
    // c - s q is c + (-s) q exactly (negation is exact)
    for (const q of cols) addMultiple(c, -weightedDot(w, q, c), q);
    const nrm = Math.sqrt(weightedDot(w, c, c));
    if (nrm > 0) divideBy(c, nrm);
    cols.push(c);
  }
  const fit = new Float64Array(n);
  for (const q of cols) addMultiple(fit, weightedDot(w, q, y), q);
  return fit;
}

/** ((x_i - mid) / half)^d. Unchecked. */
function powerColumn(x: Float64Array, mid: number, half: number, d: number): Float64Array {
  const c = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) c[i] = Math.pow((x[i] - mid) / half, d);
  return c;
}

/** sum w_i a_i b_i (multiplied in that order). Unchecked. */
function weightedDot(w: ArrayLike<number>, a: Float64Array, b: ArrayLike<number>): number {
  let dot = 0;
  for (let i = 0; i < a.length; i++) dot += w[i] * a[i] * b[i];
  return dot;
}

/** c += s q. Unchecked. */
function addMultiple(c: Float64Array, s: number, q: Float64Array): void {
  for (let i = 0; i < c.length; i++) c[i] += s * q[i];
}

/** c /= s. Unchecked. */
function divideBy(c: Float64Array, s: number): void {
  for (let i = 0; i < c.length; i++) c[i] /= s;
}
