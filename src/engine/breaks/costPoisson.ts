/**
 * Poisson change-in-rate cost.
 */
import type { SegmentCost } from './segmentCost';

const { log } = Math;

/**
 * Builds the Poisson change-in-rate cost
 *
 *   C(s, t) = 2 (S - S log(S / W)),  S = sum w_i y_i,  W = sum w_i e_i,  (0 when S = 0)
 *
 * twice the Poisson negative log-likelihood at the segment's rate S / W, up to the
 * constant sum log(y_i!) (Killick et al. 2012; Killick & Eckley 2014, J Stat Softw 58(3)).
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
 * poissonCost(Float64Array.of(2, 2), Float64Array.of(1, 1)).cost(0, 2); // 2 (4 - 4 log 2)
 * ```
 */
export function poissonCost(y: Float64Array, w: Float64Array, exposure?: Float64Array): SegmentCost {
  const n = y.length;
  const sw = new Float64Array(n + 1);
  const sy = new Float64Array(n + 1);
  const big = new Float64Array(n + 1);
  const limit = 2 ** 53 / Math.max(1, n);
  for (let i = 0; i < n; i++) {
    sw[i + 1] = sw[i] + w[i] * (exposure ? exposure[i] : 1);
    const v = w[i] * y[i];
    sy[i + 1] = sy[i] + (v <= limit ? v : 0);
    big[i + 1] = big[i] + (v <= limit ? 0 : v);
  }
  return {
    n,
    cost(s: number, t: number): number {
      const S = (big[t] - big[s]) + (sy[t] - sy[s]);
      if (!(S > 0)) return 0;
      return 2 * (S - S * log(S / (sw[t] - sw[s])));
    },
  };
}
