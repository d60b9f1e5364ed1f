import { median } from '../../median';
import { KnotwiseError, showNumber } from '../../errors';
import type { SolverStatus } from '../../types';
import { periodicDwt, periodicIdwt } from './periodicDwt';
import { sureThreshold } from './sureThreshold';
import { extendSeries } from './extendSeries';
import { toFloat64 } from '../whittaker/whittakerInput';
import { WAVELET_FILTERS, WAVELET_FILTER_NAMES, type WaveletFilterName } from './waveletFilters';

/** Options of {@link waveletShrink}. */
export interface WaveletShrinkOptions {
  /** Filter name (default 'sym8'). */
  filter?: WaveletFilterName;
  /** Levels J (default floor(log2(n / (L - 1))), the deepest level whose filter fits in the data). */
  levels?: number;
  /** 'universal' (VisuShrink, default) or 'sure' (SureShrink, soft only). */
  threshold?: 'universal' | 'sure';
  /** 'soft' (default) or 'hard'. */
  shrink?: 'soft' | 'hard';
  /** 'reflect' (default): mirror the series at both ends; 'periodic': treat it as one period. */
  boundary?: 'reflect' | 'periodic';
  /** Number of circular shifts averaged (cycle spinning), 1 (default, none) to 64. */
  shifts?: number;
  /** Positions; when given they must be equally spaced (the transform assumes it). */
  x?: ArrayLike<number>;
  /**
   * One threshold for every level, in units of y (>= 0), instead of the `threshold` rule:
   * the value a cross-validated choice hands in ({@link waveletCrossValidate}).
   */
  fixedThreshold?: number;
}

/** Result of {@link waveletShrink}. */
export interface WaveletShrinkResult {
  fitted: Float64Array;
  /** Noise level from the finest details: median |d_1| / 0.6745. */
  sigma: number;
  /** Threshold applied at each detail level, finest first (units of y). */
  thresholds: number[];
  levels: number;
  filter: WaveletFilterName;
  boundary: 'reflect' | 'periodic';
  /** Length of the transformed (extended) series. */
  transformLength: number;
  /** Nonzero detail coefficients kept (first shift), of transformLength - (approximation length). */
  kept: number;
  /** Largest |detail coefficient| of the unshifted transform: any threshold from here on removes every detail (units of y). */
  maxDetail: number;
  status: SolverStatus;
}

/**
 * Wavelet shrinkage (D. L. Donoho and I. M. Johnstone, "Ideal spatial adaptation by
 * wavelet shrinkage", Biometrika 81 (1994) 425-455; "Adapting to unknown smoothness
 * via wavelet shrinkage", JASA 90 (1995) 1200-1224): transform with an orthogonal
 * Daubechies or symmlet wavelet ({@link periodicDwt}), shrink the detail coefficients
 * of every level, invert. The approximation coefficients are kept.
 *
 *   sigma = median(|d_1|) / 0.6745                     (finest level; robust to the signal)
 *   universal (VisuShrink): t = sigma sqrt(2 log n)   (n = number of data points)
 *   sure (SureShrink):      t_j = sigma * sureThreshold(d_j / sigma) per level
 *   soft: sign(d) max(|d| - t, 0);   hard: d [|d| > t]
 *
 * Boundaries and lengths. The transform is periodic, so it needs a length divisible by
 * 2^J. 'reflect' (default) extends the series by its mirror image (y_0..y_{n-1},
 * y_{n-1}..y_0, after first padding the end by mirror reflection to a multiple of
 * 2^(J-1)): the extended series is symmetric at both ends, so a trending series shows no
 * jump where the period wraps; the cost is a transform of about twice the length.
 * 'periodic' treats the series (padded at the end by mirror reflection to a multiple of
 * 2^J) as one period: fastest, and exact for data that really are periodic, but the end
 * values are pulled toward each other when the series trends. Either way the result is
 * cut back to the n input rows.
 *
 * Cycle spinning (R. R. Coifman and D. L. Donoho, "Translation-invariant de-noising",
 * in Wavelets and Statistics, Springer 1995): the extended series is shifted circularly
 * by 0..shifts-1, shrunk, shifted back and averaged; sigma and the thresholds are
 * taken from the unshifted transform.
 *
 * Wavelets assume equal spacing: if x is given and unevenly spaced the call is
 * refused (KnotwiseError 'bad-data').
 *
 * @param y - equally spaced values, finite, at least 4
 * @param options - see {@link WaveletShrinkOptions}
 * @example
 * ```ts
 * const r = waveletShrink(y, { filter: 'sym8', threshold: 'sure', shifts: 8 });
 * r.fitted; r.sigma;
 * ```
 */
export function waveletShrink(y: ArrayLike<number>, options: WaveletShrinkOptions = {}): WaveletShrinkResult {
  const fixed = options.fixedThreshold;
  if (fixed !== undefined && !(typeof fixed === 'number' && fixed >= 0 && fixed < Infinity)) {
    throw new KnotwiseError('bad-option', `the threshold must be a finite number from 0; got ${typeof fixed === 'number' ? showNumber(fixed) : String(fixed)}.`);
  }
  return shrinkAt(prepareShrink(y, options), fixed === undefined ? null : [fixed])[0];
}

/**
 * {@link waveletShrink} at several fixed thresholds (one for every level, units of y; each finite
 * and >= 0), from one forward transform per shift: what a cross-validated choice over a grid of
 * thresholds needs. Each result is the one `waveletShrink(y, { ...options, fixedThreshold: t })`
 * returns (the same operations), at the cost of one transform and one noise estimate for the grid
 * instead of one per threshold.
 *
 * @example
 * ```ts
 * const [a, b] = waveletShrinkAt(y, { filter: 'sym8' }, [0.2, 0.5]);
 * ```
 */
export function waveletShrinkAt(y: ArrayLike<number>, options: WaveletShrinkOptions, thresholds: ArrayLike<number>): WaveletShrinkResult[] {
  for (let i = 0; i < thresholds.length; i++) {
    const t = thresholds[i];
    if (!(typeof t === 'number' && t >= 0 && t < Infinity)) throw new KnotwiseError('bad-option', `every threshold must be a finite number from 0; got ${typeof t === 'number' ? showNumber(t) : String(t)} at position ${i + 1}.`);
  }
  return shrinkAt(prepareShrink(y, options), Array.from(thresholds));
}

/** A validated shrinkage problem with its unshifted transform and noise level ({@link prepareShrink}). */
interface PreparedShrink {
  n: number;
  h: readonly number[];
  rule: 'universal' | 'sure';
  shrink: 'soft' | 'hard';
  boundary: 'reflect' | 'periodic';
  shifts: number;
  levels: number;
  filter: WaveletFilterName;
  ext: Float64Array;
  c0: Float64Array;
  sigma: number;
  maxDetail: number;
}

/** Validates the options and data (messages print the offending value) and takes the unshifted transform and the noise level. */
function prepareShrink(y: ArrayLike<number>, options: WaveletShrinkOptions): PreparedShrink {
  const n = y.length;
  const filter = options.filter ?? 'sym8';
  if (!(WAVELET_FILTER_NAMES as readonly string[]).includes(filter)) {
    throw new KnotwiseError('bad-option', `filter must be one of ${WAVELET_FILTER_NAMES.map((f) => `"${f}"`).join(', ')}; got ${JSON.stringify(filter)}.`);
  }
  const h = WAVELET_FILTERS[filter];
  const L = h.length;
  const rule = options.threshold ?? 'universal';
  if (rule !== 'universal' && rule !== 'sure') throw new KnotwiseError('bad-option', `threshold must be "universal" or "sure"; got ${JSON.stringify(rule)}.`);
  const shrink = options.shrink ?? 'soft';
  if (shrink !== 'soft' && shrink !== 'hard') throw new KnotwiseError('bad-option', `shrink must be "soft" or "hard"; got ${JSON.stringify(shrink)}.`);
  if (rule === 'sure' && shrink === 'hard') throw new KnotwiseError('bad-option', 'the "sure" threshold is derived for soft shrinkage; use shrink "soft" or threshold "universal".');
  const boundary = options.boundary ?? 'reflect';
  if (boundary !== 'reflect' && boundary !== 'periodic') throw new KnotwiseError('bad-option', `boundary must be "reflect" or "periodic"; got ${JSON.stringify(boundary)}.`);
  const shifts = options.shifts ?? 1;
  if (typeof shifts !== 'number' || !Number.isInteger(shifts) || shifts < 1 || shifts > 64) {
    throw new KnotwiseError('bad-option', `shifts must be a whole number from 1 to 64; got ${typeof shifts === 'number' ? showNumber(shifts) : String(shifts)}.`);
  }
  if (n < 4) throw new KnotwiseError('too-few-points', `wavelet shrinkage needs at least 4 points; got ${n}.`);
  const maxLevels = Math.max(1, Math.floor(Math.log2(n / (L - 1))));
  const levels = options.levels ?? maxLevels;
  if (typeof levels !== 'number' || !Number.isInteger(levels) || levels < 1 || levels > Math.max(1, Math.floor(Math.log2(n)))) {
    throw new KnotwiseError('bad-option', `levels must be a whole number from 1 to ${Math.max(1, Math.floor(Math.log2(n)))} for ${n} points; got ${typeof levels === 'number' ? showNumber(levels) : String(levels)}.`);
  }
  const ys = toFloat64(y);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(ys[i])) throw new KnotwiseError('bad-data', `y at position ${i + 1} is not a finite number: ${showNumber(ys[i])}.`);
  }
  if (options.x !== undefined) checkEqualSpacing(options.x, n);

  // extended series
  const ext = extendSeries(ys, levels, boundary);
  const M = ext.length;

  // noise from the unshifted transform
  const c0 = periodicDwt(ext, h, levels);
  const sigma = medianAbs(c0.subarray(M >> 1)) / 0.6745;
  let maxDetail = 0;
  for (let i = M >> levels; i < M; i++) maxDetail = Math.max(maxDetail, Math.abs(c0[i]));
  return { n, h, rule, shrink, boundary, shifts, levels, filter, ext, c0, sigma, maxDetail };
}

/**
 * The shrinkage of a prepared problem at each fixed threshold (one for every level), or by its rule
 * when `fixed` is null: per shift one forward transform, then for each threshold shrink a copy of the
 * coefficients and invert. Unchecked.
 */
function shrinkAt(p: PreparedShrink, fixed: number[] | null): WaveletShrinkResult[] {
  const { n, h, shrink, shifts, levels, ext, c0, sigma } = p;
  const M = ext.length;
  const sets: number[][] = fixed === null ? [ruleThresholds(p)] : fixed.map((t) => new Array<number>(levels).fill(t));
  const outs = sets.map(() => new Float64Array(n));
  const kept = new Array<number>(sets.length).fill(0);
  const shifted = shifts > 1 ? new Float64Array(M) : null;
  for (let s = 0; s < shifts; s++) {
    let cs: Float64Array;
    if (s === 0) cs = c0;
    else {
      for (let i = 0; i < M; i++) shifted![(i + s) % M] = ext[i];
      cs = periodicDwt(shifted!, h, levels);
    }
    for (let q = 0; q < sets.length; q++) {
      // the last threshold set of a shift shrinks the transform itself: nothing reads it afterwards
      // (the problem is prepared for this one call), and at 1e6 points a copy is 8 to 16 MB
      const c = q === sets.length - 1 ? cs : cs.slice();
      for (let j = 1; j <= levels; j++) {
        const t = sets[q][j - 1];
        const lo = M >> j, hi = M >> (j - 1);
        for (let i = lo; i < hi; i++) {
          const v = c[i];
          const a = Math.abs(v);
          if (shrink === 'soft') c[i] = a > t ? (v > 0 ? a - t : t - a) : 0;
          else if (!(a > t)) c[i] = 0;
          if (s === 0 && c[i] !== 0) kept[q]++;
        }
      }
      // only the values read below: the first n + s (the reflected boundary's transform is twice as long)
      const r = periodicIdwt(c, h, levels, Math.min(M, n + s));
      const out = outs[q];
      for (let i = 0; i < n; i++) out[i] += r[(i + s) % M];
    }
  }
  if (shifts > 1) for (const out of outs) for (let i = 0; i < n; i++) out[i] /= shifts;
  return sets.map((thresholds, q) => ({
    fitted: outs[q], sigma, thresholds, levels, filter: p.filter, boundary: p.boundary, transformLength: M, kept: kept[q], maxDetail: p.maxDetail,
    status: { converged: true, iterations: shifts, tolerance: 0, achieved: 0, stoppingRule: 'direct: one transform, shrinkage and inverse per shift' },
  }));
}

/** The thresholds of a problem's rule, finest level first: universal for every level, or SURE per level. Unchecked. */
function ruleThresholds(p: PreparedShrink): number[] {
  const { levels, c0, sigma, n } = p;
  const M = p.ext.length;
  const thresholds: number[] = [];
  for (let j = 1; j <= levels; j++) {
    if (p.rule === 'universal') thresholds.push(sigma * Math.sqrt(2 * Math.log(n)));
    else if (!(sigma > 0)) thresholds.push(0);
    else {
      const dj = c0.subarray(M >> j, M >> (j - 1));
      thresholds.push(sigma * sureThreshold(Float64Array.from(dj, (v) => v / sigma)).threshold);
    }
  }
  return thresholds;
}

/** Median of |v| (the engine's selection median, O(m) expected). Unchecked. */
function medianAbs(v: Float64Array): number {
  // a plain loop: a typed array's `from` with a mapping function is several times slower
  const a = new Float64Array(v.length);
  for (let i = 0; i < v.length; i++) a[i] = Math.abs(v[i]);
  return median(a);
}

/** Refuses unevenly spaced or non-finite x, with the worst spacing printed. */
function checkEqualSpacing(x: ArrayLike<number>, n: number): void {
  if (x.length !== n) throw new KnotwiseError('shape-mismatch', `x has ${x.length} values but y has ${n}.`);
  for (let i = 0; i < n; i++) if (!Number.isFinite(x[i])) throw new KnotwiseError('bad-data', `x at position ${i + 1} is not a finite number: ${showNumber(x[i])}.`);
  const step = (x[n - 1] - x[0]) / (n - 1);
  if (!(step > 0)) throw new KnotwiseError('bad-data', `x must increase; it runs from ${showNumber(x[0])} to ${showNumber(x[n - 1])}.`);
  let worst = 0, at = 1;
  for (let i = 1; i < n; i++) {
    const dev = Math.abs(x[i] - x[i - 1] - step);
    if (dev > worst) { worst = dev; at = i; }
  }
  if (worst > 1e-6 * step) {
    throw new KnotwiseError('bad-data', `wavelet shrinkage needs equally spaced x; the step from position ${at} to ${at + 1} is ${showNumber(x[at] - x[at - 1])} where the average step is ${showNumber(step)}. Use a method that accepts uneven spacing (the spline, trend filtering, Whittaker or LOESS), or fill the series onto a regular grid first.`);
  }
}
