import type { SolverStatus } from '../../types';
import { checkWhittakerLambda, scaledLambda, whittakerInput } from './whittakerInput';
import { whittakerSolve } from './whittakerSolve';

/** Result of {@link whittakerFit}, one entry per point. */
export interface WhittakerFit {
  fitted: Float64Array;
  /** Equivalent degrees of freedom: the trace of the hat matrix. */
  df: number;
  /** Diagonal of the hat matrix, h_ii = w_i [(W + lambda D'D)^{-1}]_ii. */
  leverage: Float64Array;
  /** Weighted residual sum of squares, sum w_i (y_i - z_i)^2 (weights as given). */
  rss: number;
  /** GCV score n * rss / (n - df)^2 (see {@link whittakerGcv}). */
  gcv: number;
  status: SolverStatus;
}

/**
 * Whittaker-Henderson graduation of order d on possibly unequally spaced x:
 *
 *   z = argmin  sum_i w_i (y_i - z_i)^2 + lambda * || D(x, d) z ||^2 ,
 *
 * with D(x, d) the divided-difference operator of trend filtering (row r is
 * (d-1)! times the change in the (d-1)-th divided difference of z over
 * x_r .. x_{r+d}; for unit spacing the ordinary d-th difference). Order 2 on
 * x = 1, 2, ..., n is the Hodrick-Prescott filter (R. J. Hodrick and E. C. Prescott,
 * "Postwar U.S. business cycles: an empirical investigation", J. Money, Credit and
 * Banking 29 (1997) 1-16); the method goes back to E. T. Whittaker, "On a new method
 * of graduation", Proc. Edinburgh Math. Soc. 41 (1923) 63-75, and R. Henderson (1924).
 *
 * Solved in O(n d^2) from the banded normal equations (W + lambda D'D) z = W y by a
 * banded Cholesky factorisation; the leverages and df = trace of the hat matrix come
 * exactly from the band of the inverse of the same factor (Hutchinson & de Hoog 1985),
 * also O(n d^2). Internally x is measured in units of its mean spacing and the weights
 * are divided by their mean.
 *
 * Units: lambda is in (units of weight) x (units of x)^(2(d-1)): with x measured in
 * periods (one step per observation) order 2 takes the usual Hodrick-Prescott values
 * (see {@link hodrickPrescottLambda}); if x is in other units, multiply by the length
 * of one period in those units to the power 2(d-1).
 *
 * @param x - strictly increasing positions (merge equal x first)
 * @param y - values, finite
 * @param w - weights >= 0 (null: all 1); zero-weight points are filled in by the trend
 * @param lambda - penalty > 0
 * @param order - order d of the differences, 1..6 (2 = Hodrick-Prescott)
 * @example
 * ```ts
 * const x = Float64Array.from({ length: 40 }, (_, i) => i + 1);
 * const r = whittakerFit(x, quarterlyGdpLogs, null, 1600, 2); // HP trend, r.df about 7
 * ```
 */
export function whittakerFit(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number> | null | undefined, lambda: number, order = 2): WhittakerFit {
  const inp = whittakerInput(x, y, w, order);
  checkWhittakerLambda(lambda);
  const sol = whittakerSolve(inp, scaledLambda(inp, lambda), true);
  const { n, y: ys, w: ws, wScale } = inp;
  const z = sol.fitted;
  let rss = 0;
  for (let i = 0; i < n; i++) { const e = ys[i] - z[i]; rss += ws[i] * wScale * e * e; }
  const df = sol.df as number;
  const tolerance = 1e-10;
  return {
    fitted: sol.fitted,
    df,
    leverage: sol.leverage as Float64Array,
    rss,
    gcv: (n * rss) / ((n - df) * (n - df)),
    status: {
      converged: sol.residual <= tolerance,
      iterations: 1,
      tolerance,
      achieved: sol.residual,
      stoppingRule: 'direct banded Cholesky solve; achieved is the componentwise backward error of the normal equations, max_i |Wy - Az|_i / (|W||z| + lambda |D|^T |D||z| + |Wy|)_i',
    },
  };
}
