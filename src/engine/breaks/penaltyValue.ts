/**
 * Penalty rules for the number of changes.
 */
import type { BreaksModel } from './types';

/**
 * Parameters added by one change, p, counting the change location itself:
 * 'mean' 2 (location, new mean), 'meanvar' 3 (location, mean, variance),
 * 'poisson' 2 (location, rate), 'distribution' 2 (location, one shift counted as a
 * parameter, as for the mean), 'slope' 2 (location, change of slope; the level is
 * tied by continuity).
 */
export function parametersPerChange(model: BreaksModel): number {
  switch (model) {
    case 'meanvar': return 3;
    default: return 2;
  }
}

/**
 * The penalty beta per change, on the scale of twice the negative log-likelihood:
 *
 * - 'bic' (Schwarz information criterion, SIC): beta = p log n.
 * - 'mbic' (modified BIC of Zhang & Siegmund 2007, Biometrics 63:22-32): beta = (p + 1) log n,
 *   the per-change part of the criterion as the changepoint literature applies it inside
 *   PELT (Killick & Eckley 2014, J Stat Softw 58(3)); the criterion's extra term in the
 *   segment lengths, sum log(n_i / n) / 2, is not included (as recalled from that literature).
 * - a number: used as given.
 *
 * @param rule - 'bic', 'mbic' or a non-negative number (already validated)
 * @param n - number of points
 * @param p - parameters per change ({@link parametersPerChange})
 * @example
 * ```ts
 * penaltyValue('bic', 100, 2); // 2 log 100 = 9.21
 * ```
 */
export function penaltyValue(rule: 'bic' | 'mbic' | number, n: number, p: number): number {
  if (typeof rule === 'number') return rule;
  return rule === 'bic' ? p * Math.log(n) : (p + 1) * Math.log(n);
}
