/**
 * PELT: exact optimal segmentation under a per-change penalty.
 */
import type { SegmentCost, Segmentation } from './segmentCost';

/** Module-level aliases: hot loops avoid global lookups (slow inside sandboxed contexts). */
const INF = 1 / 0;

/**
 * Pruned Exact Linear Time search (Killick, Fearnhead & Eckley 2012, "Optimal
 * detection of changepoints with a linear computational cost", JASA 107:1590-1598).
 *
 * Minimises  sum_{segments} C(segment) + beta * (number of changes)  exactly, by the
 * optimal-partitioning recursion F(t) = min_{s} F(s) + C(s, t) + beta, F(0) = -beta,
 * over candidates s kept by the pruning rule: s is dropped once
 * F(s) + C(s, t) >= F(t) (K = 0, valid for the subadditive costs of this folder).
 * With a minimum segment length m the drop takes effect only from t + m on (the
 * alternative path must itself end in a segment of m points), so the result stays
 * exact. Expected O(n) cost when changes are spread through the series; O(n^2)
 * worst case (no changes).
 *
 * Stopping rule: none needed; a single pass over the n points.
 *
 * @param cost - segment cost over n points
 * @param penalty - beta >= 0, on the cost's scale
 * @param minSegment - fewest points per segment (integer >= 1)
 * @param allowed - optional mask: a change may start at point s only when allowed[s] = 1 (e.g. not inside tied x)
 * @returns the optimal changes (first index of each new segment), costs and pruning diagnostics
 * @example
 * ```ts
 * const seg = pelt(meanCost(y, w, sigma, median), 2 * Math.log(y.length), 1);
 * seg.changes; // e.g. [28]
 * ```
 */
export function pelt(cost: SegmentCost, penalty: number, minSegment: number, allowed?: Uint8Array): Segmentation {
  const n = cost.n;
  const m = minSegment;
  const F = new Float64Array(n + 1).fill(INF);
  const last = new Int32Array(n + 1).fill(-1);
  F[0] = -penalty;
  let cand: Int32Array = new Int32Array(16);
  let die: Float64Array = new Float64Array(16);
  let nc = 1;
  cand[0] = 0;
  die[0] = INF;
  const segCost = new Float64Array(n + 1);
  let evaluations = 0;
  let maxCandidates = 1;
  let sumCandidates = 0;
  for (let t = 1; t <= n; t++) {
    // drop candidates whose pruning has taken effect
    let k = 0;
    for (let i = 0; i < nc; i++) if (die[i] > t) { cand[k] = cand[i]; die[k] = die[i]; k++; }
    nc = k;
    let best = INF;
    let arg = -1;
    for (let i = 0; i < nc; i++) {
      const s = cand[i];
      const c = cost.cost(s, t);
      segCost[i] = c;
      if (t - s >= m) {
        const v = F[s] + c + penalty;
        if (v < best) { best = v; arg = s; }
      }
    }
    evaluations += nc;
    sumCandidates += nc;
    if (nc > maxCandidates) maxCandidates = nc;
    F[t] = best;
    last[t] = arg;
    if (t === n || arg < 0) continue;
    const canChange = !allowed || allowed[t] === 1;
    if (canChange) {
      // pruning: s cannot be the last change of any optimal path ending at u >= t + m
      for (let i = 0; i < nc; i++) {
        if (die[i] === INF && F[cand[i]] + segCost[i] >= best) die[i] = t + m;
      }
      if (nc === cand.length) {
        const c2 = new Int32Array(nc * 2); c2.set(cand); cand = c2;
        const d2 = new Float64Array(nc * 2); d2.set(die); die = d2;
      }
      cand[nc] = t;
      die[nc] = INF;
      nc++;
    }
  }
  return finish(cost, F, last, penalty, evaluations, maxCandidates, sumCandidates / n);
}

/** Backtracks the change indices from the `last` array. Unchecked. */
export function finish(cost: SegmentCost, F: Float64Array, last: Int32Array, penalty: number, evaluations: number, maxCandidates: number, meanCandidates: number): Segmentation {
  const n = cost.n;
  const changes: number[] = [];
  let t = n;
  while (t > 0) {
    const s = last[t];
    if (s > 0) changes.push(s);
    t = s;
  }
  changes.reverse();
  let total = 0;
  let s = 0;
  for (const c of changes) { total += cost.cost(s, c); s = c; }
  total += cost.cost(s, n);
  return { changes, cost: total, penalisedCost: F[n], evaluations, maxCandidates, meanCandidates };
}
