/**
 * The level-by-level wavelet pilot (Johnstone & Silverman 1997, JRSS B 59:319-351: under
 * correlated noise each level needs its own noise scale). Seeded AR(1) noise of our own, 1,024
 * points, no signal: what share of the noise's energy each pilot keeps as if it were signal.
 * Measured (seeds 1-3): independent noise, at most 0.025 with either scale; phi 0.5 and 0.7, the
 * symmlet pilot keeps 0.04 to 0.15 level by level, 0.27 to 0.68 with one scale from the finest
 * level (as waveletShrink does), the Haar pilot level by level 0.00 to 0.07.
 */
import { levelwiseHardShrink } from '../../../src/engine/smoothers/wavelet/levelwiseHardShrink';
import { waveletShrink } from '../../../src/engine/smoothers/wavelet/waveletShrink';
import { ar1Noise } from '../../helpers/random';

const ar1 = (n: number, phi: number, seed: number): Float64Array => Float64Array.from(ar1Noise(n, phi, seed));

const energy = (v: ArrayLike<number>): number => Array.from(v).reduce((a, b) => a + b * b, 0);

describe('levelwiseHardShrink', () => {
  test('levelwiseHardShrink keeps under 5% of independent noise, as one scale does', () => {
    for (const seed of [1, 2, 3]) {
      const e = ar1(1024, 0, seed);
      for (const filter of ['sym8', 'db1'] as const) {
        expect(energy(levelwiseHardShrink(e, filter)) / energy(e)).toBeLessThan(0.05);
      }
    }
  });

  test.each([0.5, 0.7])('levelwiseHardShrink keeps under 20%% of AR(1) noise with phi %s, where one scale from the finest level keeps over 25%%', (phi) => {
    for (const seed of [1, 2, 3]) {
      const e = ar1(1024, phi, seed);
      expect(energy(levelwiseHardShrink(e, 'sym8')) / energy(e)).toBeLessThan(0.2);
      expect(energy(levelwiseHardShrink(e, 'db1')) / energy(e)).toBeLessThan(0.2);
      expect(energy(waveletShrink(e, { filter: 'sym8', shrink: 'hard' }).fitted) / energy(e)).toBeGreaterThan(0.25);
    }
  });

  test.each([1, 8])('levelwiseHardShrink with %s start(s) returns one value per input row, the Haar pilot reproducing a noiseless step series', (starts) => {
    // Haar details vanish away from a step and the medians of the levels are 0, so nothing is thresholded away,
    // whichever row the transform starts at
    const y = Float64Array.from({ length: 100 }, (_, i) => (i < 37 ? 1 : i < 70 ? -2 : 0.5));
    const p = levelwiseHardShrink(y, 'db1', starts);
    expect(p.length).toBe(100);
    for (let i = 0; i < 100; i++) expect(p[i]).toBeCloseTo(y[i], 12);
  });

  test('levelwiseHardShrink with 8 starts is the mean, row by row, of the fits started at rows 0 to 7', () => {
    const e = ar1(300, 0.4, 4).map((v, i) => v + (i > 120 ? 3 : 0));
    const p = levelwiseHardShrink(e, 'sym8', 8);
    const fits = Array.from({ length: 8 }, (_, s) => levelwiseHardShrink(e.slice(s), 'sym8'));
    for (const i of [0, 3, 7, 8, 150, 299]) {
      const covering = fits.filter((_, s) => s <= i).map((f, s) => f[i - s]);
      expect(p[i]).toBeCloseTo(covering.reduce((a, b) => a + b, 0) / covering.length, 12);
    }
  });
});
