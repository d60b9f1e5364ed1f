import { median } from '../../median';

/**
 * Robust noise standard deviation from first differences: with
 * d_i = (y_{i+1} - y_i) / sqrt(1/w_i + 1/w_{i+1}) (unit variance per sigma^2 when
 * var(y_i) = sigma^2 / w_i), sigma = 1.4826 * median |d_i - median(d)|.
 * For unit weights this is the MAD of first differences divided by sqrt(2),
 * common practice for smooth signals (the trend contributes little to a
 * difference of neighbours). Returns 0 for fewer than 2 points.
 * Unchecked.
 */
export function differenceNoiseScale(y: ArrayLike<number>, w: ArrayLike<number>): number {
  const n = y.length;
  if (n < 2) return 0;
  const d = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) d[i] = (y[i + 1] - y[i]) / Math.sqrt(1 / w[i] + 1 / w[i + 1]);
  const med = median(d);
  for (let i = 0; i < n - 1; i++) d[i] = Math.abs(d[i] - med);
  return 1.4826 * median(d);
}

