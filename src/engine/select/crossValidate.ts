/**
 * K-fold cross-validation for any smoother, on the same deterministic folds
 * ({@link foldOf}) for every method, so scores of different methods on one
 * series compare honestly. When the noise looks positively correlated
 * ({@link noiseDependence}), folds are blocks and the neighbours of held-out
 * points are left out of training, so correlated noise is not mistaken for
 * signal; the plan depends on the data only, so every method still shares it. The method supplies only predictions: fits on the
 * training points along a list of penalties (decreasing, so it may warm-start
 * from the previous one) evaluated at the held-out x.
 *
 * Score at each penalty: the mean over folds of the held-out weighted mean
 * squared error, sum_{i in fold} w_i (y_i - yhat_i)^2 / sum_{i in fold} w_i,
 * in (units of y)^2; its standard error is sd(fold errors) / sqrt(K)
 * (common practice; Hastie, Tibshirani & Friedman 2009, section 7.10).
 */
import type { RunContext } from '../analysis/runContext';
import { blockFolds, noiseDependence, NoiseDependence } from './noiseDependence';

/**
 * Predictions at held-out points for each penalty of `penalties`.
 * `train` and `held` are indices into the clean series (increasing x).
 */
export type FoldPredictor = (train: Int32Array, held: Int32Array, penalties: Float64Array) => Float64Array[];

/** Scores per penalty, in the order the penalties were given. */
export interface CrossValidation {
  score: Float64Array;
  se: Float64Array;
  /** Fold errors, K x G row-major (fold f, penalty j at f * G + j). */
  foldErrors: Float64Array;
  folds: number;
  /** The noise dependence found and the fold plan used ({@link noiseDependence}). */
  plan: NoiseDependence;
}

/**
 * Cross-validates a smoother.
 *
 * @param y - values per clean point (the scale the predictions are in)
 * @param w - weights per clean point
 * @param folds - K, 2 <= K <= n - 2 (unchecked)
 * @param penalties - the penalties to score, in the order the predictor wants them
 * @param predict - the method's fold predictor
 * @param context - progress per fold (optional)
 * @param plan - the fold plan ({@link noiseDependence} of y with these folds, computed when not given);
 *   callers that score one penalty at a time compute it once and pass it
 * @example
 * ```ts
 * const cv = crossValidate(y, w, 5, grid, (tr, te, pens) => pens.map((p) => fitAndPredict(tr, te, p)));
 * ```
 */
export function crossValidate(y: ArrayLike<number>, w: ArrayLike<number>, folds: number, penalties: Float64Array, predict: FoldPredictor, context?: RunContext, stage = 'cross-validation', plan: NoiseDependence = noiseDependence(y, folds)): CrossValidation {
  const n = y.length;
  const K = folds;
  const G = penalties.length;
  const fold = blockFolds(n, K, plan);
  const err = new Float64Array(K * G);
  const keep = new Uint8Array(n);
  // the passes over the points are kernels of their own (DEVELOPERS.md, "Long loops and the first call")
  for (let f = 0; f < K; f++) {
    context?.step(f / K, `${stage}, fold ${f + 1} of ${K}`);
    // training: every point outside the fold and more than `buffer` points away from its held-out points
    const nh = markBuffers(fold, f, plan.buffer, keep);
    if (nh === 0) continue;
    const held = new Int32Array(nh);
    const train = new Int32Array(countKept(keep));
    splitFold(fold, f, keep, held, train);
    const sw = heldWeight(w, held);
    const preds = predict(train, held, penalties);
    for (let j = 0; j < G; j++) err[f * G + j] = heldSquaredError(y, w, held, preds[j]) / sw;
  }
  const score = new Float64Array(G), se = new Float64Array(G);
  for (let j = 0; j < G; j++) {
    let mean = 0;
    for (let f = 0; f < K; f++) mean += err[f * G + j];
    mean /= K;
    let v = 0;
    for (let f = 0; f < K; f++) v += (err[f * G + j] - mean) ** 2;
    score[j] = mean;
    se[j] = Math.sqrt(v / (K - 1) / K);
  }
  return { score, se, foldErrors: err, folds: K, plan };
}

/** Clears keep (all 1 first) on fold f's points and `buffer` points either side; returns the fold's size. Unchecked. */
function markBuffers(fold: Int32Array, f: number, buffer: number, keep: Uint8Array): number {
  const n = keep.length;
  keep.fill(1);
  let nh = 0;
  for (let i = 0; i < n; i++) {
    if (fold[i] !== f) continue;
    nh++;
    for (let j = Math.max(0, i - buffer); j <= Math.min(n - 1, i + buffer); j++) keep[j] = 0;
  }
  return nh;
}

/** Number of points kept. Unchecked. */
function countKept(keep: Uint8Array): number {
  let nt = 0;
  for (let i = 0; i < keep.length; i++) nt += keep[i];
  return nt;
}

/** Fold f's points into held and the kept points of other folds into train, in order. Unchecked. */
function splitFold(fold: Int32Array, f: number, keep: Uint8Array, held: Int32Array, train: Int32Array): void {
  for (let i = 0, a = 0, b = 0; i < keep.length; i++) { if (fold[i] === f) held[a++] = i; else if (keep[i]) train[b++] = i; }
}

/** sum of w over the held-out points. Unchecked. */
function heldWeight(w: ArrayLike<number>, held: Int32Array): number {
  let sw = 0;
  for (let t = 0; t < held.length; t++) sw += w[held[t]];
  return sw;
}

/** sum w (y - p)^2 over the held-out points (p in their order). Unchecked. */
function heldSquaredError(y: ArrayLike<number>, w: ArrayLike<number>, held: Int32Array, p: ArrayLike<number>): number {
  let e = 0;
  for (let t = 0; t < held.length; t++) { const r = y[held[t]] - p[t]; e += w[held[t]] * r * r; }
  return e;
}
