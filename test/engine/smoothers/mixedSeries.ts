/**
 * An invented, seeded series that is kinked in its first half and smooth in its second:
 * straight pieces with slope changes at t = 0.12, 0.25 and 0.38, then from t = 0.5 two smooth
 * humps (1 - cos) of width 0.25 riding on the last straight piece, with Gaussian noise
 * (seeded Park-Miller generator with Box-Muller, {@link seededNormal}). x are uneven:
 * spacings 0.5 to 1.5 (seeded), so the divided differences of uneven x are exercised.
 */
import { seededNormal } from './trendTestFunctions';

/** The truth on t in [0, 1]; `kink` scales the slope changes (default 1). */
export function kinkedThenSmooth(t: number, kink = 1): number {
  const relu = (v: number) => (v > 0 ? v : 0);
  const line = kink * (4 * t - 10 * relu(t - 0.12) + 12 * relu(t - 0.25) - 8 * relu(t - 0.38));
  const hump = t > 0.5 ? 0.8 * (1 - Math.cos((2 * Math.PI * (t - 0.5)) / 0.25)) : 0;
  return line + hump;
}

/** n points, noise sd `sigma` (default 0.15), seeded. */
export function kinkedThenSmoothSeries(n: number, seed: number, sigma = 0.15, kink = 1): { x: Float64Array; y: Float64Array; truth: Float64Array } {
  const rnorm = seededNormal(seed);
  const x = new Float64Array(n), y = new Float64Array(n), truth = new Float64Array(n);
  let c = 0;
  for (let i = 0; i < n; i++) { x[i] = c; c += 0.5 + ((i * 7919 + seed * 104729) % 1000) / 1000; }
  for (let i = 0; i < n; i++) {
    truth[i] = kinkedThenSmooth((x[i] - x[0]) / (x[n - 1] - x[0]), kink);
    y[i] = truth[i] + sigma * rnorm();
  }
  return { x, y, truth };
}
