/** How far past the last interval the forward scan looks before falling back to bisection. */
const AHEAD = 16;

/**
 * The falling factorial interpolant of a trend-filtering fit (Y.-X. Wang,
 * A. Smola and R. J. Tibshirani, ICML 2014; R. J. Tibshirani, Ann. Statist.
 * 2014, section 4): the function f = sum_j alpha_j h_j in the falling factorial
 * basis of order k with f(x_i) = b_i. Between data points it is, for
 * x in (x_i, x_{i+1}], the degree-k polynomial through the k + 1 points
 * x_{j0} .. x_{j0+k}, j0 = max(0, i - k + 1) (the current right end and the
 * k points before it); below x_0 the polynomial through the first k + 1 points,
 * above x_{n-1} the one through the last k + 1 points (polynomial continuation
 * of degree k). Its k-th derivative is piecewise constant and jumps only at
 * the knots. For k = 0 it is the step function with value b_{i+1} on (x_i, x_{i+1}].
 *
 * @param x - data positions, strictly increasing (length n >= k + 1)
 * @param b - fitted values at x
 * @param k - order 0..3
 * @param t - where to evaluate (any order)
 * @returns values and a flag per point: 1 when t is outside [x_0, x_{n-1}]
 * @example
 * ```ts
 * interpolateTrend(Float64Array.of(0, 1, 2), Float64Array.of(0, 1, 0), 1, Float64Array.of(0.5, 3)); // values [0.5, -1]
 * ```
 * Unchecked.
 */
export function interpolateTrend(x: Float64Array, b: Float64Array, k: number, t: ArrayLike<number>): { value: Float64Array; extrapolated: Uint8Array } {
  const n = x.length;
  const value = new Float64Array(t.length);
  const extrapolated = new Uint8Array(t.length);
  const px = new Float64Array(k + 1);
  const py = new Float64Array(k + 1);
  let last = -1;
  for (let j = 0; j < t.length; j++) {
    const tj = t[j];
    if (Number.isNaN(tj)) { value[j] = NaN; continue; }
    let j0: number;
    if (tj <= x[0]) {
      if (tj < x[0]) extrapolated[j] = 1;
      j0 = 0;
      if (tj === x[0]) { value[j] = b[0]; continue; }
    } else if (tj > x[n - 1]) {
      extrapolated[j] = 1;
      j0 = n - 1 - k;
    } else {
      // largest i with x_i < tj: a few steps on from the last one when t increases (held-out points are
      // sorted, so a fold's evaluation is one sweep), else bisection
      let lo: number;
      if (last >= 0 && x[last] < tj && last + AHEAD < n && x[last + AHEAD] >= tj) {
        lo = last;
        while (x[lo + 1] < tj) lo++;
      } else {
        lo = 0;
        let hi = n - 1;
        while (hi - lo > 1) { const mid = (lo + hi) >> 1; if (x[mid] < tj) lo = mid; else hi = mid; }
      }
      last = lo;
      if (x[lo + 1] === tj) { value[j] = b[lo + 1]; continue; }
      j0 = Math.max(0, lo - k + 1);
    }
    // Neville's scheme on the k + 1 points
    for (let l = 0; l <= k; l++) { px[l] = x[j0 + l]; py[l] = b[j0 + l]; }
    for (let lev = 1; lev <= k; lev++) {
      for (let l = 0; l + lev <= k; l++) {
        py[l] = ((tj - px[l + lev]) * py[l] + (px[l] - tj) * py[l + 1]) / (px[l] - px[l + lev]);
      }
    }
    value[j] = py[0];
  }
  return { value, extrapolated };
}
