/**
 * The one-standard-error rule: among penalties at least as large as the best
 * one, the largest whose cross-validation score is within one standard error of
 * the best score (Breiman, Friedman, Olshen & Stone, "Classification and
 * Regression Trees", 1984, section 3.4.3; Hastie, Tibshirani & Friedman, "The
 * Elements of Statistical Learning", 2009, section 7.10).
 *
 * @param scores - CV scores in increasing penalty
 * @param se - their standard errors
 * @param best - index of the minimum
 * @returns the index chosen. Unchecked.
 */
export function oneStandardError(scores: ArrayLike<number>, se: ArrayLike<number>, best: number): number {
  const limit = scores[best] + (Number.isFinite(se[best]) ? se[best] : 0);
  for (let j = scores.length - 1; j > best; j--) if (scores[j] <= limit) return j;
  return best;
}
