/**
 * Solves D(x, q)^T u = g for u (length n - q) by forward recursion, for g in
 * the range of D^T (that is, g orthogonal to the polynomials of degree < q).
 * Uses D(x, q)^T = D1^T S_1 D1^T S_2 ... S_{q-1} D1^T (S_j = diag(j / (x_{i+j} - x_i))):
 * each D1^T is inverted by a running sum, each S_j by a division. O(n q).
 *
 * With g = W (y - b) this recovers the dual vector of a trend-filtering fit
 * (stationarity D^T u = W (y - b)); for b the weighted polynomial fit of
 * degree q - 1 it gives lambda_max = max |u|.
 *
 * @returns u and `inconsistency`: the largest unmatched equation of each
 *   level relative to the largest |g| (0 for g exactly in the range).
 * `work` (length >= n, optional) is used as work space instead of a new array.
 * Unchecked.
 */
export function dualFromResidual(x: Float64Array, q: number, g: ArrayLike<number>, work?: Float64Array): { u: Float64Array; inconsistency: number } {
  const n = x.length;
  // one buffer, updated in place level by level: entry i of a level depends on entries 0..i of
  // the level before, read before they are overwritten
  const v = work && work.length >= n ? work : new Float64Array(n);
  for (let i = 0; i < n; i++) v[i] = g[i];
  let gmax = 0;
  for (let i = 0; i < n; i++) gmax = Math.max(gmax, Math.abs(v[i]));
  let worst = 0;
  let len = n;
  for (let s = 1; s <= q; s++) {
    // invert D1^T: (D1^T z)_0 = -z_0, (D1^T z)_i = z_{i-1} - z_i, (D1^T z)_{len-1} = z_{len-2}
    // compensated running sum (A. Neumaier, ZAMM 54 (1974)): a plain one loses about
    // n eps of the partial sums' size at each level, which on long series of order 3
    // is more than the distance of u to the bound that the refinement must resolve
    let acc = 0, comp = 0;
    let zmax = 0;
    for (let i = 0; i < len - 1; i++) {
      const vi = v[i];
      const t = acc - vi;
      comp += Math.abs(acc) >= Math.abs(vi) ? (acc - t) - vi : (-vi - t) + acc;
      acc = t;
      const zi = acc + comp;
      v[i] = zi;
      zmax = Math.max(zmax, Math.abs(zi));
    }
    const miss = Math.abs(v[len - 2] - v[len - 1]);
    worst = Math.max(worst, miss / Math.max(gmax, zmax, 1e-300));
    len--;
    if (s < q) {
      // divide by S_s: entries s / (x_{i+s} - x_i)
      for (let i = 0; i < len; i++) v[i] *= (x[i + s] - x[i]) / s;
    }
  }
  return { u: v.slice(0, n - q), inconsistency: worst };
}
