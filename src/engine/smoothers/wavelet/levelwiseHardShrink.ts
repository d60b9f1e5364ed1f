import { medianInPlace } from '../../median';
import { periodicDwt, periodicIdwt } from './periodicDwt';
import { extendSeries } from './extendSeries';
import { WAVELET_FILTERS, type WaveletFilterName } from './waveletFilters';

/** Detail levels with fewer coefficients than this borrow the noise scale of the next finer level. */
const FEWEST_FOR_SCALE = 32;

/**
 * Wavelet shrinkage with a noise scale for each level: hard thresholds
 * t_j = sigma_j sqrt(2 log n), sigma_j = median |d_j| / 0.6745 of level j's own
 * details (I. M. Johnstone and B. W. Silverman, "Wavelet threshold estimators
 * for data with correlated noise", JRSS B 59 (1997) 319-351). Under positively
 * correlated noise the noise grows toward the coarse levels, so one scale from
 * the finest level (as in {@link waveletShrink}) keeps noise there as signal;
 * level by level, the fit stays clear of the noise whatever its correlation.
 * Levels with fewer than 32 details (where a median says little) use the scale
 * of the next finer level. Reflecting boundary ({@link extendSeries}), levels
 * floor(log2(n / (L - 1))) for a filter of length L. A pilot fit, not offered
 * as a smoother: the noise-dependence estimate reads its residuals
 * (select/noiseDependence.ts). O(n L). Unchecked: y finite, n >= 2 (L - 1).
 *
 * With `starts` > 1 the fit is made translation-invariant in the manner of
 * cycle spinning (R. R. Coifman and D. L. Donoho, "Translation-invariant
 * de-noising", Wavelets and Statistics, Springer 1995): the series is shrunk
 * as given and started at rows 1 .. starts - 1 (the rows before dropped, not
 * wrapped round), and each row's value is the mean over the fits that cover
 * it. A jump or a bend then no longer depends on where the dyadic blocks
 * happen to fall. Unchecked: n - starts + 1 >= 2 (L - 1).
 *
 * @example
 * ```ts
 * const pilot = levelwiseHardShrink(y, 'db1', 8);
 * ```
 */
export function levelwiseHardShrink(y: Float64Array, filter: WaveletFilterName, starts = 1): Float64Array {
  if (starts > 1) return averagedOverStarts(y, filter, starts);
  const n = y.length;
  const h = WAVELET_FILTERS[filter];
  const levels = Math.max(1, Math.floor(Math.log2(n / (h.length - 1))));
  const ext = extendSeries(y, levels, 'reflect');
  const M = ext.length;
  const c = periodicDwt(ext, h, levels);
  const spread = Math.sqrt(2 * Math.log(n));
  let sigma = 0;
  const scratch = new Float64Array(M >> 1);
  for (let j = 1; j <= levels; j++) {
    const lo = M >> j, hi = M >> (j - 1);
    if (j === 1 || hi - lo >= FEWEST_FOR_SCALE) {
      const a = scratch.subarray(0, hi - lo);
      for (let i = lo; i < hi; i++) a[i - lo] = Math.abs(c[i]);
      sigma = medianInPlace(a) / 0.6745;
    }
    const t = sigma * spread;
    for (let i = lo; i < hi; i++) if (!(Math.abs(c[i]) > t)) c[i] = 0;
  }
  return periodicIdwt(c, h, levels, n).slice(0, n);
}

/** The mean of the fits of y started at rows 0 .. starts - 1, each row over the fits that cover it. Unchecked. */
function averagedOverStarts(y: Float64Array, filter: WaveletFilterName, starts: number): Float64Array {
  const n = y.length;
  const sum = new Float64Array(n);
  for (let s = 0; s < starts; s++) {
    const p = levelwiseHardShrink(y.subarray(s), filter);
    for (let i = 0; i < p.length; i++) sum[i + s] += p[i];
  }
  // row i is covered by the fits started at rows 0 .. min(i, starts - 1)
  for (let i = 0; i < n; i++) sum[i] /= Math.min(i + 1, starts);
  return sum;
}
