/**
 * Robust noise scale of a decomposition's remainder, at unit weight:
 *
 *   sigma = 1.4826 * median_i( sqrt(w_i) |y_i - t_i - s_i| ) * sqrt(n / (n - p))
 *
 * over every clean point, spikes included (y - t - s is remainder + spikes): the median ignores
 * a few large departures, so the spikes do not inflate it. 1.4826 makes the median absolute
 * value consistent for Gaussian noise of mean 0 (common practice; the remainder of a fit with a
 * trend has mean near 0, so the median about 0 is used rather than about the median).
 * sqrt(n / (n - p)) corrects for the p parameters the fit spent (as n - p degrees of freedom do for
 * the residual variance of least squares, common practice; applied to the robust scale as an
 * approximation): without it, on short series (36 monthly points with a month-of-year season) the
 * scale came out about a quarter below the noise sd. p = 0 gives the plain scale. Returns NaN when
 * p >= n - 1 (too few points left to estimate a scale).
 * Units: those of y times sqrt(weight). Unchecked: equal lengths, weights > 0.
 *
 * @example
 * ```ts
 * remainderScale(y, trend, season, w, knots + order + 1 + seasonDf + spikes);   // sd of the remainder, robustly
 * ```
 */
import { median } from '../median';

export function remainderScale(y: ArrayLike<number>, trend: ArrayLike<number>, season: ArrayLike<number>, w: ArrayLike<number>, p = 0): number {
  const n = y.length;
  if (!(n - p >= 2)) return NaN;
  const a = new Float64Array(n);
  for (let i = 0; i < n; i++) a[i] = Math.sqrt(w[i]) * Math.abs(y[i] - trend[i] - season[i]);
  return 1.4826 * median(a) * Math.sqrt(n / (n - p));
}
