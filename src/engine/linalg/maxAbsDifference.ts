/**
 * max_i |a_i - b_i| over i < m, folded with Math.max from 0 in index order (0 for m = 0; NaN when a
 * difference is NaN).
 *
 * @example
 * ```ts
 * maxAbsDifference(Float64Array.of(1, 5), Float64Array.of(2, 2), 2); // 3
 * ```
 * Unchecked: both arrays have at least m entries.
 */
export function maxAbsDifference(a: Float64Array, b: Float64Array, m: number): number {
  let mx = 0;
  for (let i = 0; i < m; i++) mx = Math.max(mx, Math.abs(a[i] - b[i]));
  return mx;
}
