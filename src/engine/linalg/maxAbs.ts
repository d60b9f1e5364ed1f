/**
 * max_i |v_i|, folded with Math.max from 0 in index order (0 for no entries; NaN when an entry is NaN).
 *
 * @example
 * ```ts
 * maxAbs(Float64Array.of(1, -3, 2)); // 3
 * ```
 * Unchecked.
 */
export function maxAbs(v: Float64Array): number {
  let mx = 0;
  for (let i = 0; i < v.length; i++) mx = Math.max(mx, Math.abs(v[i]));
  return mx;
}
