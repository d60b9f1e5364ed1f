/**
 * The series a periodic wavelet transform of `levels` levels works on (see
 * {@link waveletShrink} for why): 'reflect' pads the end by mirror reflection
 * to a multiple of 2^(levels-1) and appends the mirror image of the whole, so
 * the extended series is symmetric at both ends and a trending series shows no
 * jump where the period wraps (length about 2n); 'periodic' pads the end by
 * mirror reflection to a multiple of 2^levels (length about n). The first n
 * values are y. Unchecked: y finite, n >= 1, levels >= 1.
 *
 * @example
 * ```ts
 * extendSeries(Float64Array.of(1, 2, 3), 1, 'reflect'); // [1, 2, 3, 3, 2, 1]
 * ```
 */
export function extendSeries(y: Float64Array, levels: number, boundary: 'reflect' | 'periodic'): Float64Array {
  const n = y.length;
  const block = boundary === 'reflect' ? 1 << (levels - 1) : 1 << levels;
  const padded = Math.ceil(n / block) * block;
  const M = boundary === 'reflect' ? 2 * padded : padded;
  const ext = new Float64Array(M);
  for (let i = 0; i < n; i++) ext[i] = y[i];
  for (let i = n; i < padded; i++) ext[i] = y[mirrorIndex(i, n)];
  if (boundary === 'reflect') for (let i = 0; i < padded; i++) ext[M - 1 - i] = ext[i];
  return ext;
}

/** Index into 0..n-1 of position i >= 0 of the half-sample mirror extension (y_{n-1}, y_{n-2}, ... after the end). Unchecked. */
function mirrorIndex(i: number, n: number): number {
  const p = i % (2 * n);
  return p < n ? p : 2 * n - 1 - p;
}
