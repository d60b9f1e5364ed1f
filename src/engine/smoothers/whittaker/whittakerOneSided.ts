import { checkWhittakerLambda, whittakerInput } from './whittakerInput';

/** Result of {@link whittakerOneSided}. */
export interface WhittakerOneSided {
  /** Value at row t computed from rows 0..t only; NaN where rows 0..t cannot determine it. */
  trend: Float64Array;
  /** Number of rows left NaN (too little weighted data so far). */
  undetermined: number;
}

/**
 * The one-sided (real-time) Whittaker-Henderson / Hodrick-Prescott trend: the value
 * at row t uses only the data of rows 0..t, so a backtest sees no future data. It
 * equals the last value of the two-sided fit ({@link whittakerFit}) on rows 0..t.
 *
 * How: the penalised least-squares problem is the posterior mode of the state-space
 * model (E. T. Whittaker 1923; G. Kitagawa and W. Gersch, "Smoothness Priors Analysis
 * of Time Series", 1996; for Hodrick-Prescott A. C. Harvey and A. Jaeger, "Detrending,
 * stylized facts and the business cycle", J. Applied Econometrics 8 (1993) 231-247)
 *
 *   y_t = z_t + e_t,  e_t ~ N(0, s^2 / w_t);     (D z)_r = c_r . (z_r, ..., z_{r+d}) ~ N(0, s^2 / lambda),
 *
 * a d-th order random walk in the divided differences, with a diffuse (flat) prior
 * on the first d states. Each row's trend is the filtered mean E[z_t | y_0..y_t],
 * computed by the information (inverse-covariance) form of the Kalman filter
 * (A. C. Harvey, "Forecasting, Structural Time Series Models and the Kalman Filter",
 * 1989, section 3.3; J. Durbin and S. J. Koopman, "Time Series Analysis by State
 * Space Methods", 2nd ed. 2012, section 5 on the exact diffuse start, which the
 * information form gives by starting from zero information). The state is the last
 * d values; each step adds row t's observation and the penalty row ending at t to a
 * (d+1) x (d+1) information matrix, reads the filtered mean by a small Cholesky solve,
 * and integrates out the oldest value (a Schur complement). O(n d^3) time, O(d^2) memory.
 * The one-sided trend lags turning points and is revised by nothing, unlike the
 * two-sided trend, whose end values change as data arrive. Units as in {@link whittakerFit}.
 *
 * @param x - strictly increasing positions
 * @param y - values
 * @param w - weights >= 0 or null
 * @param lambda - penalty > 0 (same scale as whittakerFit)
 * @param order - order of differences, 1..6
 * @example
 * ```ts
 * const rt = whittakerOneSided(x, y, null, 1600, 2);
 * // rt.trend[t] === whittakerFit(x.slice(0, t + 1), y.slice(0, t + 1), null, 1600, 2).fitted[t] (to rounding)
 * ```
 */
export function whittakerOneSided(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number> | null | undefined, lambda: number, order = 2): WhittakerOneSided {
  // no internal scaling here: a scale taken from all of x or w would let later rows
  // change earlier values; lambda * D(x)'D(x) is already on the scale of the weights
  const inp = whittakerInput(x, y, w, order, false);
  checkWhittakerLambda(lambda);
  const lam = lambda;
  const { n, order: d, rows } = inp;
  const m = d + 1;
  // information matrix J (m x m, row-major) and vector g over the window
  // z_{t-k+1} .. z_t (k <= m values; index 0 the oldest)
  const J = new Float64Array(m * m), g = new Float64Array(m);
  const C = new Float64Array(m * m), v = new Float64Array(m), row0 = new Float64Array(m); // work
  const trend = new Float64Array(n);
  let k = 0, undetermined = 0;
  for (let t = 0; t < n; t++) {
    // append z_t
    const j = k;
    k++;
    for (let a = 0; a < k; a++) { J[j * m + a] = 0; J[a * m + j] = 0; }
    g[j] = inp.w[t] * inp.y[t];
    J[j * m + j] = inp.w[t];
    if (t >= d) {
      // penalty row r = t - d over z_{t-d} .. z_t = the whole window (k = d + 1)
      const o = (t - d) * m;
      for (let a = 0; a < m; a++) {
        const va = lam * rows[o + a];
        for (let b = 0; b < m; b++) J[a * m + b] += va * rows[o + b];
      }
    }
    trend[t] = lastOfSolve(J, g, k, m, C, v);
    if (Number.isNaN(trend[t])) undetermined++;
    if (k === m) {
      // integrate out the oldest value: Schur complement on J[0][0] (> 0: lam * c_0^2 > 0)
      const p = J[0], g0 = g[0];
      for (let b = 0; b < m; b++) row0[b] = J[b];
      for (let a = 1; a < m; a++) {
        const fa = J[a * m] / p;
        for (let b = 1; b < m; b++) J[(a - 1) * m + (b - 1)] = J[a * m + b] - fa * row0[b];
        g[a - 1] = g[a] - fa * g0;
      }
      k = m - 1;
    }
  }
  return { trend, undetermined };
}

/**
 * Last entry of J^{-1} g for the leading k x k block (row stride m), by Cholesky;
 * NaN when J is not numerically positive definite (the last value is not determined).
 * Unchecked.
 */
function lastOfSolve(J: Float64Array, g: Float64Array, k: number, m: number, C: Float64Array, v: Float64Array): number {
  let scale = 0;
  for (let a = 0; a < k; a++) scale = Math.max(scale, J[a * m + a]);
  if (!(scale > 0)) return NaN;
  for (let a = 0; a < k; a++) {
    for (let b = 0; b <= a; b++) {
      let s = J[a * m + b];
      for (let c = 0; c < b; c++) s -= C[a * m + c] * C[b * m + c];
      if (a === b) {
        if (!(s > 1e-12 * scale)) return NaN;
        C[a * m + a] = Math.sqrt(s);
      } else C[a * m + b] = s / C[b * m + b];
    }
  }
  for (let a = 0; a < k; a++) {
    let s = g[a];
    for (let c = 0; c < a; c++) s -= C[a * m + c] * v[c];
    v[a] = s / C[a * m + a];
  }
  // only the last entry of the back substitution is needed: x_{k-1} = v_{k-1} / C_{k-1,k-1}
  return v[k - 1] / C[(k - 1) * m + (k - 1)];
}
