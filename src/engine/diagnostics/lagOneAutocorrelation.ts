/**
 * Lag-one autocorrelation of residuals in x order:
 *   r1 = sum_{i>0} e_i e_{i-1} / sum_i e_i^2.
 * Under independent noise r1 is about N(0, 1/n) (common practice, e.g. the
 * Box-Pierce reasoning), so r1 well above 2 / sqrt(n) says the residuals carry
 * structure that data-driven penalty rules mistake for signal. Unchecked.
 */
export function lagOneAutocorrelation(e: ArrayLike<number>): number {
  let num = 0, den = 0;
  for (let i = 0; i < e.length; i++) {
    den += e[i] * e[i];
    if (i > 0) num += e[i] * e[i - 1];
  }
  return den > 0 ? num / den : 0;
}

/**
 * The one rule for calling residuals autocorrelated: r1 above max(0.3, 3 / sqrt(n)),
 * that is, both a sizeable correlation and three standard errors of r1 under
 * independent noise (about 1 / sqrt(n); common practice, no single source), so short
 * series do not warn on chance correlation. Unchecked.
 */
export function isAutocorrelated(r1: number, n: number): boolean {
  return r1 > Math.max(0.3, 3 / Math.sqrt(n));
}
