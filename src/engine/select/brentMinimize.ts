/**
 * Brent's method for a one-dimensional minimum on a bracket [a, b]: golden
 * section steps safeguarding parabolic interpolation.
 *
 * Stopping rule: the bracket around the best point is shorter than
 * 2 * (tol * |x| + tol / 10), or `maxIter` evaluations.
 *
 * Reference: R. P. Brent, "Algorithms for Minimization without Derivatives"
 * (Prentice-Hall, 1973), chapter 5.
 *
 * Unchecked: a < b, tol > 0.
 */
export interface BrentResult {
  x: number;
  fx: number;
  iterations: number;
  converged: boolean;
}

const GOLD = 0.3819660112501051; // (3 - sqrt(5)) / 2

export function brentMinimize(f: (x: number) => number, a: number, b: number, tol = 1e-6, maxIter = 100): BrentResult {
  let x = a + GOLD * (b - a);
  let w = x, v = x;
  let fx = f(x);
  let fw = fx, fv = fx;
  let d = 0, e = 0;
  for (let iter = 1; iter <= maxIter; iter++) {
    const xm = 0.5 * (a + b);
    const tol1 = tol * Math.abs(x) + tol / 10;
    const tol2 = 2 * tol1;
    if (Math.abs(x - xm) <= tol2 - 0.5 * (b - a)) return { x, fx, iterations: iter, converged: true };
    let useGolden = true;
    if (Math.abs(e) > tol1) {
      let r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p; else q = -q;
      const etemp = e;
      e = d;
      if (!(Math.abs(p) >= Math.abs(0.5 * q * etemp) || p <= q * (a - x) || p >= q * (b - x))) {
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = xm - x >= 0 ? tol1 : -tol1;
        useGolden = false;
      }
    }
    if (useGolden) {
      e = x >= xm ? a - x : b - x;
      d = GOLD * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d >= 0 ? tol1 : -tol1);
    const fu = f(u);
    if (fu <= fx) {
      if (u >= x) a = x; else b = x;
      v = w; fv = fw; w = x; fw = fx; x = u; fx = fu;
    } else {
      if (u < x) a = u; else b = u;
      if (fu <= fw || w === x) { v = w; fv = fw; w = u; fw = fu; }
      else if (fu <= fv || v === x || v === w) { v = u; fv = fu; }
    }
  }
  return { x, fx, iterations: maxIter, converged: false };
}
