/**
 * From the knots of an L1 trend fit to the bends an analyst can act on.
 *
 * L1 trend filtering often spends a run of neighbouring knots on one bend (a
 * smooth turn drawn as several small kinks), and its penalty shrinks every
 * change towards zero. A knots table read literally then shows many tiny
 * changes where there is one real one. Here:
 * - a run of knots with the same sign whose points are at most 2k + 3 apart
 *   for order k >= 1 (a turn the L1 fit draws as a few kinks within a handful
 *   of points; 5 points for straight pieces), or adjacent for order 0 (a ramp
 *   drawn as two steps), is one bend,
 *   placed at the |change|-weighted mean of its members' x (moved to the
 *   nearest member's data point);
 * - its size is measured honestly: the unpenalised regression spline of
 *   degree k with knots at the bends is refitted (the relaxed fit of
 *   Meinshausen 2007, "Relaxed lasso", CSDA 52:374-393, as used for trend
 *   filtering), and the bend's change is the jump of that refit's k-th
 *   derivative there (level jump, slope change, ...), in the data's units;
 *   the L1 fit's own (shrunk) total is kept beside it;
 * - bends are ranked by the size of their change (rank 1 the largest).
 * The full list of knots stays in the fit's `knots`.
 */
import type { Knot } from '../types';
import type { Series } from '../series';
import { regressionSplineRefit, RegressionSpline } from '../smoothers/trend/regressionSplineRefit';

/** One bend: one or more neighbouring knots of the same sign. */
export interface Bend {
  /** x of the bend (a data point). */
  x: number;
  /** Clean-point index and 0-based input row of that point. */
  index: number;
  row: number;
  /** The change in the refitted curve (level jump, slope change, change in the k-th derivative), in the data's units; NaN when the refit was not possible. */
  change: number;
  /** The L1 fit's total change over the run (shrunk by the penalty). */
  shrunkChange: number;
  /** x of the first and last knot merged. */
  xFrom: number;
  xTo: number;
  /** Number of knots merged into this bend. */
  knots: number;
  /** 1 for the largest change, 2 for the next, ... */
  rank: number;
}

/** Jumps of the k-th derivative of a regression spline at its interior knots. Unchecked. */
export function derivativeJumps(sp: RegressionSpline): Float64Array {
  const { k, t } = sp;
  let c = Float64Array.from(sp.coef);
  const p = c.length;
  // differentiate k times: c'_i = deg (c_i - c_{i-1}) / (t_{i+deg} - t_i), i = off..p-1 (de Boor 1978, ch. X)
  let off = 0;
  for (let deg = k; deg >= 1; deg--) {
    const d = new Float64Array(p);
    for (let i = off + 1; i < p; i++) {
      const h = t[i + deg] - t[i];
      d[i] = h > 0 ? (deg * (c[i] - c[i - 1])) / h : 0;
    }
    c = d;
    off++;
  }
  // now c[i], i = k..p-1, is the k-th derivative on [t_i, t_{i+1}); interior knot j sits at t[k + 1 + j]
  const K = p - k - 1;
  const out = new Float64Array(K);
  for (let j = 0; j < K; j++) out[j] = c[k + j + 1] - c[k + j];
  return out;
}

/**
 * Merges and measures the knots of a trend fit of order k.
 *
 * @param series - the clean series the fit was made on
 * @param k - the order
 * @param knots - the fit's knots, in increasing x
 * @example
 * ```ts
 * knotBends(series, 1, fit.knots).map((b) => [b.x, b.change, b.rank]);
 * ```
 */
export function knotBends(series: Series, k: number, knots: readonly Knot[]): Bend[] {
  if (knots.length === 0) return [];
  const gap = k === 0 ? 1 : 2 * k + 3;
  const groups: Knot[][] = [];
  for (const kn of knots) {
    const g = groups[groups.length - 1];
    const last = g?.[g.length - 1];
    if (last && Math.sign(last.change) === Math.sign(kn.change) && kn.index - last.index <= gap) g.push(kn);
    else groups.push([kn]);
  }
  const bends: Bend[] = groups.map((g) => {
    let sw = 0, sx = 0, total = 0;
    for (const kn of g) { const a = Math.abs(kn.change); sw += a; sx += a * kn.x; total += kn.change; }
    const centre = sw > 0 ? sx / sw : g[0].x;
    let at = g[0];
    for (const kn of g) if (Math.abs(kn.x - centre) < Math.abs(at.x - centre)) at = kn;
    return { x: at.x, index: at.index, row: at.row, change: NaN, shrunkChange: total, xFrom: g[0].x, xTo: g[g.length - 1].x, knots: g.length, rank: 0 };
  });
  // honest sizes: the unpenalised spline of degree k with knots at the bends
  const { x, y, w, n } = series;
  const positions = bends.map((b) => b.x).filter((v, i, a) => v > x[0] && v < x[n - 1] && (i === 0 || v > a[i - 1]));
  if (positions.length === bends.length) {
    try {
      const jumps = derivativeJumps(regressionSplineRefit(x, y, w, k, positions).spline);
      bends.forEach((b, i) => { b.change = jumps[i]; });
    } catch {
      // a refit that cannot be solved leaves the sizes unknown (NaN), never wrong
    }
  }
  const order = bends.map((b, i) => i).sort((a, b) => Math.abs(size(bends[b])) - Math.abs(size(bends[a])));
  order.forEach((i, r) => { bends[i].rank = r + 1; });
  return bends;
}

const size = (b: Bend) => (Number.isFinite(b.change) ? b.change : b.shrunkChange);
