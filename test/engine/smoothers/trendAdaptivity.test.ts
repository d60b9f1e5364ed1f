/**
 * Local adaptivity: on the Doppler and Blocks functions of Donoho and Johnstone
 * (Biometrika 1994; formulas in trendTestFunctions.ts) with seeded noise at
 * signal-to-noise ratio 7 (their setting), trend filtering at a given df should
 * track the truth better than the smoothing spline at the same df, the point of
 * Tibshirani (Ann. Statist. 2014, section 5): its knots go where the function
 * changes fast. The spline is the engine's 'spline' method (trace df); trend
 * filtering's df is knots + k + 1.
 */
import { fitTrend } from '../../../src/engine/smoothers/trend';
import { fitSpline } from '../../../src/engine/smoothers/spline';
import { seriesFromArrays } from '../../../src/engine/series';
import { doppler, blocks, noisyTestFunction } from './trendTestFunctions';

function noisy(f: (t: number) => number, n: number, seed: number) {
  const { x, y, truth } = noisyTestFunction(f, n, seed);
  return { series: seriesFromArrays(x, y), truth };
}

const mse = (fit: Float64Array, truth: Float64Array) => fit.reduce((s, v, i) => s + (v - truth[i]) ** 2, 0) / truth.length;

describe('trend filtering versus the smoothing spline at matched df', () => {
  const spline = { fit: fitSpline };

  test('Doppler: cubic trend filtering has the lower error at most df from 20 to 100', () => {
    const { series, truth } = noisy(doppler, 512, 11);
    const dfs = [20, 35, 50, 65, 80, 100];
    let wins = 0;
    for (const df of dfs) {
      const tf = fitTrend(series, { order: 3, df });
      const sp = spline.fit(series, { df });
      expect(Math.abs(tf.df - df)).toBeLessThanOrEqual(2);
      const a = mse(tf.fitted, truth), b = mse(sp.fitted, truth);
      if (a < b) wins++;
    }
    expect(wins).toBeGreaterThanOrEqual(5);
  });

  test('Blocks: piecewise-constant trend filtering has the lower error at every df from 15 to 120', () => {
    const { series, truth } = noisy(blocks, 512, 12);
    for (const df of [15, 30, 60, 90, 120]) {
      const tf = fitTrend(series, { order: 0, df });
      const sp = spline.fit(series, { df });
      expect(tf.df).toBe(df);
      expect(mse(tf.fitted, truth)).toBeLessThan(mse(sp.fitted, truth));
    }
  });
});
