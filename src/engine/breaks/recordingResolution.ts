/**
 * The resolution at which values were recorded: the largest q such that every
 * value is a whole multiple of q away from the smallest one, for values written
 * with at most 8 decimals (the greatest common divisor of the scaled
 * differences). Returns 0 when the values show no such grid (continuous data),
 * or when fewer than three distinct values exist.
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
  if (distinct.length < 3) return 0;
  // Values recorded with d decimals are whole numbers once scaled by 10^d; the
  // resolution is then the greatest common divisor of their differences.
  for (let d = 0; d <= 8; d++) {
    const f = Math.pow(10, d);
    const ints = distinct.map((v) => v * f);
    if (ints.some((v) => Math.abs(v) > 2 ** 52)) return 0;
    if (!ints.every((v) => Math.abs(v - Math.round(v)) <= 1e-9 * Math.max(1, Math.abs(v)))) continue;
    let g = 0;
    const base = Math.round(ints[0]);
    for (const v of ints) g = gcd(g, Math.abs(Math.round(v) - base));
    return g / f;
  }
  return 0;
}

function gcd(a: number, b: number): number {
  while (b) { const t = a % b; a = b; b = t; }
  return a;
}
