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
 * `work` (length >= n, optional) is used as work space instead of a new array; `out` (length
 * n - q, optional) receives u instead of a new array. For q = 2 (order 1, the most frequent call
 * of the active-set methods) both levels run in one pass with the same operations in the same
 * order (identical results, half the time). Carrying every level through one pass for any q was
 * measured too (identical results), and was 1.6 to 2 times slower than these loops: its running
 * sums live in small arrays indexed by level instead of in registers.
 * Unchecked.
 */
export function dualFromResidual(x: Float64Array, q: number, g: ArrayLike<number>, work?: Float64Array, out?: Float64Array): { u: Float64Array; inconsistency: number } {
  const n = x.length;
  if (q === 2 && n >= 3) return dualFromResidual2(x, g, out);
  // one buffer, updated in place level by level: entry i of a level depends on entries 0..i of
  // the level before, read before they are overwritten
  const v = work && work.length >= n ? work : new Float64Array(n);
  let gmax = 0;
  for (let i = 0; i < n; i++) { const gi = g[i]; v[i] = gi; gmax = Math.max(gmax, gi < 0 ? -gi : gi); }
  let worst = 0;
  let len = n;
  for (let s = 1; s <= q; s++) {
    // invert D1^T: (D1^T z)_0 = -z_0, (D1^T z)_i = z_{i-1} - z_i, (D1^T z)_{len-1} = z_{len-2}
    // compensated running sum (A. Neumaier, ZAMM 54 (1974)): a plain one loses about
    // n eps of the partial sums' size at each level, which on long series of order 3
    // is more than the distance of u to the bound that the refinement must resolve.
    // From the second level on, each entry is first divided by S_{s-1} (times (x_{i+s-1} - x_i) / (s - 1)),
    // as it is read: the same products as a pass of its own, one pass fewer
    const sp = s - 1;
    if (sp > 0) v[len - 1] *= (x[len - 1 + sp] - x[len - 1]) / sp;
    const zmax = compensatedLevel(x, v, len, sp);
    const miss = Math.abs(v[len - 2] - v[len - 1]);
    worst = Math.max(worst, miss / Math.max(gmax, zmax, 1e-300));
    len--;
  }
  if (out && out.length === n - q) {
    out.set(v.subarray(0, n - q));
    return { u: out, inconsistency: worst };
  }
  return { u: v.slice(0, n - q), inconsistency: worst };
}

/**
 * One level of {@link dualFromResidual} in place (its own function, so that the first call's
 * compiler works on a small body): entries 0 .. len - 2 of v become the compensated running sums of
 * -v (A. Neumaier, ZAMM 54 (1974)), each entry first multiplied by (x_{i+sp} - x_i) / sp when sp > 0;
 * returns the largest |sum|. Unchecked.
 */
function compensatedLevel(x: Float64Array, v: Float64Array, len: number, sp: number): number {
  let acc = 0, comp = 0;
  let zmax = 0;
  for (let i = 0; i < len - 1; i++) {
    const vi = sp > 0 ? (v[i] *= (x[i + sp] - x[i]) / sp) : v[i];
    const t = acc - vi;
    // |.| written out (the same values as Math.abs, NaN included), the loop's cost where global lookups are slow
    comp += (acc < 0 ? -acc : acc) >= (vi < 0 ? -vi : vi) ? (acc - t) - vi : (-vi - t) + acc;
    acc = t;
    const zi = acc + comp;
    v[i] = zi;
    zmax = Math.max(zmax, zi < 0 ? -zi : zi);
  }
  return zmax;
}

/**
 * {@link dualFromResidual} for q = 2 in one pass: level 1's entry i (the compensated running sum
 * of -g, times x_{i+1} - x_i) feeds level 2's running sum at once. Unchecked.
 */
function dualFromResidual2(x: Float64Array, g: ArrayLike<number>, out?: Float64Array): { u: Float64Array; inconsistency: number } {
  const n = x.length;
  const u = out && out.length === n - 2 ? out : new Float64Array(n - 2);
  let gmax = 0;
  for (let i = 0; i < n; i++) gmax = Math.max(gmax, Math.abs(g[i]));
  let acc1 = 0, comp1 = 0, acc2 = 0, comp2 = 0, zmax1 = 0, zmax2 = 0;
  let z1 = 0, s1 = 0, z2 = 0;
  for (let i = 0; i < n - 1; i++) {
    // level 1: z1_i = -(g_0 + .. + g_i), compensated, then times x_{i+1} - x_i (divided by S_1)
    const v = g[i];
    const t = acc1 - v;
    comp1 += Math.abs(acc1) >= Math.abs(v) ? (acc1 - t) - v : (-v - t) + acc1;
    acc1 = t;
    z1 = acc1 + comp1;
    zmax1 = Math.max(zmax1, Math.abs(z1));
    s1 = z1 * (x[i + 1] - x[i]);
    // level 2 has one entry fewer: u_i = -(s1_0 + .. + s1_i), compensated, for i < n - 2
    if (i === n - 2) break;
    const t2 = acc2 - s1;
    comp2 += Math.abs(acc2) >= Math.abs(s1) ? (acc2 - t2) - s1 : (-s1 - t2) + acc2;
    acc2 = t2;
    z2 = acc2 + comp2;
    u[i] = z2;
    zmax2 = Math.max(zmax2, Math.abs(z2));
  }
  // the unmatched equation of each level: its last running sum against the next input
  const miss1 = Math.abs(z1 - g[n - 1]) / Math.max(gmax, zmax1, 1e-300);
  const miss2 = Math.abs(z2 - s1) / Math.max(gmax, zmax2, 1e-300);
  return { u, inconsistency: Math.max(miss1, miss2) };
}
