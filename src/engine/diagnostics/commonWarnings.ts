/**
 * Warnings every smoother attaches the same way, so the pane, the cells and
 * the CLI print one message per situation.
 */
import { Warning, warning } from '../warnings';
import { lagOneAutocorrelation, isAutocorrelated } from './lagOneAutocorrelation';
import { showNumber } from '../errors';
import { foldPlan } from '../select/noiseDependence';
import type { NoiseAssumption } from '../types';

/** The note on end effects that every smoothed trend carries. */
export function boundaryWarning(): Warning {
  return warning('boundary', 'Fitted values near both ends rest on data from one side only and will be revised as new data arrive. A smoothed trend describes the past; it is not a forecast.');
}

/**
 * Warnings that depend on the fit: few points per df, autocorrelated
 * residuals (only when the penalty was chosen from the data, where it misleads).
 * `resid` is in x order. When `y` is given and constant, neither applies: the
 * fit is that constant whatever the penalty, and there is no noise to follow
 * (the intake's note says the values are all equal).
 */
export function fitWarnings(n: number, df: number, resid: ArrayLike<number>, dataDriven: boolean, y?: ArrayLike<number>, rule?: string, folds = 5, noise: NoiseAssumption = 'correlated'): Warning[] {
  const out: Warning[] = [];
  if (y && isConstant(y)) return out;
  if (df > n / 3 && n > 6) {
    out.push(warning('few-points-per-df', `The fit uses ${showNumber(df)} degrees of freedom for ${n} points (fewer than 3 points per df): it is close to interpolating the data and follows noise.`));
  }
  if (dataDriven && n >= 20) {
    const r1 = lagOneAutocorrelation(resid);
    // the same plan cross-validation used (same y, same folds), so the message describes the folds it ran
    const dep = y ? foldPlan(y, folds, noise) : undefined;
    // warn only on clear dependence (about three standard errors of the estimate, and at least 0.25); below that the
    // cross-validation plan still leaves neighbours out, quietly, since doing so costs little either way
    if (dep && dep.buffer > 0 && dep.phi > Math.max(0.25, 3 / Math.sqrt(n))) {
      out.push(warning('autocorrelation', rule === 'cv'
        ? `The noise looks correlated from one point to the next (lag-one about ${dep.phi.toFixed(2)}, estimated from differences): cross-validation held out blocks of ${dep.block} points and left ${dep.buffer} neighbours on each side out of training, so that correlated noise is not taken for trend (h-block cross-validation; Chu & Marron 1991). Fast wiggles of the series itself can read as correlated noise and be smoothed away: if the noise is known to be independent, set noise to independent.`
        : `The noise looks correlated from one point to the next (lag-one about ${dep.phi.toFixed(2)}, estimated from differences): ${rule ? rule.toUpperCase() : 'this rule'} treats such noise as signal and tends to under-smooth. Use the rule "cv", which then leaves neighbours out of its folds, or a larger penalty.`));
    } else if (isAutocorrelated(r1, n)) {
      out.push(warning('autocorrelation', `Residuals are autocorrelated (lag-one correlation ${r1.toFixed(2)}): the fit leaves structure in the residuals (a season, a missed change) or the noise is correlated. Consider a smaller penalty or a df target, and look at the residuals.`));
    }
  }
  return out;
}

/** Whether every value equals the first. Unchecked. */
function isConstant(y: ArrayLike<number>): boolean {
  for (let i = 1; i < y.length; i++) if (y[i] !== y[0]) return false;
  return true;
}
