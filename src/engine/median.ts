/** Median of a copy of `a` (NaN when empty). Unchecked. */
export function median(a: ArrayLike<number>): number {
  const n = a.length;
  if (n === 0) return NaN;
  const s = Float64Array.from(a).sort();
  return n % 2 ? s[(n - 1) >> 1] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
}
