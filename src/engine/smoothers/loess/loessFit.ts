import { KnotwiseError, showNumber } from '../../errors';
import type { SolverStatus } from '../../types';
import { localPolynomial, localWeight, type LocalFit } from './localPolynomial';
import { toFloat64 } from '../whittaker/whittakerInput';
import { sum } from '../../linalg/sum';

/** Options of {@link loessFit}. */
export interface LoessOptions {
  /** Fraction of the points in each neighbourhood, in (0, 1]; q = floor(n * span + 1e-5) points. */
  span: number;
  /** Local polynomial degree: 1 (default) or 2 (0 also accepted: local means). */
  degree?: 0 | 1 | 2;
  /** Bisquare robustness reweightings after the first fit (default 0; R's lowess uses 3). */
  robustnessIterations?: number;
  /**
   * Interpolation distance in units of x (R lowess's `delta`): local fits are computed
   * exactly only at anchor points at least this far apart, and linearly interpolated
   * between. Default 0 (every point exact) for n <= 1000, else min(0.01, span / 20) * range(x).
   */
  delta?: number;
}

/** Result of {@link loessFit}. */
export interface LoessFit {
  fitted: Float64Array;
  /** Diagonal of the smoother matrix L (of the final, robustness-weighted fit). */
  leverage: Float64Array;
  /** Equivalent degrees of freedom tr(L). */
  df: number;
  /** Weighted residual sum of squares. */
  rss: number;
  /** GCV = n rss / (n - tr L)^2. */
  gcv: number;
  /** AICc = log(rss / n) + 1 + 2 (tr L + 1) / (n - tr L - 2) (Hurvich, Simonoff & Tsai 1998); Infinity when tr L >= n - 2. */
  aicc: number;
  /** Final robustness weights (all 1 without robustness iterations). */
  robustnessWeights: Float64Array;
  /** Points in each neighbourhood. */
  neighbours: number;
  /** Points at which the local fit was computed exactly (the others are interpolated). */
  anchors: number;
  delta: number;
  status: SolverStatus;
}

/**
 * LOESS / LOWESS: locally weighted polynomial regression (W. S. Cleveland, "Robust locally
 * weighted regression and smoothing scatterplots", JASA 74 (1979) 829-836; W. S. Cleveland
 * and S. J. Devlin, "Locally weighted regression: an approach to regression analysis by
 * local fitting", JASA 83 (1988) 596-610).
 *
 * At each x_i: the q = floor(n * span + 1e-5) nearest points (by |x_j - x_i|), bandwidth
 * h_i = distance to the q-th nearest, weights w_j * rw_j * (1 - (|x_j - x_i| / h_i)^3)^3
 * (tricube; points at distance h_i get weight 0), and the fitted value is the intercept
 * of the weighted least-squares polynomial of the given degree in (x - x_i) / h_i. The
 * neighbourhood is a sliding window over sorted x, so one pass costs O(n q).
 *
 * Robustness (Cleveland 1979): after each fit, residuals r_j give m = 6 * median |r_j| and
 * bisquare weights rw_j = (1 - (r_j / m)^2)^2, set to 1 when |r_j| <= 0.001 m and 0 when
 * |r_j| > 0.999 m (the conventions of Cleveland's LOWESS program, also in R's lowess and
 * loess); the fit is repeated `robustnessIterations` times. Iterations stop early when
 * m < 1e-7 * mean |r| (a practically exact fit, as R's lowess does).
 *
 * Interpolation (delta, as in R's lowess): the first point is an anchor; after an anchor
 * at x_a the next anchor is the last point with x <= x_a + delta (or the next point if
 * there is none); points tied with an anchor take its value; the fitted values of points
 * between two anchors a < b are the straight line between the anchors' fitted values,
 * f_j = f_a + (x_j - x_a) / (x_b - x_a) (f_b - f_a), and their leverages are the same
 * combination of the two anchors' weights on point j, so tr(L) stays exact for the
 * operator actually applied.
 *
 * The smoother matrix diagonal L_ii = omega_i e_0' (X' Omega X)^{-1} x_i comes from each
 * local fit at no extra cost and gives df = tr(L), GCV and AICc (C. M. Hurvich,
 * J. S. Simonoff and C.-L. Tsai, "Smoothing parameter selection in nonparametric
 * regression using an improved Akaike information criterion", JRSS B 60 (1998) 271-293),
 * used by {@link loessSelectSpan}. With robustness the operator is that of the last,
 * reweighted fit.
 *
 * Local fits whose window has too few distinct x for the degree drop to a lower degree.
 * Units: fitted values in units of y; span is a fraction; delta in units of x.
 *
 * @param x - sorted (nondecreasing) positions; ties allowed
 * @param y - values
 * @param w - weights >= 0, or null for all 1
 * @param options - span, degree, robustnessIterations, delta
 * @example
 * ```ts
 * // R: lowess(x, y, f = 2/3, iter = 3)
 * loessFit(x, y, null, { span: 2 / 3, degree: 1, robustnessIterations: 3, delta: 0.01 * (x[n - 1] - x[0]) });
 * ```
 */
export function loessFit(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number> | null | undefined, options: LoessOptions): LoessFit {
  const inp = loessInput(x, y, w);
  const o = loessOptions(options, inp.n, inp.x);
  return loessRun(inp, o.span, o.degree, o.iterations, o.delta);
}

/** Checked data. */
export interface LoessData { n: number; x: Float64Array; y: Float64Array; w: Float64Array }

/** Validates x (finite, nondecreasing, not all equal), y (finite), w (finite, >= 0, some > 0). */
export function loessInput(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number> | null | undefined): LoessData {
  const n = y.length;
  if (x.length !== n) throw new KnotwiseError('shape-mismatch', `x has ${x.length} values but y has ${n}.`);
  if (w && w.length !== n) throw new KnotwiseError('shape-mismatch', `the weights have ${w.length} values but y has ${n}.`);
  if (n < 3) throw new KnotwiseError('too-few-points', `LOESS needs at least 3 points; got ${n}.`);
  const xs = toFloat64(x), ys = toFloat64(y);
  const ws = w ? toFloat64(w) : new Float64Array(n).fill(1);
  let positive = 0;
  for (let i = 0; i < n; i++) {
    const xi = xs[i], yi = ys[i], wi = ws[i];
    if (!Number.isFinite(xi)) throw new KnotwiseError('bad-data', `x at position ${i + 1} is not a finite number: ${showNumber(xi)}.`);
    if (!Number.isFinite(yi)) throw new KnotwiseError('bad-data', `y at position ${i + 1} is not a finite number: ${showNumber(yi)}.`);
    if (!Number.isFinite(wi)) throw new KnotwiseError('bad-data', `the weight at position ${i + 1} is not a finite number: ${showNumber(wi)}.`);
    if (wi < 0) throw new KnotwiseError('negative-weight', `the weight at position ${i + 1} is negative: ${showNumber(wi)}.`);
    if (i > 0 && xi < xs[i - 1]) throw new KnotwiseError('bad-data', `x must be sorted in increasing order; x at position ${i + 1} is ${showNumber(xi)} after ${showNumber(xs[i - 1])}.`);
    if (wi > 0) positive++;
  }
  if (positive === 0) throw new KnotwiseError('too-few-points', 'every weight is zero.');
  if (!(xs[n - 1] > xs[0])) throw new KnotwiseError('constant-x', `all x are equal (${showNumber(xs[0])}); a curve in x cannot be fitted.`);
  return { n, x: xs, y: ys, w: ws };
}

/** Validates the options; returns them with defaults filled in. */
export function loessOptions(options: LoessOptions, n: number, x: Float64Array): { span: number; degree: 0 | 1 | 2; iterations: number; delta: number; q: number } {
  const span = options?.span;
  if (typeof span !== 'number' || !Number.isFinite(span) || span <= 0 || span > 1) {
    throw new KnotwiseError('bad-option', `span must be a number in (0, 1] (the fraction of points in each neighbourhood); got ${typeof span === 'number' ? showNumber(span) : String(span)}.`);
  }
  const degree = options.degree ?? 1;
  if (degree !== 0 && degree !== 1 && degree !== 2) throw new KnotwiseError('bad-option', `degree must be 0, 1 or 2; got ${String(degree)}.`);
  const iterations = options.robustnessIterations ?? 0;
  if (typeof iterations !== 'number' || !Number.isInteger(iterations) || iterations < 0 || iterations > 20) {
    throw new KnotwiseError('bad-option', `robustnessIterations must be a whole number from 0 to 20; got ${typeof iterations === 'number' ? showNumber(iterations) : String(iterations)}.`);
  }
  const range = x[n - 1] - x[0];
  const delta = options.delta ?? (n <= 1000 ? 0 : Math.min(0.01, span / 20) * range);
  if (typeof delta !== 'number' || !Number.isFinite(delta) || delta < 0) {
    throw new KnotwiseError('bad-option', `delta must be a finite number >= 0 (in units of x); got ${typeof delta === 'number' ? showNumber(delta) : String(delta)}.`);
  }
  const q = Math.min(n, Math.floor(n * span + 1e-5));
  if (q < degree + 1 || q < 2) {
    throw new KnotwiseError('bad-option', `span ${showNumber(span)} gives ${q} points per neighbourhood for ${n} points; a local polynomial of degree ${degree} needs at least ${Math.max(2, degree + 1)}. Use a span of at least ${showNumber(Math.max(2, degree + 1) / n)}.`);
  }
  return { span, degree, iterations, delta, q };
}

/** The fit itself on checked input. Unchecked. */
export function loessRun(inp: LoessData, span: number, degree: 0 | 1 | 2, iterations: number, delta: number): LoessFit {
  const { n, x, y, w } = inp;
  const q = Math.min(n, Math.floor(n * span + 1e-5));
  const rw = new Float64Array(n).fill(1);
  const fitted = new Float64Array(n);
  const leverage = new Float64Array(n);
  const res = new Float64Array(n);
  let anchors = 0, done = 0;
  const fa: LocalFit = { value: 0, x0: 0, h: 0, degree: 0, c0: 0, c1: 0, c2: 0, weightSum: 0 };
  const fb: LocalFit = { ...fa };
  for (let iter = 0; iter <= iterations; iter++) {
    done = iter;
    anchors = 0;
    let lo = 0; // window [lo, lo + q - 1]
    let last = -1; // last anchor
    let prev = fa, cur = fb;
    let i = 0;
    for (;;) {
      // slide the window while the point leaving on the left is farther than the one entering on the right
      while (lo + q < n && x[i] - x[lo] > x[lo + q] - x[i]) lo++;
      const h = Math.max(x[i] - x[lo], x[lo + q - 1] - x[i]);
      // widen over points tied at distance h is unnecessary: they get weight 0
      localPolynomial(x, y, w, rw, lo, lo + q - 1, x[i], h, degree, cur);
      anchors++;
      if (Number.isNaN(cur.value)) {
        // every weight zero (all robustness weights 0 in the window): keep the data value, as R's lowess
        fitted[i] = y[i];
        leverage[i] = 1;
      } else {
        fitted[i] = cur.value;
        leverage[i] = localWeight(cur, x[i], w[i], rw[i]);
      }
      if (last >= 0 && last < i - 1) {
        const xa = x[last], den = x[i] - xa;
        for (let j = last + 1; j < i; j++) {
          const a = (x[j] - xa) / den;
          fitted[j] = a * fitted[i] + (1 - a) * fitted[last];
          const la = Number.isNaN(prev.value) ? 0 : localWeight(prev, x[j], w[j], rw[j]);
          const lb = Number.isNaN(cur.value) ? 0 : localWeight(cur, x[j], w[j], rw[j]);
          leverage[j] = a * lb + (1 - a) * la;
        }
      }
      last = i;
      const tmp = prev; prev = cur; cur = tmp; // prev now holds the fit at `last`
      const cut = x[last] + delta;
      let k = last + 1;
      for (; k < n; k++) {
        if (x[k] > cut) break;
        if (x[k] === x[last]) {
          fitted[k] = fitted[last];
          leverage[k] = Number.isNaN(prev.value) ? 1 : localWeight(prev, x[k], w[k], rw[k]);
          last = k;
        }
      }
      if (last >= n - 1) break;
      i = Math.max(last + 1, k - 1);
    }
    // the passes over the points below are kernels of their own (DEVELOPERS.md, "Long loops and the first call")
    differenceInto(y, fitted, res);
    if (iter === iterations) break;
    // bisquare robustness weights from 6 * median |r|
    const a = Float64Array.from(res, Math.abs);
    let meanAbs = 0;
    for (let j = 0; j < n; j++) meanAbs += a[j];
    meanAbs /= n;
    a.sort();
    const med = n % 2 ? a[(n - 1) >> 1] : 0.5 * (a[n / 2 - 1] + a[n / 2]);
    const cmad = 6 * med;
    if (cmad < 1e-7 * meanAbs) break;
    bisquareWeights(res, cmad, rw);
  }
  const rss = weightedSquares(w, res), df = sum(leverage);
  const gcv = (n * rss) / ((n - df) * (n - df));
  const aicc = n - df - 2 > 0 ? Math.log(rss / n) + 1 + (2 * (df + 1)) / (n - df - 2) : Infinity;
  return {
    fitted, leverage, df, rss, gcv, aicc, robustnessWeights: rw, neighbours: q, anchors, delta,
    status: {
      converged: true, iterations: done + 1, tolerance: 0, achieved: 0,
      stoppingRule: iterations > 0 ? `${iterations} robustness reweightings asked, ${done} done (stops early when 6 median |r| < 1e-7 mean |r|)` : 'direct: one weighted least-squares fit per anchor point',
    },
  };
}

/** out = a - b. Unchecked. */
function differenceInto(a: Float64Array, b: Float64Array, out: Float64Array): void {
  for (let j = 0; j < out.length; j++) out[j] = a[j] - b[j];
}

/** Bisquare robustness weights from the residuals and c = 6 median |r|: 1 up to 0.001 c, (1 - (r / c)^2)^2 up to 0.999 c, 0 beyond. Unchecked. */
function bisquareWeights(res: Float64Array, cmad: number, rw: Float64Array): void {
  const c9 = 0.999 * cmad, c1 = 0.001 * cmad;
  for (let j = 0; j < res.length; j++) {
    const r = Math.abs(res[j]);
    if (r <= c1) rw[j] = 1;
    else if (r <= c9) { const t = r / cmad; rw[j] = (1 - t * t) * (1 - t * t); }
    else rw[j] = 0;
  }
}

/** sum w r^2. Unchecked. */
function weightedSquares(w: ArrayLike<number>, r: Float64Array): number {
  let s = 0;
  for (let j = 0; j < r.length; j++) s += w[j] * r[j] * r[j];
  return s;
}
