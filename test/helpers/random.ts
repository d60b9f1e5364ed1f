/**
 * Small seeded pseudo-random generators for tests, demos and benchmarks.
 *
 * uniform: mulberry32 (Tommy Ettinger's 32-bit generator, public domain; a common
 * choice for reproducible test data, not for cryptography). normal: Box-Muller on
 * two uniforms. poisson: Knuth's multiplication method (fine for rates up to ~30).
 */

import { mulberry32 } from '../../src/demo/weeklyOrders';

/** A seeded stream of uniforms on [0, 1): the same generator the demo data use. */
export { mulberry32 };

/** A seeded stream of standard normal deviates (Box-Muller). */
export function normalStream(seed: number): () => number {
  const u = mulberry32(seed);
  let spare: number | null = null;
  return () => {
    if (spare !== null) { const s = spare; spare = null; return s; }
    let a = u();
    while (a <= 0) a = u();
    const b = u();
    const r = Math.sqrt(-2 * Math.log(a));
    spare = r * Math.sin(2 * Math.PI * b);
    return r * Math.cos(2 * Math.PI * b);
  };
}

/** A seeded Poisson sampler: call with the rate. */
export function poissonStream(seed: number): (rate: number) => number {
  const u = mulberry32(seed);
  return (rate: number) => {
    const L = Math.exp(-rate);
    let k = 0;
    let p = 1;
    do { k++; p *= u(); } while (p > L);
    return k - 1;
  };
}

/**
 * n values of stationary-scale AR(1) noise e_i = phi e_{i-1} + sqrt(1 - phi^2) z_i from e_0 = 0
 * (unit marginal variance once the start has worn off), z from {@link normalStream}(seed).
 */
export function ar1Noise(n: number, phi: number, seed: number): number[] {
  const z = normalStream(seed);
  let e = 0;
  return Array.from({ length: n }, () => (e = phi * e + Math.sqrt(1 - phi * phi) * z()));
}
