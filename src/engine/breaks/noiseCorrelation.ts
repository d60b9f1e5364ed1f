/**
 * Lag-one correlation of the noise, estimated robustly from differences, and the
 * penalty factor that keeps a changepoint penalty valid under AR(1) noise.
 */
import { median } from '../median';
import { warning, type Warning } from '../warnings';
import type { NoiseTreatment } from './types';
import type { ResolvedBreaksOptions } from './validateBreaksOptions';

/** Largest correlation used (beyond it the long-run variance is too uncertain to scale by). */
export const MAX_NOISE_CORRELATION = 0.9;

/** 1.4826 * MAD of y[i + lag] - y[i] (0 when fewer than 2 differences). Unchecked. */
function lagDifferenceMad(y: ArrayLike<number>, lag: number): number {
  const m = y.length - lag;
  if (m < 2) return 0;
  const d = new Float64Array(m);
  for (let i = 0; i < m; i++) d[i] = y[i + lag] - y[i];
  const med = median(d);
  for (let i = 0; i < m; i++) d[i] = Math.abs(d[i] - med);
  return 1.4826 * median(d);
}

/** What {@link noiseCorrelation} estimates. */
export interface NoiseCorrelation {
  /** Estimated lag-one correlation phi of AR(1) noise, clamped to [0, {@link MAX_NOISE_CORRELATION}]. */
  phi: number;
  /** The raw estimate before clamping (may be negative or NaN when the series is too short). */
  raw: number;
  /** Long-run to marginal variance ratio (1 + phi) / (1 - phi): the factor applied to the penalty. */
  penaltyFactor: number;
  /** Factor turning the lag-one difference scale sqrt(var(y[i+1] - y[i]) / 2) into the marginal noise sd: 1 / sqrt(1 - phi). */
  marginalFactor: number;
}

/**
 * Robust AR(1) noise correlation from the spread of lag-1 and lag-2 differences.
 * For y_i = level_i + e_i with AR(1) noise e (coefficient phi, marginal variance s^2),
 *
 *   var(y[i+1] - y[i]) = 2 s^2 (1 - phi),   var(y[i+2] - y[i]) = 2 s^2 (1 - phi^2),
 *
 * so phi = v2 / v1 - 1, with each variance from a MAD (1.4826 * median absolute
 * deviation) of the differences: robust to level shifts (few differences straddle one),
 * to linear trends (the median removes the drift) and to spikes. This is the
 * estimation idea of DeCAFS (Romano, Rigaill, Runge & Fearnhead 2022, "Detecting
 * abrupt changes in the presence of local fluctuations and autocorrelated noise",
 * JASA 117:2147-2162, section 4: robust estimates from the variances of k-lag
 * differences), applied here to AR(1) noise only.
 *
 * The penalty factor is the long-run variance ratio (1 + phi) / (1 - phi) of AR(1)
 * noise: the change-in-mean statistic of independent noise holds for correlated noise
 * once its variance is replaced by the long-run variance (Lavielle & Moulines 2000,
 * "Least-squares estimation of an unknown number of shifts in a time series", J. Time
 * Series Analysis 21:33-59), which multiplies the cost's scale, equivalently the penalty,
 * by that ratio. Negative estimates are treated as 0 (the penalty is never lowered).
 * Unchecked.
 *
 * @param y - values in x order (roughly equal spacing assumed)
 * @example
 * ```ts
 * noiseCorrelation(ar1Series).phi; // about 0.5 for phi = 0.5 noise
 * ```
 */
export function noiseCorrelation(y: ArrayLike<number>): NoiseCorrelation {
  const v1 = lagDifferenceMad(y, 1), v2 = lagDifferenceMad(y, 2);
  const raw = v1 > 0 ? (v2 / v1) ** 2 - 1 : NaN;
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
  return warning('note', `the noise looks autocorrelated (lag-one correlation about ${noise.correlation.toFixed(2)}, estimated from lag-1 and lag-2 differences); ${scaled}, so slow swings of the noise are not read as breaks. Set noise 'independent' to assume independent noise.`);
}

