/**
 * The one rule for picking a penalty from a criterion curve, shared by every
 * method, with the one warning for a choice at the edge of the searched range.
 *
 * - Minimum: the smallest score; on ties the larger penalty (the simpler fit).
 * - 'simpler' (the one-standard-error rule; Breiman, Friedman, Olshen & Stone
 *   1984, section 3.4.3; Hastie, Tibshirani & Friedman 2009, section 7.10):
 *   the largest penalty whose score is within one standard error of the
 *   minimum and whose df is no larger than the minimum's, so it never gives a
 *   more complex fit (more knots) than the minimum does. Adaptive fits can
 *   gain knots as the penalty grows; such points are passed over.
 */
import { showNumber } from '../errors';
import type { CriterionPoint } from '../types';
import { Warning, warning } from '../warnings';

/** Which point of the curve to take. */
export type PenaltyPick = 'minimum' | 'simpler';

/**
 * Index of the chosen point of a curve in increasing penalty. Unchecked: a
 * non-empty curve with finite or infinite (never NaN) scores.
 *
 * @example
 * ```ts
 * choosePenalty([{ penalty: 1, score: 2, df: 9 }, { penalty: 10, score: 2, df: 4 }], 'minimum'); // 1 (tie: larger penalty)
 * ```
 */
export function choosePenalty(curve: readonly CriterionPoint[], pick: PenaltyPick = 'minimum'): number {
  let best = curve.length - 1;
  for (let j = curve.length - 2; j >= 0; j--) if (curve[j].score < curve[best].score) best = j;
  if (pick === 'minimum') return best;
  const se = curve[best].se;
  const limit = curve[best].score + (se !== undefined && Number.isFinite(se) ? se : 0);
  for (let j = curve.length - 1; j > best; j--) if (curve[j].score <= limit && curve[j].df <= curve[best].df) return j;
  return best;
}

/**
 * The warning for a choice at an end of the searched range: at the rough end
 * the data may be followed too closely; at the smooth end there is no
 * structure beyond the method's simplest fit (its null space).
 *
 * @param ruleName - the rule as users know it ('GCV', 'cross-validation', ...)
 * @param side - which end
 * @param simplest - words for the smooth end's fit, e.g. 'a straight line' or 'a polynomial of degree 2'
 */
export function edgeWarning(ruleName: string, side: 'rough' | 'smooth', penalty: number, simplest: string): Warning {
  return warning('penalty-at-edge', side === 'rough'
    ? `The ${ruleName} choice is the smallest penalty searched (${showNumber(penalty)}): the fit may follow noise. Consider a larger penalty or a df target.`
    : `The ${ruleName} choice is the largest penalty searched (${showNumber(penalty)}): the data show no structure beyond ${simplest}.`);
}
