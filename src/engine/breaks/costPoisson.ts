/**
 * Poisson change-in-rate cost.
 */
import type { SegmentCost } from './segmentCost';

const { log } = Math;

/**
 * Builds the Poisson change-in-rate cost
 *
 *   C(s, t) = 2 (sum w_i y_i log y_i - S log(S / W)),  S = sum w_i y_i,  W = sum w_i e_i,
 *
 * the Poisson deviance of the segment at its rate S / W: twice the negative
 * log-likelihood (Killick et al. 2012; Killick & Eckley 2014, J Stat Softw 58(3)) minus
 * its value at the saturated model, a constant per point, so the optimal segmentation is
 * the same; the deviance form keeps the total cost small when one count is huge (a
 * likelihood near -1e157 would swallow every other segment's cost in rounding).
 * With exposures e_i (default 1) the rate of point i is lambda e_i: a known seasonal
 * factor multiplies the segment's rate (the usual Poisson offset).
 * Weights are case weights (a weight of 2 counts the row twice), not exposures.
 * Segment sums come from two sets of prefix sums, one for values up to 2^53 / n and
 * one for larger ones, so a single huge count (1e155) cannot wipe out the small counts
 * of every later segment by cancellation. Unchecked: y >= 0, w > 0.
 *
 * @param y - counts
 * @param w - case weights
 * @example
 * ```ts
 * poissonCost(Float64Array.of(1, 3), Float64Array.of(1, 1)).cost(0, 2); // 2 (3 log 3 - 4 log 2)
 * ```
 */
export function poissonCost(y: Float64Array, w: Float64Array, exposure?: Float64Array): SegmentCost {
  const n = y.length;
  const sw = new Float64Array(n + 1);
  const sy = new Float64Array(n + 1);
  const big = new Float64Array(n + 1);
  const syl = new Float64Array(n + 1);
  const bigl = new Float64Array(n + 1);
  const limit = 2 ** 53 / Math.max(1, n);
  for (let i = 0; i < n; i++) {
    sw[i + 1] = sw[i] + w[i] * (exposure ? exposure[i] : 1);
    const v = w[i] * y[i];
    sy[i + 1] = sy[i] + (v <= limit ? v : 0);
    big[i + 1] = big[i] + (v <= limit ? 0 : v);
    const vl = y[i] > 0 ? v * log(y[i]) : 0;
    syl[i + 1] = syl[i] + (v <= limit ? vl : 0);
    bigl[i + 1] = bigl[i] + (v <= limit ? 0 : vl);
  }
  return {
    n,
    cost(s: number, t: number): number {
      const S = (big[t] - big[s]) + (sy[t] - sy[s]);
      if (!(S > 0)) return 0;
      const L = (bigl[t] - bigl[s]) + (syl[t] - syl[s]);
      const c = 2 * (L - S * log(S / (sw[t] - sw[s])));
      return c > 0 ? c : 0;
    },
  };
}
