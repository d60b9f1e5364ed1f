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
