/**
 * A floor for a first call in a fresh Node process: the smallest interior point for order-1 trend
 * filtering this project could write, in plain TypeScript with no helpers from the engine, timed
 * on its first call and again in the same process. It answers one question of the side-by-side
 * bench beside glmgen: how much of a fresh process's time at n = 1e4 is the JavaScript engine
 * interpreting and compiling code rather than the method.
 *
 * Method: the primal-dual interior point on the dual of order-1 trend filtering with x = 1..n
 * (S.-J. Kim, K. Koh, S. Boyd and D. Gorinevsky, "l1 trend filtering", SIAM Review 51 (2009)
 * 339-360, section 6): minimise 1/2 u^T D D^T u - u^T D y subject to -lambda <= u <= lambda, with D
 * the (n - 2) x n second-difference matrix; each Newton step solves one symmetric pentadiagonal
 * system (D D^T minus a diagonal) by an LDL^T factorisation, O(n). Stopping rule: the relative
 * duality gap (P(b) - D(u)) / |P(b)| at most `tolerance` for the primal point b = y - D^T u, or
 * `maxIterations`. The parameters mu = 2, step fraction 0.99 and t <- max(2 mu m / gap, 1.2 t) follow
 * the paper's algorithm (its backtracking on the residual is replaced by the fraction to the
 * boundary, enough here for a bench). It is not the engine's solver and ships with nothing: it
 * exists so that the bench can print its times beside the engine's.
 */

/** Result of {@link minimalTrendInteriorPoint}. */
export interface MinimalInteriorPoint {
  /** Fitted values b = y - D^T u. */
  b: Float64Array;
  iterations: number;
  /** Relative duality gap at the end. */
  gap: number;
}

/**
 * Order-1 trend filtering of y on x = 1..n (n >= 4) at `lambda` by the interior point above.
 *
 * @example
 * ```ts
 * minimalTrendInteriorPoint(Float64Array.of(1, 2, 4, 8, 9, 10), 0.5, 1e-8, 100).b;
 * ```
 */
export function minimalTrendInteriorPoint(y: Float64Array, lambda: number, tolerance: number, maxIterations: number): MinimalInteriorPoint {
  const n = y.length, m = n - 2;
  const dy = new Float64Array(m);
  for (let i = 0; i < m; i++) dy[i] = y[i] - 2 * y[i + 1] + y[i + 2];
  const u = new Float64Array(m), mu1 = new Float64Array(m).fill(1), mu2 = new Float64Array(m).fill(1);
  const ddu = new Float64Array(m), r = new Float64Array(m), du = new Float64Array(m), dmu1 = new Float64Array(m), dmu2 = new Float64Array(m);
  const d0 = new Float64Array(m), d1 = new Float64Array(m), d2 = new Float64Array(m);
  const dtu = new Float64Array(n);
  let t = 1e-10, it = 0, gap = Infinity;
  for (; it < maxIterations; it++) {
    pentadiagonalDDt(u, ddu, m);
    secondDifferenceTranspose(u, dtu, n);
    let l1 = 0, uDy = 0, dtu2 = 0;
    for (let i = 0; i < m; i++) { l1 += Math.abs(dy[i] - ddu[i]); uDy += u[i] * dy[i]; }
    for (let j = 0; j < n; j++) dtu2 += dtu[j] * dtu[j];
    // P(b) = 1/2 ||D^T u||^2 + lambda ||D b||_1 with D b = D y - D D^T u; D(u) = u . D y - 1/2 ||D^T u||^2
    const primal = 0.5 * dtu2 + lambda * l1, dual = uDy - 0.5 * dtu2;
    gap = (primal - dual) / Math.abs(primal);
    if (gap <= tolerance) break;
    let surrogate = 0;
    for (let i = 0; i < m; i++) surrogate -= (u[i] - lambda) * mu1[i] + (-u[i] - lambda) * mu2[i];
    t = Math.max((2 * 2 * m) / surrogate, 1.2 * t);
    const it1 = 1 / t;
    for (let i = 0; i < m; i++) {
      const f1 = u[i] - lambda, f2 = -u[i] - lambda;
      r[i] = dy[i] - ddu[i] + it1 / f1 - it1 / f2;
      d0[i] = 6 - mu1[i] / f1 - mu2[i] / f2; d1[i] = -4; d2[i] = 1;
    }
    pentadiagonalFactor(d0, d1, d2, m);
    pentadiagonalSolve(d0, d1, d2, r, du, m);
    let step = 1;
    for (let i = 0; i < m; i++) {
      const f1 = u[i] - lambda, f2 = -u[i] - lambda;
      dmu1[i] = -(mu1[i] + (it1 + du[i] * mu1[i]) / f1);
      dmu2[i] = -(mu2[i] + (it1 - du[i] * mu2[i]) / f2);
      if (dmu1[i] < 0) step = Math.min(step, (-0.99 * mu1[i]) / dmu1[i]);
      if (dmu2[i] < 0) step = Math.min(step, (-0.99 * mu2[i]) / dmu2[i]);
      if (du[i] > 0) step = Math.min(step, (0.99 * (lambda - u[i])) / du[i]);
      if (du[i] < 0) step = Math.min(step, (0.99 * (-lambda - u[i])) / du[i]);
    }
    for (let i = 0; i < m; i++) { u[i] += step * du[i]; mu1[i] += step * dmu1[i]; mu2[i] += step * dmu2[i]; }
  }
  secondDifferenceTranspose(u, dtu, n);
  const b = new Float64Array(n);
  for (let j = 0; j < n; j++) b[j] = y[j] - dtu[j];
  return { b, iterations: it, gap };
}

/** out = D D^T u for second differences (the pentadiagonal 1, -4, 6, -4, 1). Unchecked. */
function pentadiagonalDDt(u: Float64Array, out: Float64Array, m: number): void {
  for (let i = 0; i < m; i++) {
    let v = 6 * u[i];
    if (i >= 1) v -= 4 * u[i - 1];
    if (i + 1 < m) v -= 4 * u[i + 1];
    if (i >= 2) v += u[i - 2];
    if (i + 2 < m) v += u[i + 2];
    out[i] = v;
  }
}

/** out = D^T u (length n) for second differences. Unchecked. */
function secondDifferenceTranspose(u: Float64Array, out: Float64Array, n: number): void {
  const m = n - 2;
  for (let j = 0; j < n; j++) out[j] = (j < m ? u[j] : 0) - 2 * (j >= 1 && j - 1 < m ? u[j - 1] : 0) + (j >= 2 ? u[j - 2] : 0);
}

/**
 * LDL^T of the symmetric pentadiagonal matrix with diagonal d, first off-diagonal e and second f,
 * in place: d becomes D, e and f the first and second subdiagonals of L. Unchecked.
 */
function pentadiagonalFactor(d: Float64Array, e: Float64Array, f: Float64Array, m: number): void {
  for (let i = 0; i < m; i++) {
    let di = d[i];
    if (i >= 1) di -= d[i - 1] * e[i - 1] * e[i - 1];
    if (i >= 2) di -= d[i - 2] * f[i - 2] * f[i - 2];
    d[i] = di;
    let ei = e[i];
    if (i >= 1) ei -= d[i - 1] * e[i - 1] * f[i - 1];
    e[i] = ei / di;
    f[i] /= di;
  }
}

/** Solves L D L^T x = r with the factors of {@link pentadiagonalFactor}. Unchecked. */
function pentadiagonalSolve(d: Float64Array, l1: Float64Array, l2: Float64Array, r: Float64Array, x: Float64Array, m: number): void {
  for (let i = 0; i < m; i++) {
    let v = r[i];
    if (i >= 1) v -= l1[i - 1] * x[i - 1];
    if (i >= 2) v -= l2[i - 2] * x[i - 2];
    x[i] = v;
  }
  for (let i = 0; i < m; i++) x[i] /= d[i];
  for (let i = m - 1; i >= 0; i--) {
    let v = x[i];
    if (i + 1 < m) v -= l1[i] * x[i + 1];
    if (i + 2 < m) v -= l2[i] * x[i + 2];
    x[i] = v;
  }
}
