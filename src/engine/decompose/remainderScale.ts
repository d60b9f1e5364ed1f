/**
 * Robust noise scale of a decomposition's remainder, at unit weight:
 *
 *   sigma = 1.4826 * median_i( sqrt(w_i) |y_i - t_i - s_i| )
 *
 * over every clean point, spikes included (y - t - s is remainder + spikes): the median ignores
 * a few large departures, so the spikes do not inflate it. 1.4826 makes the median absolute
 * value consistent for Gaussian noise of mean 0 (common practice; the remainder of a fit with a
 * trend has mean near 0, so the median about 0 is used rather than about the median).
 * Units: those of y times sqrt(weight). Unchecked: equal lengths, weights > 0.
 *
 * @example
 * ```ts
 * remainderScale(y, trend, season, w);   // sd of the remainder, robustly
 * ```
 */
import { median } from '../median';

export function remainderScale(y: ArrayLike<number>, trend: ArrayLike<number>, season: ArrayLike<number>, w: ArrayLike<number>): number {
  const n = y.length;
  const a = new Float64Array(n);
  for (let i = 0; i < n; i++) a[i] = Math.sqrt(w[i]) * Math.abs(y[i] - trend[i] - season[i]);
  return n ? 1.4826 * median(a) : 0;
}
