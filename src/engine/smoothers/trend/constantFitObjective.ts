/**
 * The objective of the constant fit, e0 = 1/2 sum w_i (y_i - ybar)^2 with ybar
 * the weighted mean: the scale against which the trend solvers measure duality
 * gaps (the smallest gap worth resolving is 1e-12 e0). Unchecked.
 */
export function constantFitObjective(y: Float64Array, w: Float64Array): number {
  // two functions, each ending with its loop (DEVELOPERS.md, "Long loops and the first call")
  return halfWeightedSquares(y, w, weightedMean(y, w));
}

/** sum w_i y_i / sum w_i. Unchecked. */
function weightedMean(y: Float64Array, w: Float64Array): number {
  let ybar = 0, sw = 0;
  for (let i = 0; i < y.length; i++) { ybar += w[i] * y[i]; sw += w[i]; }
  return ybar / sw;
}

/** 1/2 sum w_i (y_i - c)^2. Unchecked. */
function halfWeightedSquares(y: Float64Array, w: Float64Array, c: number): number {
  let e0 = 0;
  for (let i = 0; i < y.length; i++) e0 += 0.5 * w[i] * (y[i] - c) ** 2;
  return e0;
}
