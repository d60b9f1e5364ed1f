/**
 * Evaluates a natural cubic spline given its values g and second derivatives
 * gamma at the knots x (Green & Silverman 1994, eq. 2.5):
 *
 *   f(t) = ((t - x_i) g_{i+1} + (x_{i+1} - t) g_i) / h_i
 *          - (t - x_i)(x_{i+1} - t)/6 * ((1 + (t - x_i)/h_i) gamma_{i+1} + (1 + (x_{i+1} - t)/h_i) gamma_i)
 *
 * for x_i <= t <= x_{i+1}; beyond the ends the natural spline is the straight
 * line with the end slope. Unchecked: x strictly increasing, n >= 2.
 */
export function evaluateNaturalCubic(x: ArrayLike<number>, g: ArrayLike<number>, gamma: ArrayLike<number>, t: number): number {
  const n = x.length;
  if (t <= x[0]) {
    const h = x[1] - x[0];
    const slope = (g[1] - g[0]) / h - (h / 6) * (2 * gamma[0] + gamma[1]);
    return g[0] + slope * (t - x[0]);
  }
  if (t >= x[n - 1]) {
    const h = x[n - 1] - x[n - 2];
    const slope = (g[n - 1] - g[n - 2]) / h + (h / 6) * (gamma[n - 2] + 2 * gamma[n - 1]);
    return g[n - 1] + slope * (t - x[n - 1]);
  }
  let lo = 0, hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (x[mid] <= t) lo = mid; else hi = mid;
  }
  const h = x[hi] - x[lo];
  const a = t - x[lo];
  const b = x[hi] - t;
  return (a * g[hi] + b * g[lo]) / h - ((a * b) / 6) * ((1 + a / h) * gamma[hi] + (1 + b / h) * gamma[lo]);
}
