/**
 * Finds the penalty whose equivalent degrees of freedom equal a target, for a
 * smoother whose df falls monotonically as lambda grows.
 *
 * Bisection on log10(lambda) safeguarding the secant step (Illinois variant);
 * stops when |df - target| <= tol * max(1, target) or the bracket is below
 * 1e-12 decades.
 */
export interface DfSolve {
  penalty: number;
  df: number;
  iterations: number;
  converged: boolean;
}

export function solveForDf(dfAt: (lambda: number) => number, target: number, lo: number, hi: number, tol = 1e-8, maxIter = 200): DfSolve {
  let a = Math.log10(lo), b = Math.log10(hi);
  let fa = dfAt(lo) - target, fb = dfAt(hi) - target;
  if (fa <= 0) return { penalty: lo, df: fa + target, iterations: 2, converged: Math.abs(fa) <= tol * Math.max(1, target) };
  if (fb >= 0) return { penalty: hi, df: fb + target, iterations: 2, converged: Math.abs(fb) <= tol * Math.max(1, target) };
  let side = 0;
  for (let it = 3; it <= maxIter; it++) {
    let c = (a * fb - b * fa) / (fb - fa);
    if (!(c > a && c < b)) c = 0.5 * (a + b);
    const fc = dfAt(Math.pow(10, c)) - target;
    if (Math.abs(fc) <= tol * Math.max(1, target) || b - a < 1e-12) {
      return { penalty: Math.pow(10, c), df: fc + target, iterations: it, converged: true };
    }
    if (fc > 0) {
      a = c; fa = fc;
      if (side === 1) fb /= 2;
      side = 1;
    } else {
      b = c; fb = fc;
      if (side === -1) fa /= 2;
      side = -1;
    }
  }
  const c = 0.5 * (a + b);
  return { penalty: Math.pow(10, c), df: dfAt(Math.pow(10, c)), iterations: maxIter, converged: false };
}
