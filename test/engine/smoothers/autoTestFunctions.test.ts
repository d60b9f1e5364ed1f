/**
 * The automatic choice on the published test functions of Donoho & Johnstone
 * (1994, Biometrika 81:425-455), Blocks and Doppler at signal-to-noise ratio 7
 * on 256 equally spaced points (seeded noise): the pick's held-out error is
 * within one standard error of the best candidate's, wavelet shrinkage takes
 * part (equal spacing), and on Blocks, a step function, a method that keeps
 * jumps (level shifts or wavelets) predicts held-out points better than the
 * smooth curve does.
 */
import { runAnalysis } from '../../../src/engine';
import { blocks, doppler, noisyTestFunction } from './trendTestFunctions';

/** Mean squared error of the automatic choice against the truth, in units of the noise variance (seeded, 256 points). */
function pickError(f: (t: number) => number, seed: number, options: Record<string, unknown> = {}): { error: number; heldOutBlocks: boolean } {
  const d = noisyTestFunction(f, 256, seed);
  const r = runAnalysis({ analysis: 'auto', x: Array.from(d.x), y: Array.from(d.y), options });
  const error = r.fitted.reduce((a, v, i) => a + (v - d.truth[i]) ** 2, 0) / d.truth.length / d.sigma ** 2;
  return { error, heldOutBlocks: r.warnings.some((w) => w.message.includes('held out blocks')) };
}

describe('auto on the Donoho-Johnstone test functions', () => {
  test.each([['Blocks', blocks], ['Doppler', doppler]] as const)('%s: the pick is within one standard error of the best candidate', (_name, f) => {
    const d = noisyTestFunction(f, 256, 21);
    const r = runAnalysis({ analysis: 'auto', x: Array.from(d.x), y: Array.from(d.y) });
    const c = r.comparison!;
    const best = c.rows[c.best], chosen = c.rows[c.chosen];
    expect(best.cv).toBe(Math.min(...c.rows.filter((q) => !q.skipped).map((q) => q.cv)));
    expect(chosen.cv).toBeLessThanOrEqual(best.cv + best.se);
    expect(c.rows.find((q) => q.method === 'wavelet')!.skipped).toBeFalsy();
  });

  test('Blocks: level shifts or wavelets predict held-out points better than the spline', () => {
    const d = noisyTestFunction(blocks, 256, 22);
    const r = runAnalysis({ analysis: 'auto', x: Array.from(d.x), y: Array.from(d.y), options: { rule: 'cv' } });
    const rows = r.comparison!.rows;
    const spline = rows.find((q) => q.method === 'spline')!;
    const jumpy = rows.filter((q) => (q.method === 'trend' && q.options.order === 0) || q.method === 'wavelet');
    expect(Math.min(...jumpy.map((q) => q.cv))).toBeLessThan(spline.cv);
  });
});

describe('auto on the Donoho-Johnstone test functions: error against the truth', () => {
  // With independent noise, the variogram of the series alone reads Doppler's fast oscillation near t = 0 and
  // Blocks' jumps as correlated noise (lag-one 0.36 to 0.95); cross-validation then held out blocks of 9 to 24
  // points and every candidate over-smoothed (Doppler seeds 21 and 24 got a constant, 49 times the noise
  // variance; Blocks 3 to 40 times). The estimate now also reads the residuals of two translation-invariant
  // wavelet pilots (select/noiseDependence.ts, dependencePhi): 0.00 to 0.13 on both functions, ordinary folds,
  // and the pick is within 1.3 to 1.8 times the noise variance on Doppler, 2.2 to 3.3 on Blocks (measured).
  test.each([['Doppler', doppler], ['Blocks', blocks]] as const)('%s, SNR 7, 256 points: the pick is within 10 times the noise variance of the truth on seeds 21-24', (_name, f) => {
    for (const seed of [21, 22, 23, 24]) expect(pickError(f, seed).error).toBeLessThan(10);
  });
});

describe('auto on Doppler with the noise setting', () => {
  // The same seeds with noise set to independent, as the autocorrelation warning advises when blocks were held
  // out: ordinary folds, and the pick is within 2.5 times the noise variance of the truth (measured 1.3 to 1.8;
  // the default run now reads ordinary folds too, before the wavelet pilots of dependencePhi it gave 10 to 49).
  test('Doppler, SNR 7, 256 points: with noise independent the pick is within 2.5 times the noise variance of the truth on seeds 21-24', () => {
    for (const seed of [21, 22, 23, 24]) {
      const p = pickError(doppler, seed, { noise: 'independent' });
      expect(p.error).toBeLessThan(2.5);
      expect(p.heldOutBlocks).toBe(false);
    }
  });
});

