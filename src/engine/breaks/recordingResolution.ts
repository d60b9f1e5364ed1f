/**
 * The resolution at which values were recorded: the largest q such that every
 * value is a whole multiple of q away from the smallest one. Returns 0 when the
 * values show no such grid (continuous data), when fewer than three distinct values
 * exist, or when the grid is too fine to tell apart from the doubles' own rounding.
 *
 * Scale and offset free: q is sought among the smallest gap between distinct values
 * divided by 1..10 (refined by least squares over every difference), and a candidate
 * is accepted when every difference from the smallest value is a whole multiple of it
 * within 8 times the rounding error of a difference, 4 eps max|y| (eps = 2^-52). So prices
 * near 1e9 recorded to the cent give 0.01, and the same prices times 1e-9 or 1e15
 * give 1e-11 and 1e13; a relative tolerance on the values themselves would take
 * 1e9 + 0.13 for a whole number.
 *
 * Used to floor segment variances of rounded data at q^2 / 12, the variance of a
 * rounding error uniform on [-q/2, q/2] (W. F. Sheppard, "On the calculation of
 * the most probable values of frequency-constants, for data arranged according
 * to equidistant divisions of a scale", Proc. London Math. Soc. 29 (1898)):
 * below it a segment's spread says nothing about the process, only about the
 * rounding. Unchecked: values finite.
 *
 * @example
 * ```ts
 * recordingResolution(Float64Array.of(3.17, 3.31, 3.2)); // 0.01
 * ```
 */
export function recordingResolution(y: ArrayLike<number>): number {
  const s = Float64Array.from(y).sort();
  const distinct: number[] = [];
  for (let i = 0; i < s.length; i++) if (i === 0 || s[i] !== s[i - 1]) distinct.push(s[i]);
  const m = distinct.length;
  if (m < 3) return 0;
  const base = distinct[0];
  const big = Math.max(Math.abs(base), Math.abs(distinct[m - 1]));
  const err = 4 * Number.EPSILON * big;
  let gap = Infinity;
  for (let i = 1; i < m; i++) gap = Math.min(gap, distinct[i] - distinct[i - 1]);
  const span = distinct[m - 1] - base;
  if (!(gap > 0) || !Number.isFinite(span)) return 0;
  for (let k = 1; k <= 10; k++) {
    const q = gap / k;
    // the test must be able to fail: rounding each difference to a multiple of q stays
    // unambiguous, and the error allowed stays below q / 100
    if ((err * span) / (q * q) > 0.25 || 8 * err > q / 100) return 0;
    // multiples from the first guess, then q refined by least squares on them
    let num = 0, den = 0;
    for (let i = 1; i < m; i++) { const d = distinct[i] - base; const r = Math.round(d / q); num += r * d; den += r * r; }
    const qq = num / den;
    let ok = true;
    for (let i = 1; i < m && ok; i++) {
      const d = distinct[i] - base;
      if (Math.abs(d - Math.round(d / qq) * qq) > 8 * err) ok = false;
    }
    if (ok) return Number(qq.toPrecision(12));
  }
  return 0;
}
