/**
 * The objective of the constant fit, e0 = 1/2 sum w_i (y_i - ybar)^2 with ybar
 * the weighted mean: the scale against which the trend solvers measure duality
 * gaps (the smallest gap worth resolving is 1e-12 e0). Unchecked.
 */
export function constantFitObjective(y: Float64Array, w: Float64Array): number {
  const n = y.length;
  let ybar = 0, sw = 0;
  for (let i = 0; i < n; i++) { ybar += w[i] * y[i]; sw += w[i]; }
  ybar /= sw;
  let e0 = 0;
  for (let i = 0; i < n; i++) e0 += 0.5 * w[i] * (y[i] - ybar) ** 2;
  return e0;
}
