/**
 * Nonparametric empirical-distribution cost (change in distribution).
 */
import type { SegmentCost } from './segmentCost';

const { log } = Math;

/**
 * Builds the empirical-distribution cost of Haynes, Fearnhead & Eckley (2017),
 * "A computationally efficient nonparametric approach for changepoint detection",
 * Statistics and Computing 27:1293-1305 (the ED-PELT cost, after Zou et al. 2014):
 *
 *   C(s, t) = (2 log(2n - 1) / K) * sum_{k=1..K} m * H(F_k),   m = t - s,
 *   H(F) = -F log F - (1 - F) log(1 - F)   (H(0) = H(1) = 0),
 *
 * where F_k is the segment's empirical CDF at the k-th quantile u_k of the whole
 * series, with ties counted as one half: F_k = (#{y < u_k} + #{y = u_k}/2) / m.
 * The quantiles are u_k = Finv(1 / (1 + (2n - 1) exp(c (2k - 1) / K))), c = -log(2n - 1),
 * with Finv the empirical quantile of all n points (formula as recalled from the
 * paper; the constant factor only rescales the penalty).
 * Each term m H(F_k) is a Bernoulli negative log-likelihood minimised over its
 * probability, so the cost is subadditive and PELT prunes exactly with K = 0.
 * Weights are ignored: the cost ranks values, and case weights have no
 * standard meaning for it. O(K) per segment; memory K (n + 1).
 * Unchecked: y finite, K >= 1.
 *
 * @param y - values (any units; only their order matters)
 * @param K - number of quantiles
 * @example
 * ```ts
 * const c = distributionCost(y, 10);
 * c.cost(0, y.length);
 * ```
 */
export function distributionCost(y: Float64Array, K: number): SegmentCost {
  const n = y.length;
  const sorted = Float64Array.from(y).sort();
  const c = -log(2 * n - 1);
  const q = new Float64Array(K);
  for (let k = 0; k < K; k++) {
    const p = 1 / (1 + (2 * n - 1) * Math.exp((c * (2 * k + 1)) / K));
    let idx = Math.ceil(p * n) - 1;
    if (idx < 0) idx = 0;
    if (idx > n - 1) idx = n - 1;
    q[k] = sorted[idx];
  }
  // cum[k * (n + 1) + i] = 2 * (#{y_j < u_k} + #{y_j = u_k} / 2) over j < i (integers: exact)
  const stride = n + 1;
  const cum = new Float64Array(K * stride);
  for (let k = 0; k < K; k++) {
    const u = q[k];
    const base = k * stride;
    for (let i = 0; i < n; i++) cum[base + i + 1] = cum[base + i] + (y[i] < u ? 2 : y[i] === u ? 1 : 0);
  }
  const factor = (2 * -c) / K;
  return {
    n,
    cost(s: number, t: number): number {
      const m = t - s;
      let total = 0;
      for (let k = 0, base = 0; k < K; k++, base += stride) {
        const f = (cum[base + t] - cum[base + s]) / (2 * m);
        if (f > 0 && f < 1) total -= m * (f * log(f) + (1 - f) * log(1 - f));
      }
      return factor * total;
    },
  };
}
