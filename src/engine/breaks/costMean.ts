/**
 * Gaussian change-in-mean cost with a common known variance.
 */
import { standardisedSums, type SegmentCost } from './segmentCost';

/**
 * Builds the change-in-mean cost
 *
 *   C(s, t) = sum_{i in [s,t)} w_i (y_i - ybar_w)^2 / sigma^2,
 *
 * twice the Gaussian negative log-likelihood with known sigma, up to a constant.
 * Weights are case weights. Data are centred at `centre` and divided by `sigma`
 * before the cumulative sums are formed, so the cost is on the scale the BIC
 * penalty expects. Unchecked: y finite, w > 0, sigma > 0.
 *
 * @param y - values (y units)
 * @param w - case weights
 * @param sigma - noise standard deviation (y units)
 * @param centre - a central value of y (e.g. the median), subtracted to limit cancellation
 * @example
 * ```ts
 * const c = meanCost(Float64Array.of(1, 1, 5, 5), new Float64Array(4).fill(1), 1, 3);
 * c.cost(0, 4); // 16
 * ```
 */
export function meanCost(y: Float64Array, w: Float64Array, sigma: number, centre: number): SegmentCost {
  const sums = standardisedSums(y, w, centre, sigma);
  const { w: sw, s1, s2 } = sums;
  return {
    n: y.length,
    squaredErrorSums: sums,
    cost(s: number, t: number): number {
      const a = s1[t] - s1[s];
      const v = s2[t] - s2[s] - (a * a) / (sw[t] - sw[s]);
      return v > 0 ? v : 0;
    },
  };
}
