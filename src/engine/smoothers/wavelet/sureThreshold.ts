/**
 * The SureShrink threshold for one level of wavelet coefficients already divided
 * by the noise level (D. L. Donoho and I. M. Johnstone, "Adapting to unknown
 * smoothness via wavelet shrinkage", J. Amer. Statist. Assoc. 90 (1995) 1200-1224):
 *
 *   SURE(t) = d - 2 #{i : |x_i| <= t} + sum_i min(x_i^2, t^2),
 *
 * Stein's unbiased estimate of the risk of soft thresholding at t, minimised over
 * t in {0} and the |x_i| up to the universal threshold sqrt(2 log d). Their hybrid
 * rule: when the level looks sparse, s_d^2 = (sum x_i^2 - d) / d <= (log2 d)^(3/2) / sqrt(d),
 * the universal threshold sqrt(2 log d) is used instead. O(d log d) (one sort).
 *
 * @param x - coefficients of one level divided by sigma
 * @returns the threshold, in units of sigma, and whether the hybrid rule chose the universal one
 * @example
 * ```ts
 * sureThreshold(Float64Array.of(0.1, -0.3, 8, 0.2)).threshold; // sqrt(2 log 4) (sparse level)
 * ```
 * Unchecked.
 */
export function sureThreshold(x: Float64Array): { threshold: number; universal: boolean } {
  const d = x.length;
  const tU = Math.sqrt(2 * Math.log(Math.max(d, 2)));
  if (d === 0) return { threshold: tU, universal: true };
  let ss = 0;
  for (let i = 0; i < d; i++) ss += x[i] * x[i];
  const s2 = (ss - d) / d;
  if (s2 <= Math.pow(Math.log2(Math.max(d, 2)), 1.5) / Math.sqrt(d)) return { threshold: tU, universal: true };
  const a = Float64Array.from(x, Math.abs).sort();
  // SURE at t = a_k (k = 0..d-1, counting a_0..a_k as <= t, ties included by ascending order):
  // d - 2 (k + 1) + sum_{i <= k} a_i^2 + (d - k - 1) a_k^2
  let best = d, bestT = 0; // t = 0: SURE = d - 2 #{x_i = 0} + 0 >= ... computed below
  let zeros = 0;
  for (let i = 0; i < d; i++) if (a[i] === 0) zeros++;
  best = d - 2 * zeros;
  let cum = 0;
  for (let k = 0; k < d; k++) {
    const t = a[k];
    cum += t * t;
    if (t > tU) break;
    if (k + 1 < d && a[k + 1] === t) continue; // count all ties at t
    const risk = d - 2 * (k + 1) + cum + (d - k - 1) * t * t;
    if (risk < best) { best = risk; bestT = t; }
  }
  return { threshold: bestT, universal: false };
}
