/**
 * Poisson change-in-rate cost.
 */
import type { SegmentCost } from './segmentCost';

const { log } = Math;

/**
 * Builds the Poisson change-in-rate cost
 *
 *   C(s, t) = 2 (S - S log(S / W)),  S = sum w_i y_i,  W = sum w_i,  (0 when S = 0)
 *
 * twice the Poisson negative log-likelihood at the segment's rate S / W, up to the
 * constant sum log(y_i!) (Killick et al. 2012; Killick & Eckley 2014, J Stat Softw 58(3)).
 * Weights are case weights (a weight of 2 counts the row twice), not exposures.
 * Unchecked: y are non-negative integers, w > 0.
 *
 * @param y - counts
 * @param w - case weights
 * @example
 * ```ts
 * poissonCost(Float64Array.of(2, 2), Float64Array.of(1, 1)).cost(0, 2); // 2 (4 - 4 log 2)
 * ```
 */
export function poissonCost(y: Float64Array, w: Float64Array): SegmentCost {
  const n = y.length;
  const sw = new Float64Array(n + 1);
  const sy = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) {
    sw[i + 1] = sw[i] + w[i];
    sy[i + 1] = sy[i] + w[i] * y[i];
  }
  return {
    n,
    cost(s: number, t: number): number {
      const S = sy[t] - sy[s];
      if (!(S > 0)) return 0;
      return 2 * (S - S * log(S / (sw[t] - sw[s])));
    },
  };
}
