/**
 * Exhaustive optimal partitioning: the O(n^2) reference for PELT.
 */
import type { SegmentCost, Segmentation } from './segmentCost';
import { finish } from './pelt';

/** Module-level aliases: hot loops avoid global lookups (slow inside sandboxed contexts). */
const INF = 1 / 0;

/**
 * Optimal partitioning (Jackson et al. 2005, "An algorithm for optimal partitioning
 * of data on an interval", IEEE Signal Processing Letters 12:105-108):
 *
 *   F(0) = -beta,  F(t) = min_{0 <= s <= t - m} F(s) + C(s, t) + beta,
 *
 * over every s, without pruning. Exact, O(n^2) cost evaluations; use it as the
 * reference {@link pelt} must match, or for small n. Ties go to the smallest s,
 * as in {@link pelt}.
 *
 * Stopping rule: none needed; a single pass over the n points.
 *
 * @param cost - segment cost over n points
 * @param penalty - beta >= 0
 * @param minSegment - fewest points per segment (integer >= 1)
 * @param allowed - optional mask of points where a change may start
 * @example
 * ```ts
 * optimalPartitioning(meanCost(y, w, 1, 0), 2 * Math.log(y.length), 1).changes;
 * ```
 */
export function optimalPartitioning(cost: SegmentCost, penalty: number, minSegment: number, allowed?: Uint8Array): Segmentation {
  const n = cost.n;
  const F = new Float64Array(n + 1).fill(INF);
  const last = new Int32Array(n + 1).fill(-1);
  F[0] = -penalty;
  let evaluations = 0;
  for (let t = 1; t <= n; t++) {
    let best = INF;
    let arg = -1;
    for (let s = 0; s <= t - minSegment; s++) {
      if (s > 0 && allowed && allowed[s] !== 1) continue;
      if (F[s] === INF) continue;
      evaluations++;
      const v = F[s] + cost.cost(s, t) + penalty;
      if (v < best) { best = v; arg = s; }
    }
    F[t] = best;
    last[t] = arg;
  }
  return finish(cost, F, last, penalty, evaluations, n, (n + 1) / 2);
}
