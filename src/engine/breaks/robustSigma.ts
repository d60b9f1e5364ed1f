/**
 * Robust noise scale from differences.
 */

import { median } from '../median';

/**
 * Noise standard deviation estimated from lag differences, robust to level shifts
 * (or, with order 2, to slope changes):
 *
 *   order 1: sigma = 1.4826 * MAD(y[i+1] - y[i]) / sqrt(2)
 *   order 2: sigma = 1.4826 * MAD(y[i+2] - 2 y[i+1] + y[i]) / sqrt(6)
 *
 * MAD is the median absolute deviation from the median; 1.4826 makes it consistent
 * for Gaussian noise, and sqrt(2), sqrt(6) are the standard deviations of the first
 * and second difference of unit white noise. Common practice in the changepoint
 * literature (e.g. Fryzlewicz 2014, Ann Stat 42:2243), no single source.
 * Assumes roughly equally spaced points and independent noise; a few breaks barely
 * move it. Returns 0 when most differences are equal (then use another scale).
 *
 * @param y - values in x order
 * @param order - 1 or 2
 * @example
 * ```ts
 * differenceSigma(Float64Array.of(1, 2, 1, 2, 11, 12, 11), 1);
 * ```
 */
export function differenceSigma(y: ArrayLike<number>, order: 1 | 2): number {
  const n = y.length;
  const m = n - order;
  if (m < 1) return 0;
  const d = new Float64Array(m);
  for (let i = 0; i < m; i++) d[i] = order === 1 ? y[i + 1] - y[i] : y[i + 2] - 2 * y[i + 1] + y[i];
  const med = median(d);
  for (let i = 0; i < m; i++) d[i] = Math.abs(d[i] - med);
  return (1.4826 * median(d)) / Math.sqrt(order === 1 ? 2 : 6);
}

/** Standard deviation of the order-1 or order-2 differences, scaled as in {@link differenceSigma} (non-robust fallback). Unchecked. */
export function differenceSd(y: ArrayLike<number>, order: 1 | 2): number {
  const n = y.length;
  const m = n - order;
  if (m < 2) return 0;
  let s = 0;
  let ss = 0;
  for (let i = 0; i < m; i++) {
    const d = order === 1 ? y[i + 1] - y[i] : y[i + 2] - 2 * y[i + 1] + y[i];
    s += d; ss += d * d;
  }
  const v = (ss - (s * s) / m) / (m - 1);
  return Math.sqrt(v > 0 ? v : 0) / Math.sqrt(order === 1 ? 2 : 6);
}
