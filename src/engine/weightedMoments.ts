/**
 * Weighted mean and standard deviation of y, and the mean weight: the internal
 * scales of the smoothers and of the mean-variance changepoint cost.
 *
 *   mean = sum w y / sum w,  sd = sqrt(sum w (y - mean)^2 / sum w)  (1 when that is 0 or not finite),
 *   meanWeight = sum w / n.
 *
 * @example
 * ```ts
 * weightedMoments(Float64Array.of(1, 3), Float64Array.of(1, 1)); // { mean: 2, sd: 1, meanWeight: 1 }
 * ```
 * Unchecked: n >= 1, weights positive.
 */
export function weightedMoments(y: ArrayLike<number>, w: ArrayLike<number>): { mean: number; sd: number; meanWeight: number } {
  const n = y.length;
  let sw = 0, sy = 0;
  for (let i = 0; i < n; i++) { sw += w[i]; sy += w[i] * y[i]; }
  const mean = sy / sw;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += w[i] * (y[i] - mean) ** 2;
  const sd = ss > 0 && Number.isFinite(ss) ? Math.sqrt(ss / sw) : 1;
  return { mean, sd, meanWeight: sw / n };
}
