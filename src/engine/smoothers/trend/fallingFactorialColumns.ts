/**
 * Columns of the falling factorial basis of order k (Y.-X. Wang, A. Smola and
 * R. J. Tibshirani, "The falling factorial basis and its statistical
 * applications", ICML 2014), evaluated at the data, for a chosen set of knot rows:
 *
 *   h_d(x) = prod_{l < d} (x - x_l),                       d = 0 .. k (polynomials),
 *   g_r(x) = prod_{l = r+1}^{r+k} (x - x_l) * 1{x > x_{r+k}},  for each knot row r,
 *
 * (0-based points; row r of D(x, k+1) sits at the knot x_{r+k}); a knot in the
 * left half of the range uses g_r - P_r = -P_r(x) 1{x <= x_{r+k}} instead, where
 * P_r is the polynomial factor (same span, shorter support, better conditioned). D(x, k+1)
 * annihilates the h_d and maps g_r to a multiple of the r-th unit vector, so
 * these columns span exactly {b : (D b)_j = 0 for every row j not in the set}.
 * x should be scaled to [0, 1] so that the products stay below 1.
 *
 * @returns column-major n x (k + 1 + rows.length) array
 * Unchecked.
 */
export function fallingFactorialColumns(x: Float64Array, k: number, knotRows: ArrayLike<number>): Float64Array {
  const n = x.length;
  const p = k + 1 + knotRows.length;
  const h = new Float64Array(n * p);
  for (let d = 0; d <= k; d++) {
    const o = d * n;
    for (let i = 0; i < n; i++) {
      let v = 1;
      for (let l = 0; l < d; l++) v *= x[i] - x[l];
      h[o + i] = v;
    }
  }
  const mid = 0.5 * (x[0] + x[n - 1]);
  for (let c = 0; c < knotRows.length; c++) {
    const r = knotRows[c];
    const o = (k + 1 + c) * n;
    // knots in the left half use the left-sided twin g_r - P_r = -P_r(x) 1{x <= x_{r+k}}
    // (P_r the polynomial factor, in the span of the h_d): the same span, with the
    // shorter support, which keeps the columns far from the polynomials
    const left = x[r + k] < mid;
    const i0 = left ? 0 : r + k + 1;
    const i1 = left ? r + k : n - 1;
    for (let i = i0; i <= i1; i++) {
      let v = left ? -1 : 1;
      for (let l = r + 1; l <= r + k; l++) v *= x[i] - x[l];
      h[o + i] = v;
    }
  }
  return h;
}
