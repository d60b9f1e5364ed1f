/**
 * FPOP: exact change-in-level segmentation by functional pruning, for the Gaussian
 * and the biweight (outlier-robust) losses.
 */
import { PiecewiseQuadratic } from './piecewiseQuadratic';
import type { Segmentation } from './segmentCost';

const INF = 1 / 0;

/** The per-point loss of {@link fpop}. */
export type LevelLoss =
  /** w (z - mu)^2: the Gaussian change-in-mean cost. */
  | { kind: 'square' }
  /** w min((z - mu)^2, K^2): the biweight loss of Fearnhead & Rigaill (2019). */
  | { kind: 'biweight'; K: number };

/** Result of {@link fpop}: a {@link Segmentation} plus the level of each segment. */
export interface LevelSegmentation extends Segmentation {
  /** Optimal level (in z units) of each segment, in order. */
  levels: number[];
}

/**
 * Functional Pruning Optimal Partitioning (Maidstone, Hocking, Rigaill & Fearnhead 2017,
 * "On optimal multiple changepoint algorithms for large data", Statistics and Computing
 * 27:519-533), with the biweight loss of its robust successor (Fearnhead & Rigaill 2019,
 * "Changepoint detection in the presence of outliers", JASA 114:169-183, R-FPOP).
 *
 * Minimises exactly, over segmentations of z_0..z_{n-1} and one level mu per segment,
 *
 *   sum_i loss_i(z_i - mu_seg(i)) + beta * (number of changes),
 *
 * by carrying Q_t(mu), the best penalised cost of z_0..z_{t-1} whose last segment has
 * level mu, as a piecewise quadratic:
 *
 *   Q_1(mu) = loss_0(mu),   Q_{t+1}(mu) = min(Q_t(mu), F(t) + beta) + loss_t(mu),   F(t) = min_mu Q_t(mu).
 *
 * Candidate starts whose piece vanishes from Q are pruned for good (functional pruning
 * keeps only starts optimal for some mu, a subset of what PELT keeps). The number of
 * pieces stays small whatever the number of changes, so the work is near linear in n
 * for both losses (the paper's simulations; measured in the benchmark). With a minimum
 * segment length m > 1, a new start's function waits m points before it joins Q.
 * A change may start at point s only when `allowed[s]` is 1 (not inside tied x).
 *
 * Stopping rule: none needed; a single pass over the n points.
 *
 * @param z - values on the noise scale (e.g. (y - median) / sigma)
 * @param w - case weights (> 0)
 * @param loss - squared or biweight loss (K in z units, e.g. 3)
 * @param penalty - beta >= 0 per change
 * @param minSegment - fewest points per segment (integer >= 1)
 * @param allowed - optional mask of allowed change starts
 * @returns changes (first index of each new segment), levels, costs, and piece counts as
 *   the candidate diagnostics (evaluations = pieces visited)
 * @example
 * ```ts
 * fpop(Float64Array.of(0, 0.1, 5, 5.2), Float64Array.of(1, 1, 1, 1), { kind: 'square' }, 4, 1).changes; // [2]
 * ```
 */
export function fpop(z: Float64Array, w: Float64Array, loss: LevelLoss, penalty: number, minSegment: number, allowed?: Uint8Array): LevelSegmentation {
  const n = z.length;
  let lo = INF, hi = -INF;
  for (let i = 0; i < n; i++) { if (z[i] < lo) lo = z[i]; if (z[i] > hi) hi = z[i]; }
  if (!(hi > lo)) hi = lo + 1; // a constant series: any non-empty domain
  const F = new Float64Array(n + 1).fill(INF);
  const last = new Int32Array(n + 1).fill(-1);
  const muEnd = new Float64Array(n + 1);
  F[0] = -penalty;
  const robust = loss.kind === 'biweight';
  const K = robust ? loss.K : 0;
  const add = (q: PiecewiseQuadratic, i: number): void => { if (robust) q.addBiweight(z[i], w[i], K); else q.addSquare(z[i], w[i]); };
  let evaluations = 0, maxCandidates = 0;
  if (minSegment <= 1) {
    const Q = new PiecewiseQuadratic(lo, hi, 0, 0);
    for (let t = 1; t <= n; t++) {
      if (t >= 2 && (!allowed || allowed[t - 1] === 1) && F[t - 1] < INF) Q.minConstant(F[t - 1] + penalty, t - 1);
      add(Q, t - 1);
      const best = Q.minimum();
      F[t] = best.value; last[t] = best.label; muEnd[t] = best.mu;
      evaluations += Q.size;
      if (Q.size > maxCandidates) maxCandidates = Q.size;
    }
  } else {
    let Q: PiecewiseQuadratic | null = null;
    // pending starts, oldest first, in a ring of minSegment reusable functions
    const ring: PiecewiseQuadratic[] = [];
    const ringStart: number[] = [];
    let head = 0, count = 0;
    const pool: PiecewiseQuadratic[] = [];
    const take = (c: number, label: number): PiecewiseQuadratic => {
      const f = pool.pop();
      if (f) { f.reset(c, label); return f; }
      return new PiecewiseQuadratic(lo, hi, c, label);
    };
    const push = (start: number, f: PiecewiseQuadratic): void => {
      const slot = (head + count) % minSegment;
      ring[slot] = f; ringStart[slot] = start; count++;
    };
    push(0, take(0, 0));
    for (let t = 1; t <= n; t++) {
      if (Q) add(Q, t - 1);
      for (let k = 0; k < count; k++) add(ring[(head + k) % minSegment], t - 1);
      while (count && t - ringStart[head] >= minSegment) {
        const f = ring[head];
        head = (head + 1) % minSegment; count--;
        if (Q) { Q.minWith(f); pool.push(f); } else Q = f;
      }
      if (Q) {
        const best = Q.minimum();
        F[t] = best.value; last[t] = best.label; muEnd[t] = best.mu;
        evaluations += Q.size;
        if (Q.size > maxCandidates) maxCandidates = Q.size;
      }
      if (t < n && F[t] < INF && (!allowed || allowed[t] === 1)) push(t, take(F[t] + penalty, t));
    }
  }
  const changes: number[] = [];
  const levels: number[] = [];
  for (let t = n; t > 0;) {
    const s = last[t];
    levels.push(muEnd[t]);
    if (s > 0) changes.push(s);
    t = s;
  }
  changes.reverse(); levels.reverse();
  const penalised = F[n];
  return { changes, levels, cost: penalised - penalty * changes.length, penalisedCost: penalised, evaluations, maxCandidates, meanCandidates: evaluations / Math.max(1, n) };
}
