import { bandedCholesky, bandedCholeskySolve } from '../linalg/bandedCholesky';

/**
 * The normal equations of a restricted trend-filtering solve ({@link restrictedSplineFit}) in the
 * discrete B-spline basis of knots A, kept so that the same problem on A with knots removed can be
 * solved without a pass over the data ({@link withoutKnot}, {@link solveRestrictedSystem}).
 */
export interface RestrictedSystem {
  /** Degree (2 or 3). */
  k: number;
  /** Number of knots |A|. */
  K: number;
  /** Number of basis functions, K + k + 1. */
  p: number;
  /** B^T W B in the lower-band layout of {@link bandedCholesky} (half-bandwidth k), length (p + k)(k + 1), zeros past p. */
  gram: Float64Array;
  /** B^T W y, length p + k (zeros past p). */
  rhs: Float64Array;
  /** penalty[e (k + 2) + l] = (D B_e) at the l-th knot of window e (0 at phantom knots), as in {@link DiscreteBSplines}. */
  penalty: Float64Array;
}

/**
 * The system of the same problem with knot j of A removed, by knot removal: the discrete
 * splines with knots A \ {A_j} are those of S(A) whose jump at A_j vanishes, so each new basis
 * function is a combination of basis functions of S(A). Windows whose k + 2 knots do not include
 * A_j are unchanged; each of the k + 1 windows that straddle it (old windows e and e + 1 share
 * every knot of the new window e) is
 *
 *   N_e = a B_e + b B_{e+1},   a (D B_e)_{A_j} + b (D B_{e+1})_{A_j} = 0,
 *
 * scaled so that max(|a|, |b|) = 1. With T the matrix of these combinations the new Gram matrix
 * is T^T G T (half-bandwidth k again), its right-hand side T^T B^T W y and its penalty entries
 * the same combinations of the old ones: O(p k^2), no pass over the n points. The basis is then
 * no longer scaled to a largest value of 1 in the straddling windows, which changes nothing in
 * the solution; it is exact up to the rounding of the kept Gram matrix (no iterative refinement
 * from the data, unlike {@link restrictedSplineFit}).
 *
 * @param j - index into A of the knot removed (0 .. K - 1)
 * @returns the new system, or null when the knot's jump is zero in both windows beside it
 * Unchecked.
 */
export function withoutKnot(s: RestrictedSystem, j: number): RestrictedSystem | null {
  const { k, K, p } = s;
  const wd = k + 1, q = k + 2;
  const p2 = p - 1;
  // column e of T: coefficient ta[e] on old function o[e], tb[e] on o[e] + 1
  const o = new Int32Array(p2), ta = new Float64Array(p2), tb = new Float64Array(p2);
  for (let e = 0; e < p2; e++) {
    if (e < j) { o[e] = e; ta[e] = 1; }
    else if (e > k + j) { o[e] = e + 1; ta[e] = 1; }
    else {
      // the removed knot is knot l of window e and knot l - 1 of window e + 1
      const l = k + 1 + j - e;
      const pa = s.penalty[e * q + l], pb = s.penalty[(e + 1) * q + l - 1];
      const m = Math.max(Math.abs(pa), Math.abs(pb));
      if (!(m > 0)) return null;
      o[e] = e; ta[e] = pb / m; tb[e] = -pa / m;
    }
  }
  const G = s.gram;
  const g = (r: number, c: number): number => {
    const d = r - c;
    return d >= 0 ? (d <= k ? G[r * wd + d] : 0) : (-d <= k ? G[c * wd - d] : 0);
  };
  const gram = new Float64Array((p2 + k) * wd);
  const rhs = new Float64Array(p2 + k);
  const penalty = new Float64Array(p2 * q);
  for (let a = 0; a < p2; a++) {
    const ia = o[a], xa = ta[a], ya = tb[a];
    rhs[a] = xa * s.rhs[ia] + (ya !== 0 ? ya * s.rhs[ia + 1] : 0);
    for (let d = 0; d <= k && d <= a; d++) {
      const b = a - d, ib = o[b], xb = ta[b], yb = tb[b];
      let v = xa * xb * g(ia, ib);
      if (yb !== 0) v += xa * yb * g(ia, ib + 1);
      if (ya !== 0) {
        v += ya * xb * g(ia + 1, ib);
        if (yb !== 0) v += ya * yb * g(ia + 1, ib + 1);
      }
      gram[a * wd + d] = v;
    }
    // penalty entries: knot l of new window a is extended knot a + l, that is old knot a + l, or a + l + 1 past the removed one
    for (let l = 0; l < q; l++) {
      const iE = a + l < k + 1 + j ? a + l : a + l + 1;
      let v = 0;
      const l1 = iE - ia;
      if (l1 >= 0 && l1 < q) v += xa * s.penalty[ia * q + l1];
      if (ya !== 0 && l1 - 1 >= 0 && l1 - 1 < q) v += ya * s.penalty[(ia + 1) * q + l1 - 1];
      penalty[a * q + l] = v;
    }
  }
  return { k, K: K - 1, p: p2, gram, rhs, penalty };
}

/**
 * Solves a kept system ({@link RestrictedSystem}) for the penalty lambda and the knots' signs:
 * (B^T W B) c = B^T W y - lambda (D_A B)^T s by banded Cholesky, and returns (D b)_A = (D_A B) c.
 * Without the iterative refinement of {@link restrictedSplineFit}: meant for decisions on the
 * signs of (D b)_A, not for the fit itself.
 *
 * @returns (D b) on the knots, or null when the system is not numerically positive definite
 * Unchecked.
 */
export function solveRestrictedSystem(s: RestrictedSystem, lambda: number, signs: ArrayLike<number>): Float64Array | null {
  const { k, K, p, penalty } = s;
  const band = Float64Array.from(s.gram);
  const c = Float64Array.from(s.rhs);
  subtractPenalty(c, penalty, k, p, lambda, signs);
  if (bandedCholesky(band, p, k) >= 0) return null;
  for (let e = p; e < c.length; e++) c[e] = 0;
  bandedCholeskySolve(band, p, k, c);
  return knotDifferences(penalty, c, k, p, K);
}

/**
 * v -= lambda (D_A B)^T s: the penalty's side of the restricted normal equations, in place. Knot j
 * of A is knot l of the windows e = j + k + 1 - l (e in 0..p-1), whose (D B_e) there is
 * penalty[e (k + 2) + l]. Unchecked.
 */
export function subtractPenalty(v: Float64Array, penalty: Float64Array, k: number, p: number, lambda: number, signs: ArrayLike<number>): void {
  const q = k + 2;
  for (let j = 0; j < signs.length; j++) {
    const ls = lambda * signs[j];
    for (let l = 0; l < q; l++) {
      const e = j + k + 1 - l;
      if (e >= 0 && e < p) v[e] -= ls * penalty[e * q + l];
    }
  }
}

/** (D b)_A = (D_A B) c on the K knots, from the coefficients c (see {@link subtractPenalty}). Unchecked. */
export function knotDifferences(penalty: Float64Array, c: Float64Array, k: number, p: number, K: number): Float64Array {
  const q = k + 2;
  const dA = new Float64Array(K);
  for (let j = 0; j < K; j++) {
    let v = 0;
    for (let l = 0; l < q; l++) {
      const e = j + k + 1 - l;
      if (e >= 0 && e < p) v += penalty[e * q + l] * c[e];
    }
    dA[j] = v;
  }
  return dA;
}
