/**
 * Lag-one correlation of the noise, estimated robustly from differences, and the
 * penalty factor that keeps a changepoint penalty valid under AR(1) noise.
 */
import { variogramPhi } from '../select/noiseDependence';
import { warning, type Warning } from '../warnings';
import type { NoiseTreatment } from './types';
import type { ResolvedBreaksOptions } from './validateBreaksOptions';

/** Largest correlation used (beyond it the long-run variance is too uncertain to scale by). */
export const MAX_NOISE_CORRELATION = 0.9;

/** What {@link noiseCorrelation} estimates. */
export interface NoiseCorrelation {
  /** Estimated lag-one correlation phi of AR(1) noise, clamped to [0, {@link MAX_NOISE_CORRELATION}]. */
  phi: number;
  /** The estimate before clamping to {@link MAX_NOISE_CORRELATION} (NaN when the series is too short to estimate it). */
  raw: number;
  /** Long-run to marginal variance ratio (1 + phi) / (1 - phi): the factor applied to the penalty. */
  penaltyFactor: number;
  /** Factor turning the lag-one difference scale sqrt(var(y[i+1] - y[i]) / 2) into the marginal noise sd: 1 / sqrt(1 - phi). */
  marginalFactor: number;
}

/** Fewest points on which the noise correlation is estimated (shorter series are taken as independent). */
export const FEWEST_FOR_CORRELATION = 24;

/**
 * Robust AR(1) noise correlation, read from the variogram of the series at lags 1 to 4
 * ({@link variogramPhi}; cross-validation's fold plan reads the same variogram on the
 * series and on the residuals of two wavelet pilots and keeps the smallest, see
 * select/noiseDependence.ts; the penalties here were calibrated on the series' own
 * reading). For y_i = level_i + e_i with AR(1) noise e
 * (coefficient phi, marginal variance s^2) and a level that is locally a line of slope b,
 *
 *   V(L) = mean (y[i+L] - y[i])^2 = 2 s^2 (1 - phi^L) + b^2 L^2,
 *
 * so correlated noise rises and levels off with the lag while a trend or a slow swing
 * keeps growing with its square; phi is fitted over both terms. Each V(L) is a mean of
 * squared differences winsorised at 4 robust sds, so level shifts and spikes count
 * little. This is the estimation idea of DeCAFS (Romano, Rigaill, Runge & Fearnhead
 * 2022, "Detecting abrupt changes in the presence of local fluctuations and
 * autocorrelated noise", JASA 117:2147-2162, section 4: robust estimates from the
 * variances of k-lag differences, with a term for the local drift), applied to AR(1)
 * noise only.
 *
 * Why not the ratio of lag-2 to lag-1 difference spreads (phi = (v2 / v1)^2 - 1, used
 * here before): two MADs of about 100 differences each make that ratio so variable that
 * series with independent noise read phi near 0.9 (a penalty 19 times too large, a
 * clear step missed), and a slow swing of the level, which widens lag-2 differences more
 * than lag-1 ones, is read as correlation; the variogram's trend term and its four
 * winsorised means (efficient, still robust) avoid both.
 *
 * The penalty factor is the long-run variance ratio (1 + phi) / (1 - phi) of AR(1)
 * noise: the change-in-mean statistic of independent noise holds for correlated noise
 * once its variance is replaced by the long-run variance (Lavielle & Moulines 2000,
 * "Least-squares estimation of an unknown number of shifts in a time series", J. Time
 * Series Analysis 21:33-59), which multiplies the cost's scale, equivalently the penalty,
 * by that ratio. The penalty is never lowered (phi >= 0). Series shorter than
 * {@link FEWEST_FOR_CORRELATION} points are taken as independent (phi 0): four lags of
 * a shorter series say little about the noise. Unchecked.
 *
 * @param y - values in x order (roughly equal spacing assumed)
 * @example
 * ```ts
 * noiseCorrelation(ar1Series).phi; // about 0.5 for phi = 0.5 noise
 * ```
 */
export function noiseCorrelation(y: ArrayLike<number>): NoiseCorrelation {
  const raw = y.length >= FEWEST_FOR_CORRELATION ? variogramPhi(y) : NaN;
  const phi = Number.isFinite(raw) ? Math.min(MAX_NOISE_CORRELATION, Math.max(0, raw)) : 0;
  return { phi, raw, penaltyFactor: (1 + phi) / (1 - phi), marginalFactor: 1 / Math.sqrt(1 - phi) };
}

/** The noise treatment of a Gaussian model: estimated correlation and penalty factor (manual penalties are not scaled). Unchecked. */
export function noiseTreatment(y: ArrayLike<number>, o: ResolvedBreaksOptions): NoiseTreatment & { marginalFactor: number } {
  if (o.noise === 'independent') return { assumption: 'independent', correlation: 0, penaltyFactor: 1, marginalFactor: 1 };
  const c = noiseCorrelation(y);
  return { assumption: 'correlated', correlation: c.phi, penaltyFactor: typeof o.penalty === 'number' ? 1 : c.penaltyFactor, marginalFactor: c.marginalFactor };
}

/** The note a noticeable noise correlation earns (none below 0.3, so ordinary series stay quiet). Unchecked. */
export function correlationNote(noise: NoiseTreatment): Warning | null {
  if (noise.assumption !== 'correlated' || noise.correlation < 0.3) return null;
  const scaled = noise.penaltyFactor > 1 ? `the penalty was multiplied by the long-run variance ratio (1 + phi) / (1 - phi) = ${noise.penaltyFactor.toFixed(2)}` : 'a manual penalty is used as given';
  return warning('note', `the noise looks autocorrelated (lag-one correlation about ${noise.correlation.toFixed(2)}, estimated from the spread of differences at lags 1 to 4); ${scaled}, so slow swings of the noise are not read as breaks. Set noise 'independent' to assume independent noise.`);
}

