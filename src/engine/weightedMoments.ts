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
 * Safe at any magnitude the doubles allow: sums are accumulated on y / max|y| and
 * w / max w, then scaled back.
 * Unchecked: n >= 1, weights positive.
 */
export function weightedMoments(y: ArrayLike<number>, w: ArrayLike<number>): { mean: number; sd: number; meanWeight: number } {
  // sums of products and squares can overflow (or underflow) for |y| or w near the ends of the double range:
  // accumulate y / a and w / b, with a = max |y| and b = max w, and scale back
  const n = y.length;
  let a = 0, b = 0;
  for (let i = 0; i < n; i++) { a = Math.max(a, Math.abs(y[i])); b = Math.max(b, w[i]); }
  if (!(a > 0)) a = 1;
  if (!(b > 0)) b = 1;
  let sw = 0, sy = 0;
  for (let i = 0; i < n; i++) { const wi = w[i] / b; sw += wi; sy += wi * (y[i] / a); }
  const m = sy / sw;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (w[i] / b) * (y[i] / a - m) ** 2;
  const sd = ss > 0 && Number.isFinite(ss) ? a * Math.sqrt(ss / sw) : 1;
  return { mean: a * m, sd, meanWeight: b * (sw / n) };
}
