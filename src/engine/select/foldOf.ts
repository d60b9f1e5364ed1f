/**
 * Deterministic cross-validation folds: interior point i (in increasing x) goes
 * to fold (i - 1) mod K; the first and last points are never held out (fold -1),
 * so a held-out point is always predicted by interpolation, never by
 * extrapolation. The scheme of R. J. Tibshirani, "Adaptive piecewise polynomial
 * estimation via trend filtering", Ann. Statist. 42 (2014), section 6.
 * The same data always give the same folds. Unchecked: 2 <= K <= n - 2.
 */
export function foldOf(n: number, k: number): Int32Array {
  const f = new Int32Array(n);
  for (let i = 0; i < n; i++) f[i] = (i - 1) % k;
  f[0] = -1;
  f[n - 1] = -1;
  return f;
}
