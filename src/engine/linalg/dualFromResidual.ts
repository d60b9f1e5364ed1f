import { FIRST_CALL_POINTS } from './firstCallPoints';

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
 * n - q, optional) receives u instead of a new array. For q = 2, 3 and 4 (orders 1 to 3, every
 * round of the active-set methods) all levels run in one pass with the same operations in the same
 * order (identical results; {@link residualDualOnePass}): each level's running sum is a pair of
 * locals, and the levels' chains of additions overlap. Measured at n = 1e4, q = 4: 0.13 to 0.19 ms a
 * call level by level against about 0.1 ms in one pass. Carrying every level through one pass for
 * any q with the running sums in small arrays indexed by level was measured too (identical
 * results), and was 1.6 to 2 times slower than the level-by-level loops, which stay for other q and
 * very short x.
 * Unchecked.
 */
export function dualFromResidual(x: Float64Array, q: number, g: Float64Array, work?: Float64Array, out?: Float64Array): { u: Float64Array; inconsistency: number } {
  const n = x.length;
  if (q >= 2 && q <= 4 && n >= q + 2) {
    // g as the residual of y = g, w = 1, b = 0: 1 * (g - 0) is g exactly (the kernel's sums of squares are not used)
    return residualDualOnePass(x, q, g, new Float64Array(n).fill(1), new Float64Array(n), out && out.length === n - q ? out : new Float64Array(n - q), true);
  }
  return dualFromResidualByLevel(x, q, g, work, out);
}

/** Result of {@link residualDual}. */
export interface ResidualDual {
  /** u with D(x, q)^T u = W (y - b), length n - q. */
  u: Float64Array;
  /** 1/2 sum w (y - b)^2. */
  rss: number;
  /** y . W (y - b). */
  yg: number;
}

/**
 * The dual of a fit b from its residual, u with D(x, q)^T u = W (y - b) ({@link dualFromResidual}),
 * together with the sums an active-set round's certificate needs, rss = 1/2 sum w (y - b)^2 and
 * yg = y . W (y - b), in one pass over the points for q = 2 to 4 (orders 1 to 3): each point's
 * residual is formed where the running sums read it, instead of a pass that writes W (y - b) and a
 * second that reads it. The same operations in the same order as those two passes (identical u and
 * sums). `out` (length n - q, optional) receives u. Unlike {@link dualFromResidual} it does not
 * measure how far W (y - b) is from the range of D^T (the active-set rounds that call it on every
 * round never read that): without the largest |g| and each level's largest |sum| kept in the pass,
 * a call took 0.78 to 0.81 of the time at n = 1e4 (orders 1 and 3, same results).
 *
 * @example
 * ```ts
 * const { u, rss } = residualDual(x, 2, y, w, fitted); // order 1: D(x, 2)^T u = W (y - fitted)
 * ```
 * Unchecked.
 */
export function residualDual(x: Float64Array, q: number, y: Float64Array, w: Float64Array, b: Float64Array, out?: Float64Array): ResidualDual {
  const n = x.length;
  const u = out && out.length === n - q ? out : new Float64Array(n - q);
  if (q >= 2 && q <= 4 && n >= q + 2) {
    const { rss, yg } = residualDualOnePass(x, q, y, w, b, u, false);
    return { u, rss, yg };
  }
  const g = new Float64Array(n);
  let rss = 0, yg = 0;
  for (let i = 0; i < n; i++) {
    const ri = y[i] - b[i], gi = w[i] * ri;
    g[i] = gi;
    rss += 0.5 * w[i] * ri * ri; yg += y[i] * gi;
  }
  const d = dualFromResidualByLevel(x, q, g, undefined, u);
  return { u: d.u, rss, yg };
}

/**
 * {@link dualFromResidual} level by level, for any q: the reference of the one-pass kernels (the
 * same operations in the same order; its tests compare them bit for bit). Unchecked.
 */
export function dualFromResidualByLevel(x: Float64Array, q: number, g: ArrayLike<number>, work?: Float64Array, out?: Float64Array): { u: Float64Array; inconsistency: number } {
  const n = x.length;
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
 * {@link residualDual} for q = 2, 3 and 4 in one pass (n >= q + 2). At point i, level 1's entry
 * (the compensated running sum of -g, g_i = w_i (y_i - b_i) formed as it is read) times
 * (x_{i+1} - x_i) / 1 feeds level 2's running sum, whose entry times (x_{i+2} - x_i) / 2 feeds level
 * 3's, and so on up to level q, whose entries are u. Level s has entries 0 .. n - s - 1, and its
 * unmatched equation compares its last sum with its next input (at i = n - s). Each level is written
 * out with its sums in locals, the same operations in the same order as the level-by-level loops; q
 * only decides where the chain stops.
 *
 * The pass runs in two calls of {@link onePassRows}, the first over a few points: in a fresh process
 * a long loop's first compiled code is made while the loop runs, and code that had not yet run (here
 * the saving of the sums after the loop) then has no type information; Node's engine kept entering
 * that code and throwing it away on later calls (up to 1,290 times in one cross-validation of order 1 at
 * 1e4). After a short first call every statement has run before the loop is long. With `measure`
 * false the largest |g| and the levels' largest |sums| are not kept and the inconsistency is NaN
 * ({@link residualDual} drops it). Unchecked.
 */
function residualDualOnePass(x: Float64Array, q: number, y: Float64Array, w: Float64Array, b: Float64Array, u: Float64Array, measure: boolean): ResidualDual & { inconsistency: number } {
  const n = x.length;
  const st = new Float64Array(ONE_PASS_STATE);
  const head = Math.min(n - 1, FIRST_CALL_POINTS);
  onePassRows(x, q, y, w, b, u, 0, head, st, measure);
  onePassRows(x, q, y, w, b, u, head, n - 1, st, measure);
  // the last point's residual (its sums; level 1's unmatched equation reads it)
  const rl = y[n - 1] - b[n - 1], gl = w[n - 1] * rl;
  const rss = st[20] + 0.5 * w[n - 1] * rl * rl, yg = st[21] + y[n - 1] * gl;
  if (!measure) return { u, inconsistency: NaN, rss, yg };
  let gmax = st[0];
  { const ag = Math.abs(gl); if (ag > gmax) gmax = ag; }
  let worst = Math.max(0, Math.abs(st[13] - gl) / Math.max(gmax, st[9], 1e-300));
  worst = Math.max(worst, Math.abs(st[14] - st[17]) / Math.max(gmax, st[10], 1e-300));
  if (q >= 3) worst = Math.max(worst, Math.abs(st[15] - st[18]) / Math.max(gmax, st[11], 1e-300));
  if (q >= 4) worst = Math.max(worst, Math.abs(st[16] - st[19]) / Math.max(gmax, st[12], 1e-300));
  return { u, inconsistency: worst, rss, yg };
}

/**
 * Entries of the state of {@link onePassRows}: gmax; acc1, comp1 .. acc4, comp4; zmax1 .. zmax4;
 * z1 .. z4; last2 .. last4; rss, yg.
 */
const ONE_PASS_STATE = 22;

/**
 * Points from .. to - 1 of {@link residualDualOnePass}, its running sums read from `st` before
 * the loop and written back after it; the largest |g| and |sum| of each level only with `measure`
 * (a test the same at every point, so well predicted: as fast as a loop without the comparisons).
 * Unchecked.
 */
function onePassRows(x: Float64Array, q: number, y: Float64Array, w: Float64Array, b: Float64Array, u: Float64Array, from: number, to: number, st: Float64Array, measure: boolean): void {
  const n = x.length;
  // the largest |g| and each level's largest |sum| are kept by comparisons (the same values as
  // Math.max of |.|, which compiles to a slower sequence; NaN reaches the result through the sums)
  let gmax = st[0];
  let acc1 = st[1], comp1 = st[2], acc2 = st[3], comp2 = st[4], acc3 = st[5], comp3 = st[6], acc4 = st[7], comp4 = st[8];
  let zmax1 = st[9], zmax2 = st[10], zmax3 = st[11], zmax4 = st[12], z1 = st[13], z2 = st[14], z3 = st[15], z4 = st[16];
  let last2 = st[17], last3 = st[18], last4 = st[19], rss = st[20], yg = st[21];
  for (let i = from; i < to; i++) {
    const ri = y[i] - b[i], wi = w[i], a1 = wi * ri;
    rss += 0.5 * wi * ri * ri; yg += y[i] * a1;
    if (measure) { const ag = Math.abs(a1); if (ag > gmax) gmax = ag; }
    const t1 = acc1 - a1;
    comp1 += Math.abs(acc1) >= Math.abs(a1) ? (acc1 - t1) - a1 : (-a1 - t1) + acc1;
    acc1 = t1;
    z1 = acc1 + comp1;
    if (measure) { const az = Math.abs(z1); if (az > zmax1) zmax1 = az; }
    const a2 = z1 * ((x[i + 1] - x[i]) / 1);
    if (i === n - 2) { last2 = a2; break; }
    const t2 = acc2 - a2;
    comp2 += Math.abs(acc2) >= Math.abs(a2) ? (acc2 - t2) - a2 : (-a2 - t2) + acc2;
    acc2 = t2;
    z2 = acc2 + comp2;
    if (measure) { const az = Math.abs(z2); if (az > zmax2) zmax2 = az; }
    if (q === 2) { u[i] = z2; continue; }
    const a3 = z2 * ((x[i + 2] - x[i]) / 2);
    if (i === n - 3) { last3 = a3; continue; }
    const t3 = acc3 - a3;
    comp3 += Math.abs(acc3) >= Math.abs(a3) ? (acc3 - t3) - a3 : (-a3 - t3) + acc3;
    acc3 = t3;
    z3 = acc3 + comp3;
    if (measure) { const az = Math.abs(z3); if (az > zmax3) zmax3 = az; }
    if (q === 3) { u[i] = z3; continue; }
    const a4 = z3 * ((x[i + 3] - x[i]) / 3);
    if (i === n - 4) { last4 = a4; continue; }
    const t4 = acc4 - a4;
    comp4 += Math.abs(acc4) >= Math.abs(a4) ? (acc4 - t4) - a4 : (-a4 - t4) + acc4;
    acc4 = t4;
    z4 = acc4 + comp4;
    if (measure) { const az = Math.abs(z4); if (az > zmax4) zmax4 = az; }
    u[i] = z4;
  }
  st[0] = gmax;
  st[1] = acc1; st[2] = comp1; st[3] = acc2; st[4] = comp2; st[5] = acc3; st[6] = comp3; st[7] = acc4; st[8] = comp4;
  st[9] = zmax1; st[10] = zmax2; st[11] = zmax3; st[12] = zmax4; st[13] = z1; st[14] = z2; st[15] = z3; st[16] = z4;
  st[17] = last2; st[18] = last3; st[19] = last4; st[20] = rss; st[21] = yg;
}
