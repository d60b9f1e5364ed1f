/**
 * The segment-cost contract shared by the exact segmentation searches
 * ({@link pelt}, {@link optimalPartitioning}, {@link crops}).
 */

/**
 * A cost of fitting one segment of points [s, t) (s inclusive, t exclusive),
 * computed in O(1) (or O(K)) from cumulative sums.
 *
 * Every cost here is a minimum over the segment's parameters of a sum of
 * per-point losses (twice a negative log-likelihood up to a constant), so
 * C(a, b) + C(b, c) <= C(a, c): the PELT pruning condition holds with K = 0
 * (Killick, Fearnhead & Eckley 2012, JASA 107:1590, section 3).
 */
export interface SegmentCost {
  /** Number of points. */
  readonly n: number;
  /** Cost of points s..t-1. Unchecked: 0 <= s < t <= n. */
  cost(s: number, t: number): number;
  /**
   * Optional cumulative sums (length n + 1) of w, w z, w z^2 when the cost is exactly
   * sum w (z - zbar)^2 (clamped at 0): lets {@link pelt} inline the cost in its loop.
   */
  readonly squaredErrorSums?: { w: Float64Array; s1: Float64Array; s2: Float64Array };
}

/** Result of one penalised search. */
export interface Segmentation {
  /** Indices of the first point of each new segment, increasing (empty: no change). */
  changes: number[];
  /** Unpenalised cost: the sum of segment costs. */
  cost: number;
  /** cost + penalty * changes.length. */
  penalisedCost: number;
  /** Segment costs computed. */
  evaluations: number;
  /** Most candidates held at one step. */
  maxCandidates: number;
  /** Mean candidates per step. */
  meanCandidates: number;
}

/**
 * Prefix sums of weights, weighted z and weighted z^2 with z = (y - centre) / scale,
 * the O(1) segment statistics of the Gaussian costs. Unchecked: scale > 0.
 */
export function standardisedSums(y: Float64Array, w: Float64Array, centre: number, scale: number): { w: Float64Array; s1: Float64Array; s2: Float64Array } {
  const n = y.length;
  const sw = new Float64Array(n + 1);
  const s1 = new Float64Array(n + 1);
  const s2 = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) {
    const z = (y[i] - centre) / scale;
    sw[i + 1] = sw[i] + w[i];
    s1[i + 1] = s1[i] + w[i] * z;
    s2[i + 1] = s2[i] + w[i] * z * z;
  }
  return { w: sw, s1, s2 };
}

/** Sum of segment costs of a segmentation given by its change indices. Unchecked. */
export function totalCost(cost: SegmentCost, changes: readonly number[]): number {
  let total = 0;
  let s = 0;
  for (const c of changes) { total += cost.cost(s, c); s = c; }
  return total + cost.cost(s, cost.n);
}
