/**
 * A local basis of the discrete splines of degree k on the design points x with
 * knots at chosen rows of D(x, k+1): the space
 *
 *   S(A) = { b : (D(x, k+1) b)_j = 0 for every row j not in A },   dim S(A) = k + 1 + |A|,
 *
 * spanned by discrete B-splines (R. J. Tibshirani, "Divided differences, falling
 * factorials, and discrete splines: another look at trend filtering and related
 * problems", Foundations and Trends in Machine Learning 15 (2022), section 8;
 * T. Lyche, "Discrete polynomial spline approximation methods", 1975).
 *
 * Construction. Row r of D(x, k+1) is annihilated by b on both sides of it when b
 * follows one polynomial there; S(A) is spanned by the polynomials of degree k and the
 * truncated falling factorials
 *   g_r(x_i) = P_r(x_i) 1{i > r},   P_r(x) = prod_{l=1}^{k} (x - x_{r+l}),
 * for r in A, with (D g_r)_r = k! and (D g_r)_j = 0 for j != r. The knot list is
 * extended by k + 1 phantom rows on each side, on design points continued beyond
 * the data at the mean spacing: a phantom row r < 0 gives g_r = P_r, a polynomial on
 * the data, and a phantom row r >= n - k - 1 gives g_r = 0 on the data. Basis
 * function e, for the k + 2 consecutive (extended) knots rho_0 < .. < rho_{k+1}
 * starting at e, is the function of S(A) that vanishes outside the points
 * rho_0 + k + 1 .. rho_{k+1} (the smallest support in S(A)). It is one polynomial Q_l
 * of degree k on each of its k + 1 pieces (the points rho_l < i <= rho_{l+1}), and
 * consecutive pieces agree on the k points x_{rho_l + 1} .. x_{rho_l + k} (that is what
 * (D b)_j = 0 off the knots means), with Q_{-1} = Q_{k+1} = 0. Each Q_l is written in
 * its own coordinate t = (x - centre) / half-width over the points it covers; the
 * (k + 1)^2 coefficients are the null vector of these k (k + 2) conditions (Gaussian
 * elimination inside their band with row pivoting, or with complete pivoting over the whole
 * system when a pivot is small there). Local coordinates keep this accurate however
 * unequal the pieces are; summing truncated powers instead cancels badly when knots
 * cluster beside long stretches. Each B_e is scaled to max |B_e| = 1 on the data (positive
 * there: the null vector's sign is arbitrary), and
 * (D B_e) at its knots is k! times the jump of the leading coefficient.
 *
 * At most k + 1 basis functions are non-zero at a point and they are consecutive, so
 * Gram matrices are banded with half-bandwidth k. For k = 1 the B_e are the hat
 * functions on the kinks.
 */
export interface DiscreteBSplines {
  k: number;
  /** Number of basis functions, k + 1 + |A|. */
  p: number;
  /** first[i]: the first basis function non-zero at point i (the others are first[i] + 1 .. first[i] + k). */
  first: Int32Array;
  /** values[i (k + 1) + j] = B_{first[i] + j}(x_i). */
  values: Float64Array;
  /**
   * penalty[e (k + 2) + l] = (D B_e) at the l-th knot of e's window when that knot is a
   * row of A (0 for phantoms); (D B_e) is zero on every other row.
   */
  penalty: Float64Array;
}

/**
 * Local coefficients of the basis functions of one build, kept so that the next build on the
 * same x and k (an active-set method changes a few knots per round) solves the local system
 * only for windows of knots it has not seen: a window's function depends on its k + 2 knots
 * alone, so a reused one is identical to a recomputed one. Memory O(p k^2). Unchecked.
 */
export interface BasisCache {
  /** The design points of the last build (the cache is used only for the same array). */
  x: Float64Array | null;
  k: number;
  /** Extended knot rows of the last build. */
  ext: Int32Array;
  /** (k + 1)^2 local coefficients per basis function of the last build. */
  coef: Float64Array;
  /** The last build's values, first and penalty (a reused window's are copied, not evaluated again). */
  values?: Float64Array;
  first?: Int32Array;
  penalty?: Float64Array;
  /**
   * The arrays of the build before last, written again by the next build: a basis built with a
   * cache is valid until the next build on that cache.
   */
  spareValues?: Float64Array;
  spareFirst?: Int32Array;
  /**
   * Work space of the active-set rounds that use this cache (on the same x): a round's fitted values
   * (n) and its dual (n - k - 1), each valid only within a round.
   */
  rounds?: { b: Float64Array; u: Float64Array };
  /**
   * Work space of the monotone refinement on this x (polishTrend): two fitted-value arrays (n) and two
   * duals (n - k - 1), used in turn by its full steps (the last full step's pair is kept for its
   * certificate while the next one is solved), each valid only within one refinement.
   */
  refinement?: { b: [Float64Array, Float64Array]; u: [Float64Array, Float64Array] };
}

/** The cache's {@link BasisCache.refinement} work space for n points and m dual rows (new arrays without a cache). Unchecked. */
export function refinementWork(cache: BasisCache | undefined, n: number, m: number): { b: [Float64Array, Float64Array]; u: [Float64Array, Float64Array] } {
  const r = cache?.refinement;
  if (r && r.b[0].length === n && r.u[0].length === m) return r;
  const work = { b: [new Float64Array(n), new Float64Array(n)] as [Float64Array, Float64Array], u: [new Float64Array(m), new Float64Array(m)] as [Float64Array, Float64Array] };
  if (cache) cache.refinement = work;
  return work;
}

/** The cache's {@link BasisCache.rounds} work space for n points and m dual rows (new arrays without a cache). Unchecked. */
export function roundWork(cache: BasisCache | undefined, n: number, m: number): { b: Float64Array; u: Float64Array } {
  if (cache && cache.rounds && cache.rounds.b.length === n && cache.rounds.u.length === m) return cache.rounds;
  const work = { b: new Float64Array(n), u: new Float64Array(m) };
  if (cache) cache.rounds = work;
  return work;
}

/**
 * Builds the discrete B-splines of degree k (1..3) for knot rows A.
 *
 * @param x - strictly increasing design points (length n > k + 1)
 * @param k - degree
 * @param rowsA - knot rows, strictly increasing, in 0 .. n - k - 2
 * @param cache - optional {@link BasisCache} of an earlier build on the same x and k; updated in place
 * @returns the basis, or null when a local system is singular (numerically coincident knots)
 * @example
 * ```ts
 * const B = discreteBSplines(Float64Array.of(0, 1, 2, 3, 4), 1, [1]); // hats at x = 0, 2, 4
 * ```
 * Unchecked.
 */
export function discreteBSplines(x: Float64Array, k: number, rowsA: ArrayLike<number>, cache?: BasisCache): DiscreteBSplines | null {
  const n = x.length;
  const m = n - k - 1;
  const K = rowsA.length;
  const p = K + k + 1;
  const h = (x[n - 1] - x[0]) / (n - 1);
  // extended knot rows: k + 1 phantoms on the left, A, k + 1 phantoms on the right
  const E = new Int32Array(K + 2 * k + 2);
  for (let j = 0; j <= k; j++) { E[j] = j - (k + 1); E[k + 1 + K + j] = m + j; }
  for (let j = 0; j < K; j++) E[k + 1 + j] = rowsA[j];
  const lo = new Int32Array(p), hi = new Int32Array(p);
  for (let e = 0; e < p; e++) { lo[e] = Math.max(0, E[e] + k + 1); hi[e] = Math.min(n - 1, E[e + k + 1]); }
  const old = cache && cache.k === k && cache.x === x ? cache : undefined;
  const wd = k + 1;
  // with a cache, the arrays of the build before last are written again (a basis is valid until
  // the next build on the same cache): no allocation of n (k + 1) values per build
  const spare = cache && cache.spareValues && cache.spareValues.length === n * wd && cache.spareFirst && cache.spareFirst.length === n ? cache : undefined;
  // the first basis function covering each point: lo and hi both increase with e
  const first = spare ? spare.spareFirst! : new Int32Array(n);
  firstCovering(hi, n, first);
  const values = spare ? spare.spareValues! : new Float64Array(n * wd);
  const penalty = new Float64Array(p * (k + 2));
  const nu = (k + 1) * (k + 1); // unknowns: k + 1 local coefficients for each of the k + 1 pieces
  const work = windowWork(k);
  const allCoef = new Float64Array(p * nu);
  // pass 1: the window of the last build each window repeats (a window's function depends on its
  // k + 2 knots alone), or -1
  const from = new Int32Array(p).fill(-1);
  if (old) {
    const oe = old.ext, op = oe.length - k - 1;
    for (let e = 0, eo = 0; e < p; e++) {
      while (eo < op && oe[eo] < E[e]) eo++;
      if (eo < op && oe[eo] === E[e]) {
        let same = true;
        for (let q = 1; q <= k + 1; q++) if (oe[eo + q] !== E[e + q]) { same = false; break; }
        if (same) from[e] = eo;
      }
    }
  }
  // every build with a cache stores its values, first and penalty: a last build on the same x has them
  const ov = old?.values, of = old?.first, op = old?.penalty, oldP = old ? old.ext.length - k - 1 : 0;
  const canCopy = !!(ov && of && op);
  // pass 2: a point whose k + 1 windows all repeat, in the same order, keeps its values (copied by
  // stretches of points that share their first windows); the slots of the other points are cleared,
  // and those points are listed by stretches ([start, end) pairs in `fresh`, `nFresh` of them)
  const fresh = canCopy ? new Int32Array(2 * (p + oldP + 1)) : new Int32Array(0);
  const nFresh = canCopy ? keptPoints(first, of!, from, ov!, k, n, p, oldP, values, fresh, hi, lastPoints(old!.ext, k, n, oldP)) : 0;
  if (!canCopy && spare) values.fill(0);
  // pass 3: each window's coefficients, values at the points not kept, and (D B_e) at its knots
  for (let e = 0; e < p; e++) {
    // piece l (l = 0..k) holds the points rho_l < i <= rho_{l+1}; it is one polynomial Q_l on
    // x_{rho_l + 1} .. x_{rho_{l+1} + k}, written in its own coordinate t = (x - cen_l) / half_l
    const fe = from[e];
    const i0 = lo[e], i1 = hi[e];
    if (fe >= 0 && canCopy) {
      // the same window on the same x: its values and (D B_e) are those of the last build
      allCoef.set(old!.coef.subarray(fe * nu, (fe + 1) * nu), e * nu);
      copyWindow(values, first, ov!, of!, fresh, nFresh, wd, e, fe, i0, i1);
      for (let q = 0; q <= k + 1; q++) penalty[e * (k + 2) + q] = op![fe * (k + 2) + q];
      continue;
    }
    if (!freshWindow(x, n, h, E, e, k, i0, i1, values, penalty, allCoef, work)) return null;
  }
  if (cache) {
    // this build's arrays become the last build's; the last build's (same x, so same n) the spare ones
    cache.spareValues = old?.values;
    cache.spareFirst = old?.first;
    cache.x = x; cache.k = k; cache.ext = E; cache.coef = allCoef; cache.values = values; cache.first = first; cache.penalty = penalty;
  }
  return { k, p, first, values, penalty };
}

/** Work space of {@link freshWindow}, allocated once per build. Unchecked. */
interface WindowWork {
  /** The window's k (k + 2) conditions on its (k + 1)^2 coefficients, and a copy for the band's elimination. */
  M: Float64Array; Mb: Float64Array;
  /** The null vector (the window's local coefficients), and nullVector's permutation and work space. */
  coef: Float64Array; perm: Int32Array; z: Float64Array;
  /** Each piece's centre and half-width. */
  cen: Float64Array; half: Float64Array;
  /** Largest |B_e| of the window being evaluated and the value where it is reached (its sign). */
  top: Float64Array;
}

/** A {@link WindowWork} for degree k. Unchecked. */
function windowWork(k: number): WindowWork {
  const nu = (k + 1) * (k + 1);
  return {
    M: new Float64Array((nu - 1) * nu), Mb: new Float64Array((nu - 1) * nu), coef: new Float64Array(nu), perm: new Int32Array(nu),
    z: new Float64Array(nu), cen: new Float64Array(k + 1), half: new Float64Array(k + 1), top: new Float64Array(2),
  };
}

/**
 * Window e of a build, not seen in the last one: its local coefficients (into allCoef), its values at
 * its points i0..i1 and (D B_e) at its knots. False when its local system is singular (numerically
 * coincident knots). A function of its own so that the build's loop over windows is short (DEVELOPERS.md,
 * "Long loops and the first call": the first build of a long series runs thousands of windows before
 * its loop is compiled). Unchecked.
 */
function freshWindow(x: Float64Array, n: number, h: number, E: Int32Array, e: number, k: number, i0: number, i1: number, values: Float64Array, penalty: Float64Array, allCoef: Float64Array, work: WindowWork): boolean {
  const { M, Mb, coef, perm, z, cen, half, top } = work;
  const nu = (k + 1) * (k + 1);
  const m = n - k - 1;
  windowConditions(x, n, h, E, e, k, nu, cen, half, M);
  // the band's own elimination first; complete pivoting (on the untouched conditions) when a pivot is too small there
  Mb.set(M);
  if (!bandedNullVector(Mb, nu - 1, nu, k, coef, z) && !nullVector(M, nu - 1, nu, coef, perm, z)) return false;
  allCoef.set(coef, e * nu);
  // the largest |B_e| on the data and the value where it is first reached (its sign), piece by piece
  // (piece l holds the points rho_l < i <= rho_{l+1}) from the points where it can be: a piece's
  // ends and the points beside its polynomial's turning points ({@link pieceTop})
  top[0] = 0; top[1] = 0;
  for (let l = 0; l <= k; l++) {
    const a = Math.max(i0, E[e + l] + 1), z1 = Math.min(i1, E[e + l + 1]);
    pieceTop(x, k, coef, l * (k + 1), cen[l], 1 / half[l], a, z1, top);
  }
  const vmax = top[0];
  if (!(vmax > 0) || !Number.isFinite(vmax)) return false;
  // scaled to max |B_e| = 1, and positive where largest (a null vector's sign is arbitrary): each
  // value is the polynomial's value times 1 / scale, as evaluated in one pass
  const scale = top[1], iv = 1 / scale;
  for (let l = 0; l <= k; l++) {
    const a = Math.max(i0, E[e + l] + 1), z1 = Math.min(i1, E[e + l + 1]);
    pieceValues(x, k, coef, l * (k + 1), cen[l], 1 / half[l], a, z1, k - l, values, iv);
  }
  // (D B_e) at knot rho_l = k! (jump of the leading coefficient in x units)
  const fact = k === 3 ? 6 : k === 2 ? 2 : 1;
  for (let q = 0; q <= k + 1; q++) {
    const r = E[e + q];
    if (!(r >= 0 && r < m)) continue;
    const after = q <= k ? coef[q * (k + 1) + k] / Math.pow(half[q], k) : 0;
    const before = q >= 1 ? coef[(q - 1) * (k + 1) + k] / Math.pow(half[q - 1], k) : 0;
    penalty[e * (k + 2) + q] = (fact * (after - before)) / scale;
  }
  return true;
}

// The passes over the points of one build, each its own function: the first call's compiler then
// works on small bodies instead of compiling the whole build once per loop while it runs. Unchecked.

/**
 * first[i] = the first basis function covering point i (hi, the last point of each, increases; points
 * past the last one get p), written by stretches. Unchecked.
 */
function firstCovering(hi: Int32Array, n: number, first: Int32Array): void {
  const p = hi.length;
  let start = 0;
  for (let e = 0; e < p && start < n; e++) {
    if (hi[e] < start) continue;
    const end = Math.min(n, hi[e] + 1);
    first.fill(e, start, end);
    start = end;
  }
  if (start < n) first.fill(p, start, n);
}

/**
 * Values of window e on piece l's points a..z1 (its coefficients at coef[o..o+k] in the piece's
 * coordinate t = (x - c) * ihl), each times iv, by Horner's rule written out for k = 3 and 2 (on long
 * series most of a build's time is spent here; the loop through {@link pieceValue}, the same
 * operations, made a build 20% slower). Each value goes to slot `slot` = k - l of its point: the
 * points of piece l lie between the window's knots rho_l and rho_{l+1}, where the first basis
 * function covering a point is e + l - k (the windows whose last knot is at or after the point), so
 * e - first[i] is k - l on the whole piece, with no read of `first` per point. Unchecked.
 */
function pieceValues(x: Float64Array, k: number, coef: Float64Array, o: number, c: number, ihl: number, a: number, z1: number, slot: number, values: Float64Array, iv: number): void {
  if (k === 3) {
    const c0 = coef[o], c1 = coef[o + 1], c2 = coef[o + 2], c3 = coef[o + 3];
    for (let i = a; i <= z1; i++) {
      const t = (x[i] - c) * ihl;
      const v = ((c3 * t + c2) * t + c1) * t + c0;
      values[i * 4 + slot] = v * iv;
    }
  } else if (k === 2) {
    const c0 = coef[o], c1 = coef[o + 1], c2 = coef[o + 2];
    for (let i = a; i <= z1; i++) {
      const t = (x[i] - c) * ihl;
      const v = (c2 * t + c1) * t + c0;
      values[i * 3 + slot] = v * iv;
    }
  } else {
    const wd = k + 1;
    for (let i = a; i <= z1; i++) values[i * wd + slot] = pieceValue(x, k, coef, o, c, ihl, i) * iv;
  }
}

/** The piece's polynomial at point i, as {@link pieceValues} evaluates it (the same operations). Unchecked. */
function pieceValue(x: Float64Array, k: number, coef: Float64Array, o: number, c: number, ihl: number, i: number): number {
  const t = (x[i] - c) * ihl;
  if (k === 3) return ((coef[o + 3] * t + coef[o + 2]) * t + coef[o + 1]) * t + coef[o];
  if (k === 2) return (coef[o + 2] * t + coef[o + 1]) * t + coef[o];
  let v = 0;
  for (let q = k; q >= 0; q--) v = v * t + coef[o + q];
  return v;
}

/** Points of a piece either side of a turning point checked by {@link pieceTop}. */
const TURNING_REACH = 3;

/**
 * The largest |value| of a piece's polynomial on its points a..z1 and the value where it is first
 * reached, folded into top = [largest so far, its value] in the order of the points (the first
 * point wins a tie), as a scan of every point would give. A polynomial of degree k <= 3 is monotone
 * between its turning points (roots of its derivative), so the largest |value| is at the piece's
 * ends or beside a turning point: those points are checked, {@link TURNING_REACH} on each side of
 * each turning point (its place among the points by bisection), in increasing order. Near a flat
 * top the computed values of neighbouring points differ by about (spacing / piece)^2 relative, far
 * above rounding unless a piece holds millions of points; if rounding ever picked another point the
 * scale of the basis function would change by a rounding error, never its span. O(k log n). Unchecked.
 */
function pieceTop(x: Float64Array, k: number, coef: Float64Array, o: number, c: number, ihl: number, a: number, z1: number, top: Float64Array): void {
  if (z1 < a) return;
  // a short piece: every point (as cheap as finding the turning points)
  if (z1 - a < SCAN_ALL_BELOW) { topOfPoints(x, k, coef, o, c, ihl, a, z1, top); return; }
  // turning points in t: roots of the derivative (k = 3: 3 c3 t^2 + 2 c2 t + c1; k = 2: 2 c2 t + c1)
  let t1 = NaN, t2 = NaN;
  if (k === 3) {
    const qa = 3 * coef[o + 3], qb = 2 * coef[o + 2], qc = coef[o + 1];
    if (qa !== 0) {
      const disc = qb * qb - 4 * qa * qc;
      if (disc >= 0) {
        const sq = Math.sqrt(disc);
        // the root of larger size first, the other from the product of the roots (no cancellation)
        t1 = (-qb - (qb >= 0 ? sq : -sq)) / (2 * qa);
        t2 = t1 !== 0 ? qc / (qa * t1) : -qb / qa;
      }
    } else if (qb !== 0) t1 = -qc / qb;
  } else if (k === 2) {
    if (coef[o + 2] !== 0) t1 = -coef[o + 1] / (2 * coef[o + 2]);
  }
  // each turning point's place among the points (the last point at or before it), in increasing order
  let p1 = turningPlace(x, c, ihl, t1, a, z1), p2 = turningPlace(x, c, ihl, t2, a, z1);
  if (p2 >= 0 && (p1 < 0 || p2 < p1)) { const t = p1; p1 = p2; p2 = t; }
  // the points to check, increasing, each once: the first point, TURNING_REACH either side of each
  // turning point, the last point
  let next = topOfPoints(x, k, coef, o, c, ihl, a, a, top);
  if (p1 >= 0) next = topOfPoints(x, k, coef, o, c, ihl, Math.max(next, p1 - TURNING_REACH + 1), Math.min(z1, p1 + TURNING_REACH), top);
  if (p2 >= 0) next = topOfPoints(x, k, coef, o, c, ihl, Math.max(next, p2 - TURNING_REACH + 1), Math.min(z1, p2 + TURNING_REACH), top);
  topOfPoints(x, k, coef, o, c, ihl, Math.max(next, z1), z1, top);
}

/** Pieces shorter than this many points are scanned whole by {@link pieceTop}. */
const SCAN_ALL_BELOW = 16;

/** The last point of a..z1 at or before the turning point t (in the piece's coordinate), or -1 when t is outside the piece or not a number. Unchecked. */
function turningPlace(x: Float64Array, c: number, ihl: number, t: number, a: number, z1: number): number {
  const xr = c + t / ihl;
  if (!(xr >= x[a] && xr <= x[z1])) return -1;
  let lo = a, hi = z1;
  while (lo < hi) { const mid = (lo + hi + 1) >> 1; if (x[mid] <= xr) lo = mid; else hi = mid - 1; }
  return lo;
}

/**
 * Folds the piece's values at points from..to (increasing) into top = [largest |value| so far, its
 * value], a point replacing the top only when strictly larger; returns the next point not yet checked
 * (from when the range is empty). Unchecked.
 */
function topOfPoints(x: Float64Array, k: number, coef: Float64Array, o: number, c: number, ihl: number, from: number, to: number, top: Float64Array): number {
  let vmax = top[0], vtop = top[1];
  for (let i = from; i <= to; i++) {
    const v = pieceValue(x, k, coef, o, c, ihl, i);
    const av = v < 0 ? -v : v;
    if (!(av <= vmax)) { vmax = av; vtop = v; }
  }
  top[0] = vmax; top[1] = vtop;
  return Math.max(from, to + 1);
}

/**
 * x_i, extended past both ends at the mean spacing h (phantom knots): the nearest data point plus
 * (i - that point) h, which is x_i itself inside the data. Every i runs the same operations, so the
 * right end's phantoms, met last in a build, do not meet code compiled without their type
 * information (DEVELOPERS.md, "Long loops and the first call"). Unchecked.
 */
function extendedX(x: Float64Array, n: number, h: number, i: number): number {
  const last = n - 1;
  const j = i < 0 ? 0 : i > last ? last : i;
  return x[j] + (i - j) * h;
}

/**
 * Window e's local conditions (its own function, so that the first call's compiler works on a small body):
 * each piece's centre and half-width (cen, half), then in M ((nu - 1) x nu, row-major) the rows
 * Q_{l-1} = Q_l at x_{rho_l + 1} .. x_{rho_l + k} for l = 0..k+1 (Q_{-1} = Q_{k+1} = 0), each
 * divided by its largest entry. Unchecked.
 */
function windowConditions(x: Float64Array, n: number, h: number, E: Int32Array, e: number, k: number, nu: number, cen: Float64Array, half: Float64Array, M: Float64Array): void {
  for (let l = 0; l <= k; l++) {
    const a = extendedX(x, n, h, E[e + l] + 1), b = extendedX(x, n, h, E[e + l + 1] + k);
    cen[l] = 0.5 * (a + b); half[l] = 0.5 * (b - a);
  }
  M.fill(0);
  let row = 0;
  for (let l = 0; l <= k + 1; l++) {
    for (let d = 1; d <= k; d++) {
      const xv = extendedX(x, n, h, E[e + l] + d);
      const o = row * nu;
      let big = 0;
      if (l <= k) { const t = (xv - cen[l]) / half[l]; let v = 1; for (let q = 0; q <= k; q++) { M[o + l * (k + 1) + q] = v; big = Math.max(big, Math.abs(v)); v *= t; } }
      if (l >= 1) { const t = (xv - cen[l - 1]) / half[l - 1]; let v = 1; for (let q = 0; q <= k; q++) { M[o + (l - 1) * (k + 1) + q] -= v; big = Math.max(big, Math.abs(v)); v *= t; } }
      for (let j = 0; j < nu; j++) M[o + j] /= big;
      row++;
    }
  }
}

/** The last point of each window of a build with extended knots E (hi of {@link discreteBSplines}), p of them. Unchecked. */
function lastPoints(E: Int32Array, k: number, n: number, p: number): Int32Array {
  const hi = new Int32Array(p);
  for (let e = 0; e < p; e++) hi[e] = Math.min(n - 1, E[e + k + 1]);
  return hi;
}

/**
 * Pass 2 of a build with the last build's arrays (ov, of): a point whose k + 1 windows all repeat
 * (`from`), in the same order, keeps its values (copied); the slots of the other points are cleared,
 * and their stretches are written to `fresh` as [start, end) pairs (adjacent ones merged). Returns
 * the number of pairs. The points are taken by stretches with the same first window in both builds,
 * found from the windows' last points (`hi`, and `ohi` of the last build: the first window covering
 * point i is e on hi[e - 1] < i <= hi[e]), so the pass costs O(p) plus the copies, with no scan of the
 * points (the scan was a tenth of order 3's cross-validation at 1e4). Unchecked.
 */
function keptPoints(first: Int32Array, of: Int32Array, from: Int32Array, ov: Float64Array, k: number, n: number, p: number, oldP: number, values: Float64Array, fresh: Int32Array, hi: Int32Array, ohi: Int32Array): number {
  const wd = k + 1;
  let count = 0;
  // points whose first windows, new and old, are both the same share the answer: decided once per stretch
  for (let i = 0; i < n; ) {
    const f0 = first[i], g0 = of[i];
    const end = Math.min(f0 < p ? hi[f0] + 1 : n, g0 < oldP ? ohi[g0] + 1 : n, n);
    let keep = true;
    for (let j = 0; j <= k; j++) {
      const e = f0 + j;
      if (e < p ? from[e] !== g0 + j : g0 + j < oldP) { keep = false; break; }
    }
    if (keep) values.set(ov.subarray(i * wd, end * wd), i * wd);
    else {
      values.fill(0, i * wd, end * wd);
      if (count > 0 && fresh[2 * count - 1] === i) fresh[2 * count - 1] = end;
      else { fresh[2 * count] = i; fresh[2 * count + 1] = end; count++; }
    }
    i = end;
  }
  return count;
}

/**
 * Window e's values on points i0..i1 not kept whole (the stretches listed in `fresh`, {@link keptPoints}),
 * copied from window fe of the last build (ov, of). Unchecked.
 */
function copyWindow(values: Float64Array, first: Int32Array, ov: Float64Array, of: Int32Array, fresh: Int32Array, nFresh: number, wd: number, e: number, fe: number, i0: number, i1: number): void {
  // the first stretch ending after i0 (binary search on the ends)
  let lo = 0, hi = nFresh;
  while (lo < hi) { const mid = (lo + hi) >> 1; if (fresh[2 * mid + 1] <= i0) lo = mid + 1; else hi = mid; }
  for (let s = lo; s < nFresh && fresh[2 * s] <= i1; s++) {
    const a = Math.max(i0, fresh[2 * s]), z = Math.min(i1 + 1, fresh[2 * s + 1]);
    for (let i = a; i < z; i++) values[i * wd + (e - first[i])] = ov[i * wd + (fe - of[i])];
  }
}

/** An empty {@link BasisCache}. */
export function basisCache(): BasisCache {
  return { x: null, k: -1, ext: new Int32Array(0), coef: new Float64Array(0) };
}

/**
 * The null vector of a window's conditions (rows x cols, row-major, rank cols - 1, the layout built
 * by {@link discreteBSplines}) by Gaussian elimination inside their band, with row pivoting and the
 * last column free. The k conditions at knot l involve only pieces l - 1 and l, so column c (piece
 * q = floor(c / (k + 1))) is non-zero only in the rows of knots up to q + 1, and eliminating it
 * touches only those rows and the columns of pieces up to q + 1: about a quarter of the work of
 * complete pivoting over the whole matrix. The last column is the leading coefficient of the last
 * piece, which is never zero for a basis function of smallest support (else it would vanish on that
 * piece and have k + 1 knots). False when a pivot is below 1e-13 of the largest or the result is not
 * finite: {@link nullVector} then decides with complete pivoting. `z` (length cols) is work space.
 * Unchecked.
 */
function bandedNullVector(M: Float64Array, rows: number, cols: number, k: number, out: Float64Array, z: Float64Array): boolean {
  const wd = k + 1;
  let top = 0;
  for (let c = 0; c < rows; c++) {
    const q = (c / wd) | 0;
    const rEnd = Math.min(rows, (q + 2) * k), cEnd = Math.min(cols, (q + 2) * wd);
    let pr = c, best = 0;
    for (let r = c; r < rEnd; r++) { const a = M[r * cols + c], v = a < 0 ? -a : a; if (v > best) { best = v; pr = r; } }
    if (best > top) top = best;
    if (!(best > 1e-13 * top)) return false;
    if (pr !== c) for (let j = c; j < cEnd; j++) { const t = M[c * cols + j]; M[c * cols + j] = M[pr * cols + j]; M[pr * cols + j] = t; }
    const piv = M[c * cols + c];
    for (let r = c + 1; r < rEnd; r++) {
      const f = M[r * cols + c] / piv;
      if (f === 0) continue;
      for (let j = c; j < cEnd; j++) M[r * cols + j] -= f * M[c * cols + j];
    }
  }
  return withLastFree(M, rows, cols, z, out);
}

/**
 * A null vector of the rows x cols matrix M (row-major, rank cols - 1): Gaussian
 * elimination with complete pivoting, the last free column set to 1. False when the
 * rank is lower (numerically coincident knots). `perm` and `z` (length cols) are work space. Unchecked.
 */
function nullVector(M: Float64Array, rows: number, cols: number, out: Float64Array, perm: Int32Array, z: Float64Array): boolean {
  for (let j = 0; j < cols; j++) perm[j] = j;
  let top = 0;
  for (let c = 0; c < rows; c++) {
    let pr = c, pc = c, best = 0;
    // |M| written out: the same value as Math.abs (NaN stays NaN), cheaper where global lookups are slow (a test runner's vm context)
    for (let r = c; r < rows; r++) for (let j = c; j < cols; j++) { const a = M[r * cols + j], v = a < 0 ? -a : a; if (v > best) { best = v; pr = r; pc = j; } }
    if (c === 0) top = best;
    if (!(best > 1e-13 * top)) return false;
    if (pr !== c) for (let j = 0; j < cols; j++) { const t = M[c * cols + j]; M[c * cols + j] = M[pr * cols + j]; M[pr * cols + j] = t; }
    if (pc !== c) { for (let r = 0; r < rows; r++) { const t = M[r * cols + c]; M[r * cols + c] = M[r * cols + pc]; M[r * cols + pc] = t; } const t = perm[c]; perm[c] = perm[pc]; perm[pc] = t; }
    const piv = M[c * cols + c];
    for (let r = c + 1; r < rows; r++) {
      const f = M[r * cols + c] / piv;
      if (f === 0) continue;
      for (let j = c; j < cols; j++) M[r * cols + j] -= f * M[c * cols + j];
    }
  }
  // columns 0..rows-1 (permuted) are pivots; the last one is free
  return withLastFree(M, rows, cols, z, out, perm);
}

/**
 * The null vector of an eliminated system (upper triangular in its first `rows` columns) with its
 * last column set to 1, by back substitution into z, written to out (entry j at perm[j] when the
 * columns were permuted). False when it is not finite. Unchecked.
 */
function withLastFree(M: Float64Array, rows: number, cols: number, z: Float64Array, out: Float64Array, perm?: Int32Array): boolean {
  z[rows] = 1;
  for (let c = rows - 1; c >= 0; c--) {
    let s = -M[c * cols + rows];
    for (let j = c + 1; j < rows; j++) s -= M[c * cols + j] * z[j];
    z[c] = s / M[c * cols + c];
  }
  for (let j = 0; j < cols; j++) { if (!Number.isFinite(z[j])) return false; out[perm ? perm[j] : j] = z[j]; }
  return true;
}
