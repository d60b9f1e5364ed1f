/**
 * Robust noise scale from differences: shared by the changepoint models (their noise
 * scale) and trend filtering (SURE).
 */

import { median } from './median';
import { showNumber } from './errors';

/** d_i of order 1 or 2 divided by its standard deviation per sigma (var(y_i) = sigma^2 / w_i). Unchecked. */
function scaledDifferences(y: ArrayLike<number>, order: 1 | 2, w?: ArrayLike<number>): Float64Array {
  const m = Math.max(0, y.length - order);
  const d = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    if (order === 1) d[i] = (y[i + 1] - y[i]) / (w ? Math.sqrt(1 / w[i] + 1 / w[i + 1]) : Math.SQRT2);
    else d[i] = (y[i + 2] - 2 * y[i + 1] + y[i]) / (w ? Math.sqrt(1 / w[i] + 4 / w[i + 1] + 1 / w[i + 2]) : Math.sqrt(6));
  }
  return d;
}

/**
 * Noise standard deviation estimated from lag differences, robust to level shifts
 * (or, with order 2, to slope changes):
 *
 *   order 1: sigma = 1.4826 * MAD(d),  d_i = (y[i+1] - y[i]) / sqrt(1/w_i + 1/w_{i+1})
 *   order 2: sigma = 1.4826 * MAD(d),  d_i = (y[i+2] - 2 y[i+1] + y[i]) / sqrt(1/w_i + 4/w_{i+1} + 1/w_{i+2})
 *
 * so that d has unit variance per sigma^2 when var(y_i) = sigma^2 / w_i; without
 * weights the divisors are sqrt(2) and sqrt(6). MAD is the median absolute deviation
 * from the median; 1.4826 makes it consistent for Gaussian noise. Common practice in
 * the changepoint and smoothing literature (e.g. Fryzlewicz 2014, Ann Stat 42:2243),
 * no single source. Assumes roughly equally spaced points and independent noise; a few
 * breaks barely move it. Returns 0 when most differences are equal (then use another
 * scale, see {@link noiseScale}).
 *
 * @param y - values in x order
 * @param order - 1 or 2
 * @param w - optional weights (inverse variances up to sigma^2)
 * @example
 * ```ts
 * differenceSigma(Float64Array.of(1, 2, 1, 2, 11, 12, 11), 1);
 * ```
 */
export function differenceSigma(y: ArrayLike<number>, order: 1 | 2, w?: ArrayLike<number>): number {
  const d = scaledDifferences(y, order, w);
  if (d.length < 1) return 0;
  const med = median(d);
  for (let i = 0; i < d.length; i++) d[i] = Math.abs(d[i] - med);
  return 1.4826 * median(d);
}

/** Standard deviation of the scaled differences of {@link differenceSigma} (non-robust fallback). Unchecked. */
export function differenceSd(y: ArrayLike<number>, order: 1 | 2, w?: ArrayLike<number>): number {
  const d = scaledDifferences(y, order, w);
  const m = d.length;
  if (m < 2) return 0;
  let s = 0, ss = 0;
  for (let i = 0; i < m; i++) { s += d[i]; ss += d[i] * d[i]; }
  const v = (ss - (s * s) / m) / (m - 1);
  return Math.sqrt(v > 0 ? v : 0);
}

/**
 * The noise scale a model uses when none is given: {@link differenceSigma}; where most
 * differences are equal (it is 0), the standard deviation of the differences with a note;
 * where that is 0 too (a constant series, points on one line, too few points), 1 with a note.
 *
 * @param y - values in x order
 * @param order - 1 (level changes) or 2 (slope changes)
 * @returns the scale, and the note to pass on when a fallback was used
 * Unchecked.
 */
export function noiseScale(y: ArrayLike<number>, order: 1 | 2): { value: number; note?: string } {
  const robust = differenceSigma(y, order);
  if (robust > 0) return { value: robust };
  const what = order === 1 ? 'successive differences' : 'second differences';
  const sd = differenceSd(y, order);
  if (sd > 0) {
    return { value: sd, note: `most ${what} are equal, so the robust noise estimate (MAD of ${what}) is 0; their standard deviation / sqrt(${order === 1 ? 2 : 6}) = ${showNumber(sd)} was used instead. Give sigma to control the scale.` };
  }
  const why = order === 1 ? 'constant series or fewer than 3 points' : 'points on one straight line, or fewer than 4 distinct x';
  return { value: 1, note: `the noise scale cannot be estimated (${why}); sigma = 1 (y units) was used. Give sigma to set it.` };
}
