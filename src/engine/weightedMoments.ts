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
  const n = y.length;
  let a = 0, b = 0;
  for (let i = 0; i < n; i++) { a = Math.max(a, Math.abs(y[i])); b = Math.max(b, w[i]); }
  // sums of products and squares overflow (or underflow) for |y| or w near the ends of the double range:
  // there, accumulate y / a and w / b (a = max |y|, b = max w) and scale back; elsewhere the plain sums
  const safe = (v: number) => v === 0 || (v > 1e-100 && v < 1e100);
  const sa = safe(a) ? 1 : a, sb = safe(b) ? 1 : b;
  let sw = 0, sy = 0;
  for (let i = 0; i < n; i++) { const wi = w[i] / sb; sw += wi; sy += wi * (y[i] / sa); }
  const m = sy / sw;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (w[i] / sb) * (y[i] / sa - m) ** 2;
  const sd = ss > 0 && Number.isFinite(ss) ? sa * Math.sqrt(ss / sw) : 1;
  return { mean: sa * m, sd, meanWeight: sb * (sw / n) };
}
