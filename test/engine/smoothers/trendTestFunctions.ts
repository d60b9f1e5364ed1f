/**
 * Published test functions for spatially adaptive smoothing, from
 * D. L. Donoho and I. M. Johnstone, "Ideal spatial adaptation by wavelet
 * shrinkage", Biometrika 81 (1994) 425-455, on t in [0, 1], plus a seeded
 * normal generator for noise.
 */

/** Doppler: sqrt(t (1 - t)) sin(2 pi (1 + eps) / (t + eps)), eps = 0.05. */
export function doppler(t: number): number {
  const eps = 0.05;
  return Math.sqrt(t * (1 - t)) * Math.sin((2 * Math.PI * (1 + eps)) / (t + eps));
}

const BLOCK_T = [0.1, 0.13, 0.15, 0.23, 0.25, 0.4, 0.44, 0.65, 0.76, 0.78, 0.81];
const BLOCK_H = [4, -5, 3, -4, 5, -4.2, 2.1, 4.3, -3.1, 2.1, -4.2];

/** Blocks: sum_j h_j K(t - t_j), K(u) = (1 + sign u) / 2, with the published jump times and heights. */
export function blocks(t: number): number {
  let s = 0;
  for (let j = 0; j < BLOCK_T.length; j++) s += BLOCK_H[j] * (t - BLOCK_T[j] > 0 ? 1 : t - BLOCK_T[j] < 0 ? 0 : 0.5);
  return s;
}

/** Standard normal deviates from a seeded Park-Miller (minimal standard) generator with Box-Muller. */
export function seededNormal(seed: number): () => number {
  let s = (Math.floor(Math.abs(seed)) % 2147483646) + 1;
  const unif = () => { s = (s * 48271) % 2147483647; return s / 2147483647; };
  let spare: number | null = null;
  return () => {
    if (spare !== null) { const v = spare; spare = null; return v; }
    const u = unif(), v = unif();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}

/**
 * A test function sampled at n equispaced points on [0, 1] with seeded Gaussian
 * noise at signal-to-noise ratio 7 (sd of the function / sigma = 7), the setting
 * of Donoho and Johnstone (1994).
 */
export function noisyTestFunction(f: (t: number) => number, n: number, seed: number): { x: Float64Array; y: Float64Array; truth: Float64Array; sigma: number } {
  const rnorm = seededNormal(seed);
  const x = new Float64Array(n), truth = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) { x[i] = i / (n - 1); truth[i] = f(x[i]); }
  let m = 0, v = 0;
  for (let i = 0; i < n; i++) m += truth[i] / n;
  for (let i = 0; i < n; i++) v += (truth[i] - m) ** 2 / n;
  const sigma = Math.sqrt(v) / 7;
  for (let i = 0; i < n; i++) y[i] = truth[i] + sigma * rnorm();
  return { x, y, truth, sigma };
}
