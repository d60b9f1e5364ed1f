/**
 * Per-segment summaries and the warnings every segmentation carries.
 */
import type { Series } from '../series';
import { warning, type Warning } from '../warnings';
import { median } from '../median';
import { lagOneAutocorrelation, isAutocorrelated } from '../diagnostics/lagOneAutocorrelation';
import type { BreaksModel, SegmentSummary } from './types';

/**
 * Summary of clean points start..end (inclusive): weighted mean and standard
 * deviation (population form, sqrt(sum w (y - mean)^2 / sum w)), the Poisson rate
 * sum w y / sum w for 'poisson', the median for 'distribution'. Slope fields NaN
 * (filled by the slope model). Unchecked: 0 <= start <= end < n.
 */
export function summariseSegment(series: Series, start: number, end: number, model: BreaksModel): SegmentSummary {
  let W = 0, S = 0;
  for (let i = start; i <= end; i++) { W += series.w[i]; S += series.w[i] * series.y[i]; }
  const mean = S / W;
  let V = 0;
  for (let i = start; i <= end; i++) { const d = series.y[i] - mean; V += series.w[i] * d * d; }
  return {
    start, end, xStart: series.x[start], xEnd: series.x[end],
    rowStart: series.firstRow[start], rowEnd: series.firstRow[end], n: end - start + 1,
    mean, sd: Math.sqrt(V / W),
    level: model === 'distribution' ? median(series.y.subarray(start, end + 1)) : mean,
    rate: model === 'poisson' ? mean : NaN,
    median: model === 'distribution' ? median(series.y.subarray(start, end + 1)) : NaN,
    slope: NaN, intercept: NaN,
  };
}

/** The warning every changepoint result carries: a break is not proof of its cause. */
export function breakCauseWarning(count: number): Warning {
  const found = count === 0 ? 'No change was found at this penalty; that is not proof that nothing changed (a lower penalty or another model may find one).' : `${count} change${count === 1 ? '' : 's'} found.`;
  return warning('break-cause', `${found} A statistical break is not proof of its cause: check each date against known events (policy, pricing, data-collection or definition changes) before acting on it. Locations are point estimates with no interval.`);
}

/**
 * Lag-1 autocorrelation of the residuals y - fitted (weights ignored). Unchecked.
 */
export function residualAutocorrelation(y: Float64Array, fitted: Float64Array): number {
  if (y.length < 3) return 0;
  return lagOneAutocorrelation(Float64Array.from(y, (v, i) => v - fitted[i]));
}

/**
 * An 'autocorrelation' warning when the residual lag-1 autocorrelation of n points passes
 * {@link isAutocorrelated}, else null. With no break found the advice differs: residual
 * correlation then points at a change, trend or season the fit left in the data, and
 * raising the penalty cannot help.
 */
export function autocorrelationWarning(rho: number, n: number, breaks = 1): Warning | null {
  if (!isAutocorrelated(rho, n)) return null;
  if (breaks === 0) {
    return warning('autocorrelation', `residuals have lag-1 autocorrelation ${rho.toFixed(2)} and no change was found: a trend, a season or a change too small for this penalty may be left in the data. Look at the CROPS table over lower penalties, or try model 'slope' for a trend.`);
  }
  return warning('autocorrelation', `residuals have lag-1 autocorrelation ${rho.toFixed(2)}: the models assume independent noise here, so slow swings may be split into extra breaks. Use noise 'correlated', raise the penalty (see the CROPS table) or treat marginal breaks with caution.`);
}
