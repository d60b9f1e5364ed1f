/**
 * Gaussian change-in-mean-and-variance cost.
 */
import { standardisedSums, type SegmentCost } from './segmentCost';

const { log } = Math;

/** Variance floor of {@link meanVarCost}, relative to the variance of the whole series. */
export const MEANVAR_FLOOR = 1e-8;

/**
 * Builds the change-in-mean-and-variance cost
 *
 *   C(s, t) = W (log s2 + v / s2),  v = weighted variance of the segment about its mean,
 *   s2 = max(v, floor),  W = sum of weights,
 *
 * which is twice the Gaussian negative log-likelihood minimised over the mean
 * and over variances >= floor, up to a constant (the form of Killick et al. 2012
 * with an explicit floor). The floor guards segments of (near-)equal values,
 * whose variance 0 would give cost -infinity: floor = {@link MEANVAR_FLOOR} times
 * the variance of the whole series, after the data are standardised. Because the
 * floored cost is still a minimum over parameters, PELT's pruning stays exact.
 * Weights are case weights. Unchecked: y finite, w > 0, scale > 0.
 *
 * @param y - values
 * @param w - case weights
 * @param centre - subtracted before the sums (e.g. the mean)
 * @param scale - divided out before the sums (e.g. the standard deviation), so floor is relative
 * @param floorVariance - variance floor on the standardised scale (at least {@link MEANVAR_FLOOR}), e.g. the rounding variance (q / scale)^2 / 12 of data recorded at resolution q
 * @returns the cost and `floored(s, t)`, true when a segment's variance was raised to the floor
 * @example
 * ```ts
 * const c = meanVarCost(y, w, mean, sd);
 * c.cost(0, y.length);
 * ```
 */
export function meanVarCost(y: Float64Array, w: Float64Array, centre: number, scale: number, floorVariance = MEANVAR_FLOOR): SegmentCost & { floored(s: number, t: number): boolean } {
  const { w: sw, s1, s2 } = standardisedSums(y, w, centre, scale);
  const floor = Math.max(MEANVAR_FLOOR, floorVariance);
  const variance = (s: number, t: number): number => {
    const W = sw[t] - sw[s];
    const a = s1[t] - s1[s];
    const v = (s2[t] - s2[s] - (a * a) / W) / W;
    return v > 0 ? v : 0;
  };
  return {
    n: y.length,
    cost(s: number, t: number): number {
      const v = variance(s, t);
      const s2f = v > floor ? v : floor;
      return (sw[t] - sw[s]) * (log(s2f) + v / s2f);
    },
    floored(s: number, t: number): boolean { return variance(s, t) <= floor; },
  };
}
