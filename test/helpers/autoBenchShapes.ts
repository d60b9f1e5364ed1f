/**
 * The two invented shapes of the automatic choice's bench (test/bench/smoothers.bench.ts), on
 * u in [0, 1], also used by the trend bench and the tests that need a series of that kind:
 * - kinks-and-wave: a line with two kinks (u = 0.2, 0.45) and a wave in its last stretch (from 0.6),
 *   with noise sd 0.3 in the bench;
 * - shifts-and-wave: a slow wave with two level shifts (u = 0.3, 0.7), noise sd 0.4 in the bench.
 */
export function kinksAndWave(u: number): number {
  return 4 * u - 10 * Math.max(0, u - 0.2) + 8 * Math.max(0, u - 0.45) + 0.5 * Math.sin(12 * Math.PI * u) * (u > 0.6 ? 1 : 0);
}

export function shiftsAndWave(u: number): number {
  return Math.sin(4 * Math.PI * u) + (u > 0.3 ? 1 : 0) - (u > 0.7 ? 1.5 : 0);
}

/** Noise sd of each shape in the benches. */
export const SHAPE_NOISE = { 'kinks-and-wave': 0.3, 'shifts-and-wave': 0.4 } as const;
