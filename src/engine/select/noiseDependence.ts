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
 * The estimate ({@link dependencePhi}) reads the variogram of the series at
 * lags 1 to 4 ({@link variogramPhi}), where correlated noise rises and
 * saturates (1 - phi^L) while a trend grows with the square of the lag. Fast
 * deterministic structure (a chirp, a run of jumps) also saturates within a
 * few lags, so the same variogram is read again on the residuals of two
 * wavelet pilots that follow such structure but not correlated noise (level
 * by level thresholds, {@link levelwiseHardShrink}), and the smallest reading
 * is kept. The changepoint models scale their penalties by the variogram of
 * the series alone (breaks/noiseCorrelation.ts), the reading their penalties
 * were calibrated with.
 */
import { medianInPlace } from '../median';
import type { NoiseAssumption } from '../types';
import { levelwiseHardShrink } from '../smoothers/wavelet/levelwiseHardShrink';

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
 * phi from {@link dependencePhi}; buffer = the lag at which phi^lag falls below 0.05, used when phi exceeds
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
  const phi = dependencePhi(y);
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

/** Series shorter than this are read by the variogram alone (the pilots' coarse levels would be too few). */
const FEWEST_FOR_PILOTS = 64;

/**
 * Starts averaged in each pilot (translation invariance, {@link levelwiseHardShrink}). With one start,
 * jumps that fall between the Haar pilot's dyadic blocks were left in its residuals: on Blocks (SNR 7,
 * 256 points, seeds 21-24) the reading was 0.00 to 0.29, with 8 starts 0.00 to 0.13 (Doppler 0.12 to
 * 0.20 became 0.00 to 0.13), while AR(1) readings on 156 to 2,000 points moved by at most 0.13, downward.
 */
const PILOT_STARTS = 8;

/** Longest series whose pilots average {@link PILOT_STARTS} starts (each start costs two transforms); longer ones use one. */
const MOST_FOR_STARTS = 65536;

/**
 * Lag-one dependence of the noise of y (values in x order): the smallest of
 * {@link variogramPhi} read on y itself and on the residuals of two pilot fits,
 * {@link levelwiseHardShrink} with the symmlet of 8 vanishing moments (smooth
 * and fast-changing structure, such as a chirp) and with the Haar wavelet
 * (jumps). The variogram of y alone takes such structure for correlated noise:
 * on the Doppler and Blocks test functions of Donoho & Johnstone (1994) with
 * independent noise at SNR 7 (256 points) it read 0.36 to 0.95, which held out
 * blocks and made every smoother over-smooth. The pilots' level-by-level
 * thresholds keep them off correlated noise, so on AR(1) noise their residuals
 * keep its dependence (tested: within 0.05 of the true coefficient on 2,000
 * points; on nine 156-point series a mean error of 0.09, against 0.22 for the
 * variogram of the series, which reads high there). The pilots' thresholds are
 * the universal rule, not chosen by the data's cross-validation, which would
 * itself have followed the correlated noise. Series under 64 points: the
 * variogram alone. O(n): each pilot averages 8 starts up to 65,536 points,
 * one beyond. A reading is kept with a copy of the values it was taken on and
 * returned again for the same, unchanged array. Unchecked.
 */
export function dependencePhi(y: ArrayLike<number>): number {
  // the automatic choice asks once per candidate and per warning, on the same array: read it once
  const kept = readings.get(y);
  if (kept && sameValues(kept.values, y)) return kept.phi;
  const phi = readDependence(y);
  readings.set(y, { values: Float64Array.from(y), phi });
  return phi;
}

/** Readings already taken, by the array they were taken on, with a copy of its values to check it is unchanged. */
const readings = new WeakMap<ArrayLike<number>, { values: Float64Array; phi: number }>();

/** Whether y holds exactly these values (NaN equal to NaN). Unchecked. */
function sameValues(a: Float64Array, y: ArrayLike<number>): boolean {
  if (a.length !== y.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], y[i])) return false;
  return true;
}

/** {@link dependencePhi} without its memory. Unchecked. */
function readDependence(y: ArrayLike<number>): number {
  const n = y.length;
  let phi = variogramPhi(y);
  if (n < FEWEST_FOR_PILOTS || !(phi > 0)) return phi;
  // in units of max |y|: the transform's coarse coefficients grow by sqrt 2 a level and would overflow near the double range
  let a = 0;
  for (let i = 0; i < n; i++) a = Math.max(a, Math.abs(y[i]));
  const ys = new Float64Array(n);
  for (let i = 0; i < n; i++) ys[i] = y[i] / a;
  const starts = n <= MOST_FOR_STARTS ? PILOT_STARTS : 1;
  for (const filter of ['sym8', 'db1'] as const) {
    const r = levelwiseHardShrink(ys, filter, starts);
    for (let i = 0; i < n; i++) r[i] = ys[i] - r[i];
    phi = Math.min(phi, variogramPhi(r));
  }
  return phi;
}

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
  if (n <= LAGS) return 0;
  const V = new Float64Array(LAGS + 1);
  // squares of differences overflow for |y| near the ends of the double range: work in units of max |y|
  let a = 0;
  for (let i = 0; i < n; i++) a = Math.max(a, Math.abs(y[i]));
  if (!(a > 0) || !Number.isFinite(a)) return 0;
  // squares are taken in units of the lag-1 spread, so they stay near 1 whatever the values' magnitude
  // (in units of max |y| alone, a single huge value would make them underflow and the weights overflow)
  let unit = 0;
  // one typed copy and two buffers for all lags (a full column would otherwise allocate and collect 8 arrays of n)
  const ys = y instanceof Float64Array ? y : Float64Array.from(y);
  const diffs = new Float64Array(n - 1), scratch = new Float64Array(n - 1);
  for (let L = 1; L <= LAGS; L++) {
    const len = n - L;
    const d = diffs.subarray(0, len), work = scratch.subarray(0, len);
    for (let i = 0; i < len; i++) d[i] = ys[i + L] / a - ys[i] / a;
    work.set(d);
    const m = medianInPlace(work);
    for (let i = 0; i < len; i++) work[i] = Math.abs(d[i] - m);
    const s = 1.4826 * medianInPlace(work);
    if (L === 1) unit = s > 0 ? s : 1;
    let acc = 0;
    for (let i = 0; i < len; i++) { const v = (s > 0 ? Math.max(-4 * s, Math.min(4 * s, d[i] - m)) + m : d[i]) / unit; acc += v * v; }
    V[L] = acc / len;
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
