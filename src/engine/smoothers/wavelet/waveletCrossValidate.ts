/**
 * A wavelet threshold chosen by K-fold cross-validation on the shared folds
 * ({@link crossValidate}), so wavelet shrinkage competes with the other
 * smoothers on the same held-out points (used by `auto`, and by
 * `threshold=cv`).
 *
 * The transform needs every position of the equally spaced grid, so a fold
 * fit fills the held-out positions (and the neighbours left out with them)
 * by straight lines between the nearest training values (constant beyond the
 * first and last), shrinks that completed series with one threshold t for
 * every level, and predicts the held-out points by the result there. This is
 * the interpolation scheme of G. P. Nason, "Wavelet shrinkage using
 * cross-validation", JRSS B 58 (1996) 463-479, applied to general folds: the
 * prediction uses training values only.
 *
 * Grid: 25 thresholds, log-spaced from 0.05 sigma (nearly every detail kept)
 * to the largest |detail coefficient| of the whole series (every detail
 * removed: the coarsest approximation), sigma = median |finest details| /
 * 0.6745; the whole series only sets the range. The penalty reported is
 * t, in units of y; df is the number of coefficients kept, as in
 * {@link fitWavelet}.
 */
import type { RunContext } from '../../analysis/runContext';
import { choosePenalty } from '../../select/choosePenalty';
import { crossValidate, type FoldPredictor } from '../../select/crossValidate';
import { foldPlan} from '../../select/noiseDependence';
import type { Series } from '../../series';
import type { Criterion, CriterionPoint, NoiseAssumption } from '../../types';
import { waveletShrink, waveletShrinkAt, type WaveletShrinkOptions, type WaveletShrinkResult } from './waveletShrink';

/** Result of {@link waveletCrossValidate}. */
export interface WaveletChoice {
  /** The chosen threshold (units of y). */
  threshold: number;
  /** The full-data shrinkage at that threshold. */
  shrink: WaveletShrinkResult;
  criterion: Criterion;
  /** Which end of the grid the minimum fell on, if any. */
  side?: 'rough' | 'smooth';
}

/** df of a shrinkage: coefficients kept (approximation plus nonzero details), per data point. Unchecked. */
export function waveletDf(r: WaveletShrinkResult, n: number): number {
  return ((r.kept + (r.transformLength >> r.levels)) * n) / r.transformLength;
}

/**
 * Chooses one threshold for all levels by cross-validation. Unchecked: `folds` is
 * from 2 to n - 2. The shape options and the equal spacing of `shape.x` (when given)
 * are checked by the first {@link waveletShrink} call.
 *
 * @param pick - 'minimum' (threshold=cv) or 'simpler' (the one-standard-error rule)
 * @example
 * ```ts
 * const c = waveletCrossValidate(series, { filter: 'sym8' }, 5, 'minimum', QUIET);
 * c.threshold; c.criterion.curve;
 * ```
 */
export function waveletCrossValidate(series: Series, shape: WaveletShrinkOptions, folds: number, pick: 'minimum' | 'simpler', context: RunContext, noise?: NoiseAssumption): WaveletChoice {
  const n = series.n;
  const y = series.y;
  const base: WaveletShrinkOptions = { ...shape, threshold: 'universal' };
  delete base.x;
  const probe = waveletShrink(y, { ...base, ...(shape.x !== undefined ? { x: shape.x } : {}) });
  const G = 25;
  const top = probe.maxDetail > 0 ? probe.maxDetail : spreadOf(y);
  const low = Math.min(top / 100, probe.sigma > 0 ? 0.05 * probe.sigma : top / 100);
  const grid = Float64Array.from({ length: G }, (_, j) => Math.exp(Math.log(low) + (j * (Math.log(top) - Math.log(low))) / (G - 1)));
  const cv = crossValidate(y, series.w, folds, grid, waveletFoldPredictor(y, base), context, 'cross-validation of wavelet thresholds', foldPlan(y, folds, noise));
  const fits = waveletShrinkAt(y, base, grid);
  const curve: CriterionPoint[] = Array.from(grid, (t, j) => ({ penalty: t, score: cv.score[j], se: cv.se[j], df: waveletDf(fits[j], n) }));
  const best = choosePenalty(curve, pick);
  const minimum = choosePenalty(curve, 'minimum');
  return {
    side: minimum === 0 ? 'rough' : minimum === G - 1 ? 'smooth' : undefined,
    threshold: grid[best],
    shrink: fits[best],
    criterion: { name: 'cv', value: curve[best].score, curve, atEdge: minimum === 0 || minimum === G - 1 },
  };
}

/**
 * The fold predictor: fills the non-training positions from training values only
 * ({@link fillFromTraining}), shrinks with one threshold per penalty, and returns the
 * result at the held-out positions. Unchecked: `shape` valid, y equally spaced.
 */
export function waveletFoldPredictor(y: Float64Array, shape: WaveletShrinkOptions): FoldPredictor {
  const filled = new Float64Array(y.length);
  return (train, held, pens) => {
    fillFromTraining(y, train, filled);
    // one forward transform for every threshold of the grid
    return waveletShrinkAt(filled, shape, pens).map((r) => Float64Array.from(held, (i) => r.fitted[i]));
  };
}

/**
 * Training values at their positions; every other position gets the straight line
 * between the nearest training positions on either side (the nearest one beyond the
 * ends). Unchecked: `train` increasing and non-empty.
 */
function fillFromTraining(y: Float64Array, train: Int32Array, out: Float64Array): void {
  const n = out.length;
  const first = train[0], last = train[train.length - 1];
  for (let i = 0; i <= first; i++) out[i] = y[first];
  for (let i = last; i < n; i++) out[i] = y[last];
  for (let a = 0; a + 1 < train.length; a++) {
    const i0 = train[a], i1 = train[a + 1];
    out[i0] = y[i0];
    for (let i = i0 + 1; i < i1; i++) out[i] = y[i0] + ((y[i1] - y[i0]) * (i - i0)) / (i1 - i0);
  }
}

/** A positive scale for the grid when the finest details are all zero (noise-free data). Unchecked. */
function spreadOf(y: Float64Array): number {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < y.length; i++) { if (y[i] < lo) lo = y[i]; if (y[i] > hi) hi = y[i]; }
  return hi > lo ? (hi - lo) * 1e-3 : 1;
}
