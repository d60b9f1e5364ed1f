/**
 * Bounds that let CPOP discard fitted values no optimal broken line can take.
 */

const INF = 1 / 0;

/**
 * Lower bounds on the penalised cost of every suffix, from a relaxation: drop the
 * continuity constraint, so each segment gets its own free least-squares line.
 *
 *   G(t) = min over partitions of points t+1..n-1 into b >= 1 groups of
 *          sum_groups RSS_line(group) + beta * b,   G(n - 1) = 0,
 *
 * computed by PELT (Killick et al. 2012) run backwards (the free-line cost is a
 * minimum over parameters, so pruning with K = 0 is exact). Any continuous broken
 * line's points after t split the same way with lines through fewer free
 * parameters, so its cost after t is at least G(t). Running sums are kept per
 * candidate relative to its own x (no cancellation grows along the series).
 * Also returns the relaxation's group starts (forward indices), a good kink set
 * for a feasible fit. O(n * candidates). Unchecked: x strictly increasing.
 *
 * @param x - positions, y - weighted mean at each, w - weights, wyy - sum w y^2 at each
 * @param penalty - beta
 * @example
 * ```ts
 * const { lower, starts } = suffixLowerBound(x, y, w, wyy, beta);
 * ```
 */
export function suffixLowerBound(x: Float64Array, y: Float64Array, w: Float64Array, wyy: Float64Array, penalty: number): { lower: Float64Array; starts: number[] } {
  const n = x.length;
  const lower = new Float64Array(n);
  if (n < 2) return { lower, starts: [] };
  const m = n - 1; // reversed series r = 0..m-1 is original point n-1-r
  const F = new Float64Array(m + 1).fill(INF);
  const last = new Int32Array(m + 1).fill(-1);
  F[0] = -penalty;
  let cand: Int32Array = new Int32Array(16);
  let nc = 1;
  cand[0] = 0;
  // per candidate (reversed start r0): sums over reversed points r0..r-1, d = x(r0) - x(point)
  const sW = new Float64Array(m + 1), sD = new Float64Array(m + 1), sDD = new Float64Array(m + 1);
  const sY = new Float64Array(m + 1), sDY = new Float64Array(m + 1), sYY = new Float64Array(m + 1);
  const segCost = new Float64Array(16);
  let seg: Float64Array = segCost;
  for (let r = 1; r <= m; r++) {
    const i = n - r; // original index of reversed point r - 1
    const wi = w[i], wy = w[i] * y[i];
    let best = INF, arg = -1;
    if (seg.length < nc) seg = new Float64Array(2 * nc);
    for (let c = 0; c < nc; c++) {
      const r0 = cand[c];
      const d = x[n - 1 - r0] - x[i];
      sW[r0] += wi; sD[r0] += wi * d; sDD[r0] += wi * d * d;
      sY[r0] += wy; sDY[r0] += wy * d; sYY[r0] += wyy[i];
      const W = sW[r0];
      const cdd = sDD[r0] - (sD[r0] * sD[r0]) / W;
      const cdy = sDY[r0] - (sD[r0] * sY[r0]) / W;
      let rss = sYY[r0] - (sY[r0] * sY[r0]) / W;
      if (cdd > 1e-14 * sDD[r0]) rss -= (cdy * cdy) / cdd;
      if (rss < 0) rss = 0;
      seg[c] = rss;
      const v = F[r0] + rss + penalty;
      if (v < best) { best = v; arg = r0; }
    }
    F[r] = best;
    last[r] = arg;
    let k = 0;
    for (let c = 0; c < nc; c++) if (F[cand[c]] + seg[c] < best) cand[k++] = cand[c];
    nc = k;
    if (nc === cand.length) { const a = new Int32Array(2 * nc); a.set(cand); cand = a; }
    cand[nc++] = r;
  }
  for (let t = 0; t < n - 1; t++) lower[t] = F[n - 1 - t] + penalty;
  lower[n - 1] = 0;
  // group boundaries of the full relaxation (points 1..n-1), as forward start indices
  const starts: number[] = [];
  let r = m;
  while (r > 0) {
    const r0 = last[r];
    // reversed group r0..r-1 = original points n-r..n-1-r0; its forward start is n - r
    if (r0 > 0) starts.push(n - r0);
    r = r0;
  }
  starts.sort((a, b) => a - b);
  return { lower, starts };
}

/**
 * Least-squares continuous broken line with knots at the given point indices
 * (first and last point included): the knot values solve a symmetric positive
 * definite tridiagonal system (each point's fitted value mixes its two
 * neighbouring knots), solved by the Thomas algorithm in O(n).
 * Returns the knot values and the residual sum of squares. Unchecked: knots
 * increasing from 0 to n - 1, x strictly increasing.
 *
 * @example
 * ```ts
 * brokenLineFit(x, y, w, wyy, [0, 40, n - 1]).rss;
 * ```
 */
export function brokenLineFit(x: Float64Array, y: Float64Array, w: Float64Array, wyy: Float64Array, knots: readonly number[]): { values: Float64Array; rss: number } {
  const k = knots.length;
  const diag = new Float64Array(k), off = new Float64Array(k), rhs = new Float64Array(k);
  diag[0] += w[0]; rhs[0] += w[0] * y[0];
  for (let j = 0; j + 1 < k; j++) {
    const a = knots[j], b = knots[j + 1], L = x[b] - x[a];
    for (let i = a + 1; i <= b; i++) {
      const u = (x[i] - x[a]) / L, v = 1 - u;
      diag[j] += w[i] * v * v; diag[j + 1] += w[i] * u * u; off[j] += w[i] * u * v;
      rhs[j] += w[i] * v * y[i]; rhs[j + 1] += w[i] * u * y[i];
    }
  }
  // Thomas algorithm
  const cp = new Float64Array(k), dp = new Float64Array(k);
  cp[0] = off[0] / diag[0]; dp[0] = rhs[0] / diag[0];
  for (let j = 1; j < k; j++) {
    const den = diag[j] - off[j - 1] * cp[j - 1];
    cp[j] = off[j] / den;
    dp[j] = (rhs[j] - off[j - 1] * dp[j - 1]) / den;
  }
  const values = new Float64Array(k);
  values[k - 1] = dp[k - 1];
  for (let j = k - 2; j >= 0; j--) values[j] = dp[j] - cp[j] * values[j + 1];
  return { values, rss: brokenLineRss(x, y, w, wyy, knots, values) };
}

/**
 * sum_i w_i (y_i - f(x_i))^2 for the broken line f through (x[knots[j]], values[j]),
 * from the merged sums (w, weighted mean y, sum w y^2 per position), at least 0.
 * Unchecked: knots start at 0 and end at n - 1.
 */
export function brokenLineRss(x: Float64Array, y: Float64Array, w: Float64Array, wyy: Float64Array, knots: readonly number[], values: ArrayLike<number>): number {
  let rss = wyy[0] - 2 * values[0] * w[0] * y[0] + w[0] * values[0] * values[0];
  for (let j = 0; j + 1 < knots.length; j++) {
    const a = knots[j], b = knots[j + 1], L = x[b] - x[a];
    for (let i = a + 1; i <= b; i++) {
      const u = (x[i] - x[a]) / L;
      const f = values[j] + u * (values[j + 1] - values[j]);
      rss += wyy[i] - 2 * f * w[i] * y[i] + w[i] * f * f;
    }
  }
  return rss > 0 ? rss : 0;
}
