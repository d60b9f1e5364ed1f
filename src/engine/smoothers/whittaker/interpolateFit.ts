import type { Evaluation } from '../../types';

/**
 * Values of a fit known at sorted points, at new x: linear interpolation between
 * neighbouring points; beyond the data the straight line through the two end points
 * continues, flagged as an extrapolation (not a forecast).
 *
 * @param x - sorted distinct positions of the fit
 * @param f - fitted values there
 * @param xNew - where values are wanted
 * @example
 * ```ts
 * interpolateFit(Float64Array.of(0, 1), Float64Array.of(0, 2), Float64Array.of(0.5, 2)); // values [1, 4], extrapolated [0, 1]
 * ```
 * Unchecked.
 */
export function interpolateFit(x: Float64Array, f: Float64Array, xNew: Float64Array): Evaluation {
  const n = x.length;
  const value = new Float64Array(xNew.length);
  const extrapolated = new Uint8Array(xNew.length);
  for (let k = 0; k < xNew.length; k++) {
    const t = xNew[k];
    if (n === 1) { value[k] = f[0]; extrapolated[k] = t !== x[0] ? 1 : 0; continue; }
    let i: number;
    if (t <= x[0]) i = 0;
    else if (t >= x[n - 1]) i = n - 2;
    else {
      let lo = 0, hi = n - 1;
      while (hi - lo > 1) { const m = (lo + hi) >> 1; if (x[m] <= t) lo = m; else hi = m; }
      i = lo;
    }
    const a = (t - x[i]) / (x[i + 1] - x[i]);
    value[k] = f[i] + a * (f[i + 1] - f[i]);
    extrapolated[k] = t < x[0] || t > x[n - 1] ? 1 : 0;
  }
  return { x: xNew, value, extrapolated };
}
