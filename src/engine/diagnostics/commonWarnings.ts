/**
 * Warnings every smoother attaches the same way, so the pane, the cells and
 * the CLI print one message per situation.
 */
import { Warning, warning } from '../warnings';
import { lagOneAutocorrelation, isAutocorrelated } from './lagOneAutocorrelation';
import { showNumber } from '../errors';

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
export function fitWarnings(n: number, df: number, resid: ArrayLike<number>, dataDriven: boolean, y?: ArrayLike<number>): Warning[] {
  const out: Warning[] = [];
  if (y && isConstant(y)) return out;
  if (df > n / 3 && n > 6) {
    out.push(warning('few-points-per-df', `The fit uses ${showNumber(df)} degrees of freedom for ${n} points (fewer than 3 points per df): it is close to interpolating the data and follows noise.`));
  }
  if (dataDriven && n >= 20) {
    const r1 = lagOneAutocorrelation(resid);
    if (isAutocorrelated(r1, n)) {
      out.push(warning('autocorrelation', `Residuals are autocorrelated (lag-one correlation ${r1.toFixed(2)}): data-driven penalty rules treat such structure as signal and tend to under-smooth. Consider a larger penalty or a df target.`));
    }
  }
  return out;
}

/** Whether every value equals the first. Unchecked. */
function isConstant(y: ArrayLike<number>): boolean {
  for (let i = 1; i < y.length; i++) if (y[i] !== y[0]) return false;
  return true;
}
