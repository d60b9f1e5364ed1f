import type { Series } from '../../series';
import { weightedMoments } from '../../weightedMoments';

/**
 * Internal scaling of a trend-filtering problem: x' = (x - x0) / h with h the
 * mean spacing (so x' runs 0 .. n-1 and the divided differences are O(1)),
 * y' = (y - y0) / c with y0 the weighted mean and c the weighted sd (1 when y
 * is constant), w' = w / m with m the mean weight.
 *
 * Since D(x, k+1) = h^{-k} D(x', k+1) and constants are in the null space of D,
 *   1/2 sum w (y - b)^2 + lambda ||D(x, k+1) b||_1 = m c^2 [ 1/2 sum w' (y' - b')^2 + lambda' ||D(x', k+1) b'||_1 ]
 * with lambda = lambda' m c h^k. Unchecked.
 */
export interface TrendScaling {
  x0: number;
  h: number;
  y0: number;
  c: number;
  m: number;
  k: number;
  /** Scaled x, y, w. */
  xs: Float64Array;
  ys: Float64Array;
  ws: Float64Array;
}

/** Builds the {@link TrendScaling} of a clean series (n >= 2). Unchecked. */
export function trendScaling(series: Series, k: number): TrendScaling {
  const { x, y, w, n } = series;
  const x0 = x[0];
  const h = (x[n - 1] - x[0]) / (n - 1);
  const { mean: y0, sd: c, meanWeight: m } = weightedMoments(y, w);
  const xs = new Float64Array(n), ys = new Float64Array(n), ws = new Float64Array(n);
  for (let i = 0; i < n; i++) { xs[i] = (x[i] - x0) / h; ys[i] = (y[i] - y0) / c; ws[i] = w[i] / m; }
  return { x0, h, y0, c, m, k, xs, ys, ws };
}

/** lambda in the data's units -> scaled units. */
export function toScaledPenalty(lambda: number, s: TrendScaling): number {
  return lambda / (s.m * s.c * Math.pow(s.h, s.k));
}

/** Scaled values -> the data's units, in place (v = y0 + c v). Unchecked. */
export function toDataValues(v: Float64Array, s: TrendScaling): void {
  for (let i = 0; i < v.length; i++) v[i] = s.y0 + s.c * v[i];
}

/** lambda in scaled units -> the data's units. */
export function toDataPenalty(lambdaScaled: number, s: TrendScaling): number {
  return lambdaScaled * s.m * s.c * Math.pow(s.h, s.k);
}
