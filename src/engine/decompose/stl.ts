/**
 * STL: seasonal-trend decomposition by LOESS (R. B. Cleveland, W. S. Cleveland,
 * J. E. McRae and I. Terpenning, "STL: a seasonal-trend decomposition procedure
 * based on loess", J. Official Statistics 6 (1990) 3-73), exactly the paper's
 * algorithm and parameters.
 *
 *   y_i = T_i + S_i + R_i
 *
 * Inner loop (n_i passes): detrend, smooth each cycle-subseries by LOESS
 * (window n_s, degree d_s, jump j_s) extended one period at each end, low-pass
 * filter that (moving averages of lengths n_p, n_p, 3 and LOESS with window
 * n_l), S = subseries smooth - low-pass, then T = LOESS of y - S (window n_t).
 * Outer loop (n_o passes): robustness weights rho_i = B(|R_i| / (6 median |R|))
 * with the bisquare B(u) = (1 - u^2)^2 for u < 1, used by the next inner loop.
 */
import { KnotwiseError, showNumber } from '../errors';
import { checkInteger } from '../options';
import { medianOfAbs, robustnessWeights, stlInner, StlParameters } from './stlKernels';

/** Options of {@link stl}. Windows are counts of points (odd; an even one is raised by 1). */
export interface StlOptions {
  /** Number of points per seasonal cycle n_p (whole number >= 2). */
  period: number;
  /** Seasonal LOESS window n_s (odd >= 3, counted in cycles), or 'periodic' (n_s = 10 n + 1, degree 0, then the season averaged per phase). Default 13. */
  seasonalWindow?: number | 'periodic';
  /** Seasonal LOESS degree d_s: 0 or 1. Default 0. */
  seasonalDegree?: number;
  /** Trend LOESS window n_t. Default: the next odd integer to 1.5 n_p / (1 - 1.5 / n_s). */
  trendWindow?: number;
  /** Trend LOESS degree: 0 or 1. Default 1. */
  trendDegree?: number;
  /** Low-pass LOESS window n_l. Default: the next odd integer to n_p. */
  lowPassWindow?: number;
  /** Low-pass LOESS degree: 0 or 1. Default: the trend degree. */
  lowPassDegree?: number;
  /** LOESS evaluated at every jump-th point, linear in between. Defaults: ceiling(window / 10). */
  seasonalJump?: number;
  trendJump?: number;
  lowPassJump?: number;
  /** Robustness iterations on (default false). */
  robust?: boolean;
  /** Inner loop passes n_i. Default 1 when robust, else 2. */
  innerLoops?: number;
  /** Outer (robustness) loop passes n_o. Default 15 when robust, else 0. */
  outerLoops?: number;
}

/** Result of {@link stl}, one value per input point. */
export interface StlResult {
  seasonal: Float64Array;
  trend: Float64Array;
  remainder: Float64Array;
  /** Robustness weights of the last inner loop (all 1 without outer passes). */
  weights: Float64Array;
  /** The parameters used (windows odd, defaults filled in). */
  parameters: StlParameters & { outer: number; periodic: boolean };
}

/** Default seasonal window: 13 cycles (our choice: a season that may drift slowly over a dozen cycles). */
export const STL_DEFAULT_SEASONAL_WINDOW = 13;

function nextOdd(x: number): number {
  const r = Math.round(x);
  return r % 2 === 0 ? r + 1 : r;
}

function checkWindow(v: unknown, name: string, n: number): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v < 3) throw new KnotwiseError('bad-option', `${name} must be a number of points >= 3; got ${typeof v === 'number' ? showNumber(v) : String(v)}.`);
  if (v > 100 * n + 1) throw new KnotwiseError('bad-option', `${name} must be at most 100 times the series length (${100 * n + 1}); got ${showNumber(v)}.`);
  return nextOdd(v);
}

/**
 * Resolves STL options as R's `stats::stl` does (windows made odd; R's defaults
 * for degrees, jumps and loop counts) and validates them.
 * @throws {@link KnotwiseError} `bad-option`, `too-few-points`
 */
export function stlParameters(n: number, options: StlOptions): StlParameters & { outer: number; periodic: boolean } {
  if (options === null || typeof options !== 'object') throw new KnotwiseError('bad-option', `STL options must be an object with at least a period; got ${String(options)}.`);
  const period = checkInteger(options.period, 'period', 2, 1e6);
  if (n <= 2 * period) throw new KnotwiseError('too-few-points', `STL needs more than two full cycles: more than ${2 * period} points for period ${period}; got ${n}.`);
  const periodic = options.seasonalWindow === 'periodic';
  let seasonalWindow: number;
  let seasonalDegree: number;
  if (periodic) {
    seasonalWindow = 10 * n + 1;
    seasonalDegree = 0;
  } else {
    seasonalWindow = checkWindow(options.seasonalWindow ?? STL_DEFAULT_SEASONAL_WINDOW, 'seasonalWindow', n);
    seasonalDegree = options.seasonalDegree === undefined ? 0 : checkInteger(options.seasonalDegree, 'seasonalDegree', 0, 1);
  }
  const trendWindow = options.trendWindow === undefined ? nextOdd(Math.ceil((1.5 * period) / (1 - 1.5 / seasonalWindow))) : checkWindow(options.trendWindow, 'trendWindow', n);
  const trendDegree = options.trendDegree === undefined ? 1 : checkInteger(options.trendDegree, 'trendDegree', 0, 1);
  const lowPassWindow = options.lowPassWindow === undefined ? nextOdd(period) : checkWindow(options.lowPassWindow, 'lowPassWindow', n);
  const lowPassDegree = options.lowPassDegree === undefined ? trendDegree : checkInteger(options.lowPassDegree, 'lowPassDegree', 0, 1);
  const jump = (v: unknown, name: string, win: number) => (v === undefined ? Math.ceil(win / 10) : checkInteger(v, name, 1, 1e9));
  if (options.robust !== undefined && typeof options.robust !== 'boolean') throw new KnotwiseError('bad-option', `robust must be TRUE or FALSE; got ${String(options.robust)}.`);
  const robust = !!options.robust;
  return {
    period, periodic,
    seasonalWindow, seasonalDegree, seasonalJump: jump(options.seasonalJump, 'seasonalJump', seasonalWindow),
    trendWindow, trendDegree, trendJump: jump(options.trendJump, 'trendJump', trendWindow),
    lowPassWindow, lowPassDegree, lowPassJump: jump(options.lowPassJump, 'lowPassJump', lowPassWindow),
    inner: options.innerLoops === undefined ? (robust ? 1 : 2) : checkInteger(options.innerLoops, 'innerLoops', 1, 1000),
    outer: options.outerLoops === undefined ? (robust ? 15 : 0) : checkInteger(options.outerLoops, 'outerLoops', 0, 1000),
  };
}

/**
 * STL decomposition of an equally spaced series without gaps:
 * y_i = trend_i + seasonal_i + remainder_i, by the algorithm of Cleveland et al.
 * (1990) with R's `stats::stl` defaults (seasonal degree 0; jumps
 * ceiling(window / 10); inner 2 passes, or 1 pass and 15 robustness passes when
 * robust; 'periodic' averages the season per phase afterwards). Units: those of y;
 * windows count points. O(n (n_s / j_s + n_t / j_t + n_l / j_l)) per inner pass.
 * The trend describes the past and its last values are revised as data arrive;
 * it is not a forecast.
 *
 * @param y - values at equally spaced times, no gaps (finite numbers)
 * @param options - period (required), windows, degrees, jumps, robust, loop counts ({@link StlOptions})
 * @throws {@link KnotwiseError} `bad-data` (a value that is not finite), `bad-option`, `too-few-points`
 * @example
 * ```ts
 * const r = stl(monthlyValues, { period: 12, seasonalWindow: 7, robust: true });
 * r.trend; r.seasonal; r.remainder;
 * ```
 */
export function stl(y: ArrayLike<number>, options: StlOptions): StlResult {
  const n = y.length;
  for (let i = 0; i < n; i++) {
    if (typeof y[i] !== 'number' || !Number.isFinite(y[i])) throw new KnotwiseError('bad-data', `STL needs a finite number at every point (no gaps); point ${i + 1} is ${typeof y[i] === 'number' ? showNumber(y[i]) : String(y[i])}.`);
  }
  const p = stlParameters(n, options);
  return stlUnchecked(Float64Array.from(y), p);
}

/**
 * {@link stl} on validated input and resolved parameters. `median` is the median of
 * the absolute residuals used by the robustness weights (default: the exact median). Unchecked.
 */
export function stlUnchecked(y: Float64Array, p: StlParameters & { outer: number; periodic: boolean }, median: (absResiduals: Float64Array) => number = medianOfAbs): StlResult {
  const n = y.length;
  const season = new Float64Array(n), trend = new Float64Array(n);
  const rw = new Float64Array(n);
  const fit = new Float64Array(n);
  let useRw = false;
  for (let k = 0; ; k++) {
    stlInner(y, n, p, useRw ? rw : null, season, trend);
    if (k + 1 > p.outer) break;
    for (let i = 0; i < n; i++) fit[i] = trend[i] + season[i];
    robustnessWeights(y, fit, n, rw, median);
    useRw = true;
  }
  if (p.outer <= 0) rw.fill(1);
  if (p.periodic) {
    const P = p.period;
    const sum = new Float64Array(P), cnt = new Float64Array(P);
    for (let i = 0; i < n; i++) { sum[i % P] += season[i]; cnt[i % P]++; }
    for (let i = 0; i < n; i++) season[i] = sum[i % P] / cnt[i % P];
  }
  const remainder = new Float64Array(n);
  for (let i = 0; i < n; i++) remainder[i] = y[i] - season[i] - trend[i];
  return { seasonal: season, trend, remainder, weights: rw, parameters: p };
}
