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
  // each pass is a kernel of its own, one long loop and a return (DEVELOPERS.md, "Long loops and
  // the first call"); each sum is added in index order as before
  const a = largestMagnitude(y, n), b = largestWeight(w, n);
  // sums of products and squares overflow (or underflow) for |y| or w near the ends of the double range:
  // there, accumulate y / a and w / b (a = max |y|, b = max w) and scale back; elsewhere the plain sums
  const safe = (v: number) => v === 0 || (v > 1e-100 && v < 1e100);
  const sa = safe(a) ? 1 : a, sb = safe(b) ? 1 : b;
  const sw = scaledWeightSum(w, sb, n), sy = scaledProductSum(y, w, sa, sb, n);
  const m = sy / sw;
  const ss = scaledSquareSum(y, w, sa, sb, m, n);
  const sd = ss > 0 && Number.isFinite(ss) ? sa * Math.sqrt(ss / sw) : 1;
  return { mean: sa * m, sd, meanWeight: sb * (sw / n) };
}

/** max(0, max |y_i|), NaN when an entry is NaN (as Math.max). Unchecked. */
function largestMagnitude(y: ArrayLike<number>, n: number): number {
  let a = 0;
  for (let i = 0; i < n; i++) a = Math.max(a, Math.abs(y[i]));
  return a;
}

/** max(0, max w_i). Unchecked. */
function largestWeight(w: ArrayLike<number>, n: number): number {
  let b = 0;
  for (let i = 0; i < n; i++) b = Math.max(b, w[i]);
  return b;
}

/** sum w_i / sb. Unchecked. */
function scaledWeightSum(w: ArrayLike<number>, sb: number, n: number): number {
  let sw = 0;
  for (let i = 0; i < n; i++) sw += w[i] / sb;
  return sw;
}

/** sum (w_i / sb) (y_i / sa). Unchecked. */
function scaledProductSum(y: ArrayLike<number>, w: ArrayLike<number>, sa: number, sb: number, n: number): number {
  let sy = 0;
  for (let i = 0; i < n; i++) sy += (w[i] / sb) * (y[i] / sa);
  return sy;
}

/** sum (w_i / sb) (y_i / sa - m)^2. Unchecked. */
function scaledSquareSum(y: ArrayLike<number>, w: ArrayLike<number>, sa: number, sb: number, m: number, n: number): number {
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (w[i] / sb) * (y[i] / sa - m) ** 2;
  return ss;
}
