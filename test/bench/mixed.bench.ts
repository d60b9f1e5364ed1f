/**
 * Benchmark of the mixed-smoothness trend (straight pieces with kinks plus smooth bends):
 *
 * - MSE against the truth versus df on the invented kinked-then-smooth series
 *   (test/engine/smoothers/mixedSeries.ts: seeded, uneven x, noise sd 0.15): the mixed trend
 *   (width chosen by cross-validation, then df targets at that width) beside trend filtering of
 *   orders 0 to 3 and the smoothing spline at the same df targets;
 * - the acceptance series (mixedAdaptivity.test.ts: noise sd 0.1, slope changes tripled, 200 points)
 *   for seeds 1 to 7: the cross-validated mixed fit's width, df and MSE beside the lowest MSE of trend
 *   filtering (orders 0 to 3) and the spline at that df, and whether it is lower;
 * - time of a fixed-penalty fit and of the full cross-validated choice (widths 4, 8, 16 and 32
 *   spacings, those up to n / 4, x 10 penalties x 5 folds), medians of repeats. The machine is shared (2 cores, other jobs): timings are noisy,
 *   hence medians.
 * `quick` uses n = 200 only.
 */
import { fitMixed, MixedModel } from '../../src/engine/smoothers/mixed/mixedAnalysis';
import { fitTrend } from '../../src/engine/smoothers/trend';
import { fitSpline } from '../../src/engine/smoothers/spline';
import { seriesFromArrays } from '../../src/engine/series';
import { kinkedThenSmoothSeries } from '../engine/smoothers/mixedSeries';

function now(): number {
  return typeof performance !== 'undefined' ? performance.now() : Date.now();
}

function median(v: number[]): number {
  const s = v.slice().sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : 0.5 * (s[s.length / 2 - 1] + s[s.length / 2]);
}

export function run(emit: (r: Record<string, unknown>) => void, quick: boolean): void {
  for (const seed of quick ? [5] : [1, 2, 3, 4, 5, 6, 7]) {
    const { x, y, truth } = kinkedThenSmoothSeries(200, seed, 0.1, 3);
    const s = seriesFromArrays(x, y);
    const h = (x[199] - x[0]) / 199;
    const mse = (f: Float64Array) => { let e = 0; for (let i = 0; i < 200; i++) e += (f[i] - truth[i]) ** 2; return e / 200; };
    const cv = fitMixed(s, {});
    const row: Record<string, unknown> = { bench: 'mixed-acceptance', n: 200, seed, widthInSpacings: (cv.model as MixedModel).width / h, df: cv.df, mixedMse: Number(mse(cv.fitted).toExponential(3)) };
    let best = Infinity, bestName = '';
    for (const k of [0, 1, 2, 3]) { const e = mse(fitTrend(s, { order: k, df: cv.df }).fitted); row[`trendK${k}Mse`] = Number(e.toExponential(3)); if (e < best) { best = e; bestName = `trend order ${k}`; } }
    const sp = mse(fitSpline(s, { df: cv.df }).fitted);
    row.splineMse = Number(sp.toExponential(3));
    if (sp < best) { best = sp; bestName = 'spline'; }
    row.bestOther = bestName;
    row.mixedLower = mse(cv.fitted) < best;
    emit(row);
  }
  for (const n of quick ? [200] : [200, 500]) {
    const { x, y, truth } = kinkedThenSmoothSeries(n, 5);
    const s = seriesFromArrays(x, y);
    const h = (x[n - 1] - x[0]) / (n - 1);
    const mse = (f: Float64Array) => { let e = 0; for (let i = 0; i < n; i++) e += (f[i] - truth[i]) ** 2; return e / n; };
    const cvTimes: number[] = [];
    let cv = fitMixed(s, {});
    for (let rep = 0; rep < (quick ? 1 : 3); rep++) {
      const t0 = now();
      cv = fitMixed(s, {});
      cvTimes.push((now() - t0) / 1000);
    }
    const width = (cv.model as MixedModel).width;
    emit({ bench: 'mixed-cv', n, seconds: median(cvTimes), repeats: cvTimes.length, df: cv.df, mse: mse(cv.fitted), widthInSpacings: width / h, converged: cv.solver.converged, widths: (cv.model as MixedModel).widths });
    const fixedTimes: number[] = [];
    for (let rep = 0; rep < 3; rep++) {
      const t0 = now();
      fitMixed(s, { penalty: cv.penalty, width });
      fixedTimes.push((now() - t0) / 1000);
    }
    emit({ bench: 'mixed-fixed-penalty', n, seconds: median(fixedTimes), repeats: 3 });
    for (const df of [12, 16, 20, 25, 30]) {
      const row: Record<string, unknown> = { bench: 'mixed-mse-vs-df', n, targetDf: df, widthInSpacings: width / h };
      const m = fitMixed(s, { df, width });
      row.mixedDf = m.df;
      row.mixedMse = mse(m.fitted);
      for (const k of [0, 1, 2, 3]) {
        const t = fitTrend(s, { order: k, df });
        row[`trendK${k}Df`] = t.df;
        row[`trendK${k}Mse`] = mse(t.fitted);
      }
      const sp = fitSpline(s, { df });
      row.splineDf = sp.df;
      row.splineMse = mse(sp.fitted);
      emit(row);
    }
  }
}
