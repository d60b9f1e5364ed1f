/**
 * A cross-validation fold's data: the training points' x, y and weights, the held-out x, and
 * the training weights' sum, gathered from the series' arrays by the fold's index lists (as
 * crossValidate hands them to a predictor). Unchecked.
 *
 * @param x - positions of all points
 * @param y - values of all points
 * @param w - weights of all points
 * @param train - indices of the training points, increasing
 * @param heldOut - indices of the held-out points, increasing
 * @example
 * ```ts
 * const { xt, yt, wt, xh } = foldData(xs, ys, ws, tr, te);
 * ```
 */
export function foldData(x: Float64Array, y: Float64Array, w: Float64Array, train: Int32Array, heldOut: Int32Array): { xt: Float64Array; yt: Float64Array; wt: Float64Array; xh: Float64Array; swt: number } {
  const xt = Float64Array.from(train, (i) => x[i]);
  const yt = Float64Array.from(train, (i) => y[i]);
  const wt = Float64Array.from(train, (i) => w[i]);
  const xh = Float64Array.from(heldOut, (i) => x[i]);
  let swt = 0;
  for (let j = 0; j < wt.length; j++) swt += wt[j];
  return { xt, yt, wt, xh, swt };
}
