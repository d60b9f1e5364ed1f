/**
 * The sum of the entries, added in index order from 0 (a trace of leverages, for example).
 *
 * @example
 * ```ts
 * sum(Float64Array.of(0.5, 0.25, 0.25)); // 1
 * ```
 * Unchecked.
 */
export function sum(v: Float64Array): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i];
  return s;
}
