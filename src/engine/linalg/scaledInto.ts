/**
 * to_i = sc from_i for i < m (a warm start's dual moved to a new scale, for example).
 *
 * @example
 * ```ts
 * scaledInto(2, Float64Array.of(1, -3), new Float64Array(2), 2); // [2, -6]
 * ```
 * Unchecked: both arrays have at least m entries.
 */
export function scaledInto(sc: number, from: Float64Array, to: Float64Array, m: number): void {
  for (let i = 0; i < m; i++) to[i] = sc * from[i];
}
