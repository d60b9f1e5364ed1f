/**
 * One local fit of LOESS: weighted least squares of degree 0..2 in u = (x - x0) / h
 * with tricube neighbourhood weights, on the window [lo, hi] of sorted x.
 * Unchecked: the caller guarantees lo <= hi inside the arrays.
 */

/** The solved local fit: value at x0 and the row e_0' M^{-1} that maps data to it. */
export interface LocalFit {
  /** Fitted value at x0; NaN when every weight in the window is zero. */
  value: number;
  x0: number;
  /** Bandwidth (distance to the q-th nearest point); 0 when the q nearest points all sit at x0. */
  h: number;
  /** Degree actually used (lower than asked when the window cannot support it). */
  degree: number;
  /** First row of the inverse normal matrix, c0..c_degree: l_j = omega_j (c0 + c1 u_j + c2 u_j^2). */
  c0: number; c1: number; c2: number;
  /** Sum of weights (for h = 0: the tied points' weight). */
  weightSum: number;
}

/** Tricube kernel (1 - |r|^3)^3 for |r| < 1, else 0. */
export function tricube(r: number): number {
  const a = r < 0 ? -r : r;
  if (a >= 1) return 0;
  const t = 1 - a * a * a;
  return t * t * t;
}

/**
 * Fits at x0 using points lo..hi (x sorted), with total weights w_j * rw_j * tricube(|x_j - x0| / h).
 * Rank: the normal matrix is factored by Cholesky with a relative pivot floor of 1e-10; if a
 * pivot falls below it (fewer distinct x in the window than degree + 1, in effect) the degree
 * is lowered. Unchecked.
 */
export function localPolynomial(x: Float64Array, y: Float64Array, w: Float64Array, rw: Float64Array,
  lo: number, hi: number, x0: number, h: number, degree: number, out: LocalFit): LocalFit {
  out.x0 = x0; out.h = h;
  if (!(h > 0)) {
    // the q nearest points all sit at x0: a weighted mean of the points tied with x0
    let sw = 0, swy = 0;
    for (let j = lo; j <= hi; j++) if (x[j] === x0) { const o = w[j] * rw[j]; sw += o; swy += o * y[j]; }
    out.degree = 0; out.weightSum = sw;
    out.c0 = sw > 0 ? 1 / sw : 0; out.c1 = 0; out.c2 = 0;
    out.value = sw > 0 ? swy / sw : NaN;
    return out;
  }
  const inv = 1 / h;
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, t0 = 0, t1 = 0, t2 = 0;
  for (let j = lo; j <= hi; j++) {
    const u = (x[j] - x0) * inv;
    const a = u < 0 ? -u : u;
    if (a >= 1) continue;
    const k = 1 - a * a * a;
    const o = w[j] * rw[j] * k * k * k;
    if (o === 0) continue;
    const ou = o * u, ouu = ou * u, yj = y[j];
    s0 += o; s1 += ou; s2 += ouu; t0 += o * yj; t1 += ou * yj;
    if (degree === 2) { s3 += ouu * u; s4 += ouu * u * u; t2 += ouu * yj; }
  }
  out.weightSum = s0;
  if (!(s0 > 0)) { out.value = NaN; out.degree = 0; out.c0 = 0; out.c1 = 0; out.c2 = 0; return out; }
  const floor = 1e-10;
  if (degree === 2) {
    // Cholesky of [[s0, s1, s2], [s1, s2, s3], [s2, s3, s4]]
    const l00 = Math.sqrt(s0);
    const l10 = s1 / l00, l20 = s2 / l00;
    const p11 = s2 - l10 * l10;
    if (p11 > floor * s2) {
      const l11 = Math.sqrt(p11);
      const l21 = (s3 - l20 * l10) / l11;
      const p22 = s4 - l20 * l20 - l21 * l21;
      if (p22 > floor * s4) {
        const l22 = Math.sqrt(p22);
        // row 0 of M^{-1} = (L^{-T} L^{-1}) e_0: solve L z = e_0, then L' c = z
        const z0 = 1 / l00, z1 = -l10 * z0 / l11, z2 = -(l20 * z0 + l21 * z1) / l22;
        const c2 = z2 / l22, c1 = (z1 - l21 * c2) / l11, c0 = (z0 - l10 * c1 - l20 * c2) / l00;
        out.degree = 2; out.c0 = c0; out.c1 = c1; out.c2 = c2;
        out.value = c0 * t0 + c1 * t1 + c2 * t2;
        return out;
      }
    }
    degree = 1;
  }
  if (degree === 1) {
    const det = s0 * s2 - s1 * s1;
    if (det > floor * s0 * s2) {
      const c0 = s2 / det, c1 = -s1 / det;
      out.degree = 1; out.c0 = c0; out.c1 = c1; out.c2 = 0;
      out.value = c0 * t0 + c1 * t1;
      return out;
    }
  }
  out.degree = 0; out.c0 = 1 / s0; out.c1 = 0; out.c2 = 0;
  out.value = t0 / s0;
  return out;
}

/** The weight l_j that the local fit `f` puts on point j (its row of the smoother matrix). Unchecked. */
export function localWeight(f: LocalFit, xj: number, wj: number, rwj: number): number {
  if (!(f.h > 0)) return xj === f.x0 ? wj * rwj * f.c0 : 0;
  const u = (xj - f.x0) / f.h;
  const k = tricube(u);
  if (k === 0) return 0;
  return wj * rwj * k * (f.c0 + u * (f.c1 + u * f.c2));
}
