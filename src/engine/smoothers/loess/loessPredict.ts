import { KnotwiseError, showNumber } from '../../errors';
import { localPolynomial, type LocalFit } from './localPolynomial';
import { loessInput } from './loessFit';

/**
 * LOESS values at new positions from a sample (x, y, w) and its robustness weights: at each
 * new x0 the q = floor(n * span + 1e-5) sample points nearest to x0, tricube weights over the
 * distance to the q-th nearest, and the local polynomial's value at x0, exactly as
 * {@link loessFit} computes it at a sample point (Cleveland & Devlin 1988). Used to predict
 * held-out points in cross-validation and to evaluate a fit between and beyond the data
 * (beyond the data it is an extrapolation of the end polynomials, not a forecast).
 * O(m q) for m new positions, plus a sort when they are not in increasing order.
 *
 * @param x - sorted sample positions
 * @param y - sample values
 * @param w - sample weights or null
 * @param rw - robustness weights per sample point (from loessFit), or null for all 1
 * @param span - in (0, 1]
 * @param degree - 0, 1 or 2
 * @param xNew - positions to predict at (finite; any order)
 * @example
 * ```ts
 * const f = loessFit(x, y, null, { span: 0.3 });
 * loessPredict(x, y, null, f.robustnessWeights, 0.3, 1, Float64Array.of(2.5)); // value at 2.5
 * ```
 */
export function loessPredict(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number> | null | undefined, rw: ArrayLike<number> | null | undefined,
  span: number, degree: 0 | 1 | 2, xNew: ArrayLike<number>): Float64Array {
  const inp = loessInput(x, y, w);
  const n = inp.n;
  if (typeof span !== 'number' || !(span > 0 && span <= 1)) throw new KnotwiseError('bad-option', `span must be a number in (0, 1]; got ${showNumber(span)}.`);
  if (degree !== 0 && degree !== 1 && degree !== 2) throw new KnotwiseError('bad-option', `degree must be 0, 1 or 2; got ${String(degree)}.`);
  const q = Math.min(n, Math.floor(n * span + 1e-5));
  if (q < Math.max(2, degree + 1)) throw new KnotwiseError('bad-option', `span ${showNumber(span)} gives ${q} points per neighbourhood for ${n} points; degree ${degree} needs at least ${Math.max(2, degree + 1)}.`);
  const r = new Float64Array(n);
  if (rw) {
    if (rw.length !== n) throw new KnotwiseError('shape-mismatch', `the robustness weights have ${rw.length} values but y has ${n}.`);
    for (let i = 0; i < n; i++) r[i] = rw[i];
  } else r.fill(1);
  const m = xNew.length;
  const order = Array.from({ length: m }, (_, k) => k);
  for (let k = 0; k < m; k++) if (!Number.isFinite(xNew[k])) throw new KnotwiseError('bad-data', `the position at ${k + 1} is not a finite number: ${showNumber(xNew[k])}.`);
  order.sort((a, b) => xNew[a] - xNew[b]);
  const out = new Float64Array(m);
  const fit: LocalFit = { value: 0, x0: 0, h: 0, degree: 0, c0: 0, c1: 0, c2: 0, weightSum: 0 };
  const xs = inp.x;
  let lo = 0;
  for (const k of order) {
    const x0 = xNew[k];
    // the window of q points nearest to x0 moves right as x0 grows
    while (lo + q < n && x0 - xs[lo] > xs[lo + q] - x0) lo++;
    const h = Math.max(Math.abs(x0 - xs[lo]), Math.abs(xs[lo + q - 1] - x0));
    localPolynomial(xs, inp.y, inp.w, r, lo, lo + q - 1, x0, h, degree, fit);
    out[k] = fit.value;
  }
  return out;
}
