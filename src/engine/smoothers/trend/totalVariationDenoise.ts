import { FIRST_CALL_POINTS } from '../../linalg/firstCallPoints';

/**
 * Weighted total-variation denoising (the 1-D fused lasso, trend filtering of
 * order 0), solved exactly in O(n) amortised time by the dynamic programming
 * algorithm of N. A. Johnson, "A dynamic programming algorithm for the fused
 * lasso and L0-segmentation", J. Comput. Graph. Statist. 22 (2013), here with
 * a weight on every squared residual.
 *
 *   minimise over b:  1/2 sum_i w_i (y_i - b_i)^2 + lambda sum_i |b_{i+1} - b_i|
 *
 * Forward pass: the derivative of the message F_i(b) (the best cost of b_1..b_i
 * with b_i = b) is piecewise linear and increasing; it is kept as a deque of
 * breakpoints, each carrying the change of slope and intercept across it.
 * Clipping that derivative to [-lambda, lambda] gives the next message and two
 * thresholds lo_i, hi_i. Backward pass: b_n minimises F_n and
 * b_i = min(max(b_{i+1}, lo_i), hi_i). Every breakpoint is pushed once and
 * popped at most once, hence O(n). The answer is exact up to rounding (no
 * iterations, no tolerance).
 *
 * @param y - values (length n >= 1)
 * @param w - positive weights (length n)
 * @param lambda - penalty >= 0, in units of y (times weight)
 * @param out - optional output of length n
 * @param work - optional workspace from {@link totalVariationWorkspace} for this n (saves allocations in iterations that call this repeatedly)
 * @returns the minimiser b (length n)
 * @example
 * ```ts
 * totalVariationDenoise(Float64Array.of(0, 0, 4, 4), Float64Array.of(1, 1, 1, 1), 1); // [0.5, 0.5, 3.5, 3.5]
 * ```
 * Unchecked: weights must be positive and finite.
 */
export function totalVariationDenoise(y: ArrayLike<number>, w: ArrayLike<number>, lambda: number, out?: Float64Array, work?: TotalVariationWorkspace): Float64Array {
  const n = y.length;
  const b = out && out.length >= n ? out : new Float64Array(n);
  if (n === 0) return b;
  if (!(lambda > 0) || n === 1) {
    for (let i = 0; i < n; i++) b[i] = y[i];
    return b;
  }
  const ws = work && work.lo.length >= n ? work : totalVariationWorkspace(n);
  const { pos, da, dc, lo, hi } = ws;
  // the forward pass over a few points first, then the rest, with the first and one-past-last knot
  // carried in st: every statement has run before the loop is long (DEVELOPERS.md, "Long loops and
  // the first call"); the last point and the backward pass are kernels of their own
  const st = new Float64Array(2);
  st[0] = n + 1; // first knot
  st[1] = n + 1; // one past the last knot
  const first = Math.min(n - 1, FIRST_CALL_POINTS);
  forwardMessages(y, w, lambda, pos, da, dc, lo, hi, 0, first, st);
  forwardMessages(y, w, lambda, pos, da, dc, lo, hi, first, n - 1, st);
  b[n - 1] = lastPoint(w[n - 1], y[n - 1], lambda, pos, da, dc, st[0], st[1]);
  backwardClip(b, lo, hi, n);
  return b;
}

/**
 * Points from .. to - 1 of the forward pass: each point's message is clipped at -lambda and lambda,
 * giving its interval [lo_i, hi_i] and two new breakpoints of the derivative (knots head .. tail - 1,
 * st = [head, tail]). Unchecked.
 */
function forwardMessages(y: ArrayLike<number>, w: ArrayLike<number>, lambda: number, pos: Float64Array, da: Float64Array, dc: Float64Array, lo: Float64Array, hi: Float64Array, from: number, to: number, st: Float64Array): void {
  let head = st[0], tail = st[1];
  for (let i = from; i < to; i++) {
    const wi = w[i];
    const ci = -wi * y[i];
    // left segment: derivative (a b + c) with the clipped message at -lambda (none at i = 0)
    let a = wi;
    let c = i === 0 ? ci : ci - lambda;
    // find lo: derivative = -lambda, scanning from the left
    while (head < tail) {
      const p = pos[head];
      if (a * p + c > -lambda) break;
      a += da[head];
      c += dc[head];
      head++;
    }
    const xlo = (-lambda - c) / a;
    const aL = a, cL = c;
    // right segment
    a = wi;
    c = i === 0 ? ci : ci + lambda;
    while (head < tail) {
      const p = pos[tail - 1];
      if (a * p + c < lambda) break;
      a -= da[tail - 1];
      c -= dc[tail - 1];
      tail--;
    }
    const xhi = (lambda - c) / a;
    // new breakpoints: left constant -lambda to (aL, cL); (aR, cR) to constant lambda
    head--;
    pos[head] = xlo; da[head] = aL; dc[head] = cL + lambda;
    pos[tail] = xhi; da[tail] = -a; dc[tail] = lambda - c;
    tail++;
    lo[i] = xlo;
    hi[i] = xhi;
  }
  st[0] = head; st[1] = tail;
}

/** The last point: the minimiser of F_n, where w (b - y) + G'(b) = 0, G' from -lambda to lambda over knots head .. tail - 1. Unchecked. */
function lastPoint(wl: number, yl: number, lambda: number, pos: Float64Array, da: Float64Array, dc: Float64Array, head: number, tail: number): number {
  let a = wl;
  let c = -wl * yl - lambda;
  while (head < tail) {
    const p = pos[head];
    if (a * p + c > 0) break;
    a += da[head];
    c += dc[head];
    head++;
  }
  return -c / a;
}

/** The backward pass: b_i = b_{i+1} clipped to [lo_i, hi_i]. Unchecked. */
function backwardClip(b: Float64Array, lo: Float64Array, hi: Float64Array, n: number): void {
  for (let i = n - 2; i >= 0; i--) {
    const v = b[i + 1];
    b[i] = v < lo[i] ? lo[i] : v > hi[i] ? hi[i] : v;
  }
}

/** Work arrays of {@link totalVariationDenoise}. */
export interface TotalVariationWorkspace { pos: Float64Array; da: Float64Array; dc: Float64Array; lo: Float64Array; hi: Float64Array }

/** Allocates the work arrays of {@link totalVariationDenoise} for series of length up to n. Unchecked. */
export function totalVariationWorkspace(n: number): TotalVariationWorkspace {
  const cap = 2 * n + 2;
  return { pos: new Float64Array(cap), da: new Float64Array(cap), dc: new Float64Array(cap), lo: new Float64Array(n), hi: new Float64Array(n) };
}
