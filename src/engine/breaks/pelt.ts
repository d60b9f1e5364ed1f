/**
 * PELT: exact optimal segmentation under a per-change penalty.
 */
import { totalCost, type SegmentCost, type Segmentation } from './segmentCost';

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
  if (cost.squaredErrorSums && minSegment === 1) return peltSquaredError(cost, penalty, allowed);
  const n = cost.n;
  const m = minSegment;
  const F = new Float64Array(n + 1).fill(INF);
  const last = new Int32Array(n + 1).fill(-1);
  F[0] = -penalty;
  let cand: Int32Array = new Int32Array(16);
  let die: Float64Array = new Float64Array(16);
  // value F(s) + C(s, t) of each candidate at the previous step, for its pruning test
  let prevValue: Float64Array = new Float64Array(16);
  let nc = 1;
  cand[0] = 0;
  die[0] = INF;
  prevValue[0] = -INF;
  let evaluations = 0;
  let maxCandidates = 1;
  let sumCandidates = 0;
  const sums = cost.squaredErrorSums;
  const sw = sums ? sums.w : null, s1 = sums ? sums.s1 : null, s2 = sums ? sums.s2 : null;
  // pruning test of step t - 1 applies when a change at t - 1 was possible
  let pruneAt = -1;
  for (let t = 1; t <= n; t++) {
    let best = INF;
    let arg = -1;
    let k = 0;
    const fPrev = pruneAt >= 0 ? F[pruneAt] : INF;
    const w1 = sw ? sw[t] : 0, a1 = s1 ? s1[t] : 0, b1 = s2 ? s2[t] : 0;
    for (let i = 0; i < nc; i++) {
      const s = cand[i];
      let d = die[i];
      // pruning decided at t - 1: F(s) + C(s, t - 1) >= F(t - 1), effective from t - 1 + m
      if (d === INF && prevValue[i] >= fPrev) d = pruneAt + m;
      if (d <= t) continue;
      let c: number;
      if (sw) {
        const a = a1 - s1![s];
        c = b1 - s2![s] - (a * a) / (w1 - sw[s]);
        if (!(c > 0)) c = 0;
      } else c = cost.cost(s, t);
      const f = F[s] + c;
      cand[k] = s; die[k] = d; prevValue[k] = f; k++;
      if (t - s >= m && f + penalty < best) { best = f + penalty; arg = s; }
    }
    nc = k;
    evaluations += nc;
    sumCandidates += nc;
    if (nc > maxCandidates) maxCandidates = nc;
    F[t] = best;
    last[t] = arg;
    pruneAt = -1;
    if (t === n || arg < 0) continue;
    if (!allowed || allowed[t] === 1) {
      pruneAt = t;
      if (nc === cand.length) {
        const c2 = new Int32Array(nc * 2); c2.set(cand); cand = c2;
        const d2 = new Float64Array(nc * 2); d2.set(die); die = d2;
        const v2 = new Float64Array(nc * 2); v2.set(prevValue); prevValue = v2;
      }
      cand[nc] = t;
      die[nc] = INF;
      prevValue[nc] = -INF; // not tested against its own F(t)
      nc++;
    }
  }
  return finish(cost, F, last, penalty, evaluations, maxCandidates, sumCandidates / n);
}

/**
 * {@link pelt} for the squared-error cost with minSegment 1, the cost inlined: the
 * same recursion, pruning and tie rule (smallest s), fewer memory passes. Unchecked.
 */
function peltSquaredError(cost: SegmentCost, penalty: number, allowed?: Uint8Array): Segmentation {
  const n = cost.n;
  const { w: sw, s1, s2 } = cost.squaredErrorSums!;
  const F = new Float64Array(n + 1).fill(INF);
  const last = new Int32Array(n + 1).fill(-1);
  F[0] = -penalty;
  let cand: Int32Array = new Int32Array(1024);
  let value: Float64Array = new Float64Array(1024);
  let nc = 1;
  cand[0] = 0;
  value[0] = -INF;
  let evaluations = 0, maxCandidates = 1;
  let fPrev = INF; // F(t - 1) when a change at t - 1 is allowed, else INF (no pruning)
  for (let t = 1; t <= n; t++) {
    let best = INF, arg = -1, k = 0;
    const w1 = sw[t], a1 = s1[t], b1 = s2[t];
    for (let i = 0; i < nc; i++) {
      if (value[i] >= fPrev) continue; // F(s) + C(s, t - 1) >= F(t - 1): pruned
      const s = cand[i];
      const a = a1 - s1[s];
      let c = b1 - s2[s] - (a * a) / (w1 - sw[s]);
      if (!(c > 0)) c = 0;
      const f = F[s] + c;
      cand[k] = s; value[k] = f; k++;
      if (f < best) { best = f; arg = s; }
    }
    nc = k;
    evaluations += nc;
    if (nc > maxCandidates) maxCandidates = nc;
    best += penalty;
    F[t] = best;
    last[t] = arg;
    fPrev = INF;
    if (t === n) break;
    if (!allowed || allowed[t] === 1) {
      fPrev = best;
      if (nc === cand.length) {
        const c2 = new Int32Array(nc * 2); c2.set(cand); cand = c2;
        const v2 = new Float64Array(nc * 2); v2.set(value); value = v2;
      }
      cand[nc] = t;
      value[nc] = -INF;
      nc++;
    }
  }
  return finish(cost, F, last, penalty, evaluations, maxCandidates, evaluations / n);
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
  return { changes, cost: totalCost(cost, changes), penalisedCost: F[n], evaluations, maxCandidates, meanCandidates };
}
