/**
 * to_i = from_i / c for i < m (a dual moved to a new scale by division, which keeps it bit for bit what a
 * division gives, unlike scaling by 1 / c ({@link scaledInto})). `to` may be `from`.
 *
 * @example
 * ```ts
 * dividedInto(Float64Array.of(3, -6), 3, new Float64Array(2), 2); // [1, -2]
 * ```
 * Unchecked: both arrays have at least m entries.
 */
export function dividedInto(from: Float64Array, c: number, to: Float64Array, m: number): void {
  for (let i = 0; i < m; i++) to[i] = from[i] / c;
}
