/**
 * How far the noise of a series reaches: an AR(1)-style coefficient estimated
 * from differences, and the cross-validation plan that keeps correlated
 * neighbours out of each other's folds.
 *
 * Why: with positively correlated noise, a held-out point's neighbours carry
 * its error, so cross-validation (and GCV) reward fits that follow the noise
 * and choose almost no smoothing (Opsomer, Wang & Yang 2001, Statistical
 * Science 16:134-153). Leaving the neighbours of held-out points out of the
 * training set restores the criterion (Chu & Marron 1991, Annals of
 * Statistics 19:1906-1918; the h-block scheme of Burman, Chow & Nolan 1994,
 * Biometrika 81:351-358).
 *
 * The estimate ({@link variogramPhi}) reads the variogram of the series at
 * lags 1 to 4, where correlated noise rises and saturates (1 - phi^L) while a
 * trend grows with the square of the lag, so the two are told apart without a
 * pilot fit (a pilot chosen by the data would itself have absorbed the
 * correlated noise). The changepoint models scale their penalties by the same
 * estimate (breaks/noiseCorrelation.ts).
 */
import { median } from '../median';
import type { NoiseAssumption } from '../types';

/** The dependence estimate and the fold plan it implies. */
export interface NoiseDependence {
  /** Estimated lag-one coefficient, clipped to [0, 0.95]. */
  phi: number;
  /** Points left out on each side of a held-out block (0: independent noise, ordinary folds). */
  buffer: number;
  /** Length of the held-out blocks (1 when buffer is 0). */
  block: number;
}

/**
 * Estimates the noise dependence of values in x order and the plan for
 * `folds`-fold cross-validation.
 *
 * buffer = the lag at which phi^lag falls below 0.05, used when phi exceeds
 * max(0.15, 1.5 / sqrt(n)) (leaving neighbours out costs little when the
 * noise is in fact independent, keeping them in costs a fit that follows the
 * noise, so the bar is low); at most n / (6 folds) so each fold keeps most of
 * its training points. Blocks are 3 x buffer long, so a fold's buffers remove
 * about two thirds as many points as it holds out. Unchecked.
 *
 * @example
 * ```ts
 * noiseDependence(ar1Series, 5); // { phi: 0.47, buffer: 4, block: 12 }
 * ```
 */
export function noiseDependence(y: ArrayLike<number>, folds: number): NoiseDependence {
  const n = y.length;
  if (n < 24) return { phi: 0, buffer: 0, block: 1 };
  const phi = variogramPhi(y);
  if (!(phi > Math.max(0.15, 1.5 / Math.sqrt(n)))) return { phi, buffer: 0, block: 1 };
  const reach = Math.ceil(Math.log(0.05) / Math.log(phi));
  const buffer = Math.min(reach, Math.floor(n / (6 * folds)));
  if (buffer < 1) return { phi, buffer: 0, block: 1 };
  return { phi, buffer, block: 3 * buffer };
}

/**
 * The fold plan for an assumption about the noise: {@link noiseDependence} for 'correlated'
 * (the default), ordinary folds (phi taken as 0) for 'independent'. The one place the smoothers'
 * cross-validation and their warnings get their plan from, so both describe the same folds.
 * Unchecked.
 */
export function foldPlan(y: ArrayLike<number>, folds: number, noise: NoiseAssumption = 'correlated'): NoiseDependence {
  return noise === 'independent' ? { phi: 0, buffer: 0, block: 1 } : noiseDependence(y, folds);
}

const LAGS = 4;

/**
 * phi from the variogram of y at lags 1..4, modelled as noise plus a trend:
 * V(L) = mean (y_{i+L} - y_i)^2 = 2 s2 (1 - phi^L) + beta L^2, where s2 is the
 * noise variance and beta the mean squared slope of the trend per point (a
 * trend that changes slowly is locally a line). Each V(L) is a mean of
 * squared differences winsorised at 4 robust standard deviations (MAD), so
 * level shifts and spikes count little. phi is found on a grid of 0.01 by
 * least squares in relative terms, s2 and beta >= 0 solved at each phi.
 * Unchecked.
 */
export function variogramPhi(y: ArrayLike<number>): number {
  const n = y.length;
  const V = new Float64Array(LAGS + 1);
  // squares of differences overflow for |y| near the ends of the double range: work in units of max |y|
  let a = 0;
  for (let i = 0; i < n; i++) a = Math.max(a, Math.abs(y[i]));
  if (!(a > 0) || !Number.isFinite(a)) return 0;
  // squares are taken in units of the lag-1 spread, so they stay near 1 whatever the values' magnitude
  // (in units of max |y| alone, a single huge value would make them underflow and the weights overflow)
  let unit = 0;
  for (let L = 1; L <= LAGS; L++) {
    const d = new Float64Array(n - L);
    for (let i = 0; i + L < n; i++) d[i] = y[i + L] / a - y[i] / a;
    const m = median(d);
    const dev = Float64Array.from(d, (v) => Math.abs(v - m));
    const s = 1.4826 * median(dev);
    if (L === 1) unit = s > 0 ? s : 1;
    let acc = 0;
    for (let i = 0; i < d.length; i++) { const v = (s > 0 ? Math.max(-4 * s, Math.min(4 * s, d[i] - m)) + m : d[i]) / unit; acc += v * v; }
    V[L] = acc / d.length;
  }
  if (!(V[1] > 0)) return 0;
  let best = 0, bestErr = Infinity;
  for (let k = 0; k <= 95; k++) {
    const phi = k / 100;
    // weighted least squares (weights 1 / V(L)^2) for V(L) = s2 a_L + beta b_L with a_L = 2 (1 - phi^L), b_L = L^2
    let aa = 0, ab = 0, bb = 0, av = 0, bv = 0;
    for (let L = 1; L <= LAGS; L++) {
      const wt = 1 / (V[L] * V[L]);
      const aL = 2 * (1 - phi ** L), bL = L * L;
      aa += wt * aL * aL; ab += wt * aL * bL; bb += wt * bL * bL; av += wt * aL * V[L]; bv += wt * bL * V[L];
    }
    const det = aa * bb - ab * ab;
    let s2 = det > 0 ? (av * bb - bv * ab) / det : av / aa;
    let beta = det > 0 ? (aa * bv - ab * av) / det : 0;
    if (beta < 0) { beta = 0; s2 = av / aa; }
    if (s2 < 0) { s2 = 0; beta = bv / bb; }
    let err = 0;
    for (let L = 1; L <= LAGS; L++) { const r = (V[L] - s2 * 2 * (1 - phi ** L) - beta * L * L) / V[L]; err += r * r; }
    if (err < bestErr - 1e-15) { bestErr = err; best = phi; }
  }
  return best;
}

/**
 * Fold of each point under a plan: blocks of `block` points dealt to the folds
 * in turn (with block 1, the plan without a buffer, these are the ordinary
 * interleaved folds of {@link foldOf}); the first and last points are never
 * held out. Unchecked.
 */
export function blockFolds(n: number, folds: number, plan: NoiseDependence): Int32Array {
  const f = new Int32Array(n);
  for (let i = 0; i < n; i++) f[i] = Math.floor((i - 1) / plan.block) % folds;
  f[0] = -1;
  f[n - 1] = -1;
  return f;
}
