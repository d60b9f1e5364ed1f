/**
 * The acceptance check of the mixed trend: on the invented, seeded kinked-then-smooth series
 * (mixedSeries.ts: three kinks, then two smooth humps; uneven x; 200 points, noise sd 0.1, slope
 * changes tripled), the cross-validated mixed fit should have a lower mean squared error against
 * the truth than every single-order trend filter (orders 0 to 3) and the smoothing spline at the
 * same df (trend filtering meets a df in whole steps, the spline exactly).
 *
 * What "the same df" means: the mixed fit's df is kinks + bend knots + 4; the third test checks on
 * the cross-validated fits that this is the dimension of the sum of the two spline spaces, the df of
 * the generalised lasso (Tibshirani & Taylor, Ann. Statist. 40 (2012), from memory), computed here
 * as a matrix rank, so the comparison is at the lasso's own df and no method is favoured by the count.
 *
 * Why the claim held only at a low df before, found on seeds 1 to 7:
 * - the width (the ratio lambda3 / lambda1) was chosen among 4, 12 and 36 spacings of x. On this
 *   series widths up to 12 spacings give the pure order-3 fit (no kinks) and 36 draws the humps as
 *   runs of kinks; the mixtures with the lowest error come at 16 to 32 spacings. The grid now
 *   doubles: 4, 8, 16, 32 ({@link mixedWidths});
 * - the returned fit's exact block steps stopped at 100, and true mixtures need up to 869: five of
 *   the seven cross-validated fits stopped short (kinks still moving by up to 4e-3 sd of y), with a
 *   df a few knots off the exact fit's (seed 5: 26 instead of 23). The limit is now 1000
 *   ({@link MIXED_MAX_CYCLES}).
 * Measured, cross-validated fit against the best other fit at its df: with the old widths and 100
 * steps 2 seeds of 7 won; with the doubling grid and 100 steps 6 of 7 (seed 5 lost: 2.05e-3 at 26 df
 * against the spline's 1.90e-3); with both changes 7 of 7 (seed 5: 2.06e-3 at 23 df against the
 * spline's 2.11e-3; seed 4 by less than 0.1%). The series was not changed to make the claim pass.
 *
 * With exact fold fits the margin narrowed. The path points and fold fits were the ADMM's, stopped at
 * 3,000 steps: 8 to 10 of the 10 points of every chosen curve were not converged. They are now the dual
 * interior point's (mixedDualInteriorPoint.ts, fold fits at a relative gap of 1e-5, path points 1e-7),
 * and 4 to 5 points are flagged (the largest penalties, where the interior point stalls). The scores
 * fell (held-out error lower on 6 of 7 seeds) and the default rule ('cv', the lowest score) now picks
 * the widest width, 32 spacings, on 5 seeds, at 29 to 36 df. There order 1 comes closer: the mixed fit
 * won on 5 of 7 (seed 4 lost by 1.2%, seed 5 by 12%: 1.96e-3 at 33 df against order 1's 1.74e-3,
 * though its own error fell from 2.06e-3). A path whose fits are still simple at 1e-4 of its top now
 * goes on until they have n / 5 df (MIXED_PATH_DF_SHARE; without it the mixed trend was a cubic-like
 * fit from about 500 points). On seed 1 the longer path at 16 spacings scored lower: 29 df, 1.69e-3
 * (2.04e-3 before), against order 1's 1.47e-3; on seed 3 it moved to 35 df at 16 spacings and still
 * wins (1.84e-3, 2.09e-3 before). So 4 of 7 win with that rule, each of the moved fits closer to the truth. With the one-standard-error rule ('cv-simpler', the rule the automatic choice applies across
 * methods) the fits stay at 15 to 23 df and win on 6 of 7, seed 5 included (2.06e-3 at 23 df against
 * the spline's 2.11e-3); seed 7 loses to order 3 at 15 df. Both are checked below; the former 7 of 7
 * rested on fold fits that had not converged.
 *
 * What still does not hold (the expected failure at the end): the claim over a range of df at the
 * chosen width. At 3 times the cross-validated penalty (17 df) order 3 is better (2.84e-3 against
 * 2.91e-3), at a third of it (32 df) order 1 is (1.68e-3 against 1.77e-3): the best width changes
 * with the df, and cross-validation on 200 points cannot tell the widths apart (their best scores lie
 * within half a standard error of each other), so it is chosen once, for the cross-validated df.
 */
import { fitMixed, MixedModel, mixedWidths, MIXED_MAX_CYCLES } from '../../../src/engine/smoothers/mixed/mixedAnalysis';
import { fitTrend } from '../../../src/engine/smoothers/trend';
import { fitSpline } from '../../../src/engine/smoothers/spline';
import { seriesFromArrays } from '../../../src/engine/series';
import { differenceOperator } from '../../../src/engine/linalg/difference';
import { kinkedThenSmoothSeries } from './mixedSeries';

const mseOf = (truth: Float64Array) => (f: Float64Array) => f.reduce((a, v, i) => a + (v - truth[i]) ** 2, 0) / truth.length;

/** The lowest MSE of the single-order trend filters and the spline at a df. */
function bestOther(s: ReturnType<typeof seriesFromArrays>, df: number, mse: (f: Float64Array) => number): number {
  let best = mse(fitSpline(s, { df }).fitted);
  for (const k of [0, 1, 2, 3]) best = Math.min(best, mse(fitTrend(s, { order: k, df }).fitted));
  return best;
}

test('at a low df (12) the mixed fit beats every single-order trend filter and the spline', () => {
  // measured by the bench (default series: noise sd 0.15, n = 200, width 12 spacings): MSE 4.1e-3 against
  // order 3's 9.4e-3, the spline's 1.2e-2, order 2's 1.3e-2, order 1's 2.1e-2
  const { x, y, truth } = kinkedThenSmoothSeries(200, 5);
  const s = seriesFromArrays(x, y);
  const h = (x[x.length - 1] - x[0]) / (x.length - 1);
  const mse = mseOf(truth);
  const m = fitMixed(s, { df: 12, width: 12 * h });
  expect(m.df).toBe(12);
  const e = mse(m.fitted);
  for (const k of [0, 1, 2, 3]) expect(e).toBeLessThan(mse(fitTrend(s, { order: k, df: 12 }).fitted));
  expect(e).toBeLessThan(mse(fitSpline(s, { df: 12 }).fitted));
}, 600000);

test('the width grid doubles from 4 spacings up to 32 or a quarter of the points', () => {
  expect(mixedWidths(200)).toEqual([4, 8, 16, 32]);
  expect(mixedWidths(1000)).toEqual([4, 8, 16, 32]);
  expect(mixedWidths(100)).toEqual([4, 8, 16]);
  expect(mixedWidths(20)).toEqual([4]);
  expect(mixedWidths(6)).toEqual([4]);
});

/** Rank of a dense matrix (rows of equal length) by Gaussian elimination with complete pivoting. */
function rank(rows: Float64Array[], relTol = 1e-10): number {
  const a = rows.map((r) => Float64Array.from(r));
  const m = a.length, n = a[0].length;
  let scale = 0;
  for (const r of a) for (const v of r) scale = Math.max(scale, Math.abs(v));
  let rk = 0;
  const colUsed = new Uint8Array(n);
  const rowUsed = new Uint8Array(m);
  for (;;) {
    let bi = -1, bj = -1, bv = 0;
    for (let i = 0; i < m; i++) if (!rowUsed[i]) for (let j = 0; j < n; j++) if (!colUsed[j] && Math.abs(a[i][j]) > bv) { bv = Math.abs(a[i][j]); bi = i; bj = j; }
    if (bi < 0 || bv <= relTol * scale) return rk;
    rowUsed[bi] = 1; colUsed[bj] = 1; rk++;
    for (let i = 0; i < m; i++) {
      if (rowUsed[i] || a[i][bj] === 0) continue;
      const f = a[i][bj] / a[bi][bj];
      for (let j = 0; j < n; j++) a[i][j] -= f * a[bi][j];
    }
  }
}

test('the df of the cross-validated mixed fits is the dimension of the sum of their two spline spaces', () => {
  // S1: piecewise linear with kinks at the kink rows; S3: null space of the rows of D(x, 4) that are not
  // bend knots. dim(S1 + S3) = dim S1 + dim S3 - dim(S1 n S3), and S1 n S3 is the null space of the
  // stacked rows of D(x, 2) off the kinks and D(x, 4) off the bend knots.
  for (const seed of [5, 2]) {
    const { x, y } = kinkedThenSmoothSeries(200, seed, 0.1, 3);
    const n = x.length;
    const fit = fitMixed(seriesFromArrays(x, y), {});
    const m = fit.model as MixedModel;
    const kinkRows = new Set(fit.knots.map((k) => k.index - 1));
    const bendRows = new Set(m.bendRows);
    const cols = (q: number) => Array.from({ length: n }, (_, j) => { const e = new Float64Array(n); e[j] = 1; return Float64Array.from(differenceOperator(x, q, e)); });
    const transpose = (c: Float64Array[], rowsOut: number) => Array.from({ length: rowsOut }, (_, r) => Float64Array.from(c, (col) => col[r]));
    const d2 = transpose(cols(2), n - 2), d4 = transpose(cols(4), n - 4);
    const stacked = [...d2.filter((_, r) => !kinkRows.has(r)), ...d4.filter((_, r) => !bendRows.has(r))];
    const intersection = n - rank(stacked);
    const dimSum = (kinkRows.size + 2) + (bendRows.size + 4) - intersection;
    expect(kinkRows.size).toBeGreaterThan(0); // a true mixture: both parts have knots
    expect(bendRows.size).toBeGreaterThan(0);
    expect(fit.df).toBe(dimSum);
  }
}, 600000);

describe('the cross-validated fit against every single-order fit at its df, seeds 1 to 7', () => {
  // The noise of these series is independent by construction, and cross-validation is told so: the claim is
  // about the mixed fit at the df cross-validation gives it, not about reading the noise's dependence (tested in
  // test/engine/select/noiseDependence.test.ts). Read from the data, seed 6 reads 0.19 (its noise alone reads
  // 0.13 by chance; the pilots leave a little of the kinks), blocks of 6 points are held out, cross-validation
  // picks 48 df and the spline is 3.7% better there; with ordinary folds it picks 23 df and the mixed fit wins
  // (1.82e-3 against 2.16e-3). The other six seeds get ordinary folds either way.
  const results: { seed: number; rule: 'cv' | 'cv-simpler'; df: number; mixed: number; other: number; converged: boolean; warned: boolean }[] = [];
  beforeAll(() => {
    for (const seed of [1, 2, 3, 4, 5, 6, 7]) {
      const { x, y, truth } = kinkedThenSmoothSeries(200, seed, 0.1, 3);
      const s = seriesFromArrays(x, y);
      const mse = mseOf(truth);
      for (const rule of ['cv', 'cv-simpler'] as const) {
        const cv = fitMixed(s, { noise: 'independent', rule });
        results.push({ seed, rule, df: cv.df, mixed: mse(cv.fitted), other: bestOther(s, cv.df, mse), converged: cv.solver.converged, warned: cv.warnings.some((w) => w.code === 'not-converged') });
      }
    }
  }, 600000);

  // seed 1's cross-validated fit (df 46, many knots) stopped at 1000 block steps short of the tolerance
  // until the active-set rounds let a knot slide to the row beside it in one round; from the interior
  // point's answer every fit here reaches it in 2 block steps
  test('every fit reaches the tolerance within the default limit of block steps', () => {
    expect(MIXED_MAX_CYCLES).toBe(1000);
    for (const r of results) expect(r.converged).toBe(true);
  });

  test('a fit that stops short of the tolerance says so, and most reach it', () => {
    for (const r of results) if (!r.converged) expect(r.warned).toBe(true);
    expect(results.filter((r) => r.converged).length).toBeGreaterThanOrEqual(12);
  });

  test('with the one-standard-error rule, seed 5 (the series of the claim): the mixed fit has the lowest error at its df', () => {
    // measured: 23 df, 2.06e-3 against the spline's 2.11e-3
    const r = results.find((q) => q.seed === 5 && q.rule === 'cv-simpler')!;
    expect(r.mixed).toBeLessThan(r.other);
  });

  test('with the one-standard-error rule the mixed fit has the lowest error at its df on at least 6 of the 7 seeds', () => {
    // measured: 6 of 7; seed 7 loses to order 3 at 15 df (3.78e-3 against 3.43e-3)
    expect(results.filter((r) => r.rule === 'cv-simpler' && r.mixed < r.other).length).toBeGreaterThanOrEqual(6);
  });

  test('with the lowest score (the default rule) the mixed fit has the lowest error at its df on at least 4 of the 7 seeds', () => {
    // measured: 4 of 7; seeds 1, 4 and 5 lose to order 1 at 29, 31 and 33 df (by 15%, 1.2% and 12%)
    expect(results.filter((r) => r.rule === 'cv' && r.mixed < r.other).length).toBeGreaterThanOrEqual(4);
  });
});

describe('on 500 points, where a path to 1e-4 of its top stopped short of kinks', () => {
  // The same kinked-then-smooth series at 500 points (seeds 1 to 3, noise known to be independent). The path's top
  // grows like n^4 and the penalties at which kinks appear like n^2, so before paths went on past 1e-4 of their top the
  // cross-validated mixed trend had no kinks here: 16, 4 and 17 df with errors of 2.2e-3, 0.35 (the cubic) and 2.3e-3,
  // several times those of every cross-validated single-order fit but order 0. Measured now: 15 to 17 kinks at 35 to
  // 49 df, errors 5.9e-4, 8.5e-4 and 6.6e-4 against the best other fit's 7.1e-4 (order 2), 5.9e-4 (order 1) and
  // 6.8e-4 (order 2).
  const rows: { kinks: number; mixed: number; best: number }[] = [];
  beforeAll(() => {
    for (const seed of [1, 2, 3]) {
      const { x, y, truth } = kinkedThenSmoothSeries(500, seed, 0.1, 3);
      const s = seriesFromArrays(x, y);
      const mse = mseOf(truth);
      const m = fitMixed(s, { noise: 'independent' });
      let best = mse(fitSpline(s, { select: 'cv', noise: 'independent' }).fitted);
      for (const k of [0, 1, 2, 3]) best = Math.min(best, mse(fitTrend(s, { order: k, noise: 'independent' }).fitted));
      rows.push({ kinks: m.knots.length, mixed: mse(m.fitted), best });
    }
  }, 600000);

  test('every cross-validated fit has kinks', () => {
    for (const r of rows) expect(r.kinks).toBeGreaterThanOrEqual(10);
  });

  test('its error is within 1.5 times that of the best cross-validated single-order fit or spline, and the lowest on 2 of 3', () => {
    for (const r of rows) expect(r.mixed).toBeLessThan(1.5 * r.best);
    expect(rows.filter((r) => r.mixed < r.best).length).toBeGreaterThanOrEqual(2);
  });
});

test.failing('over a range of df at the chosen width (3 times and a third of the cross-validated penalty) mixed beats every single-order fit', () => {
  const { x, y, truth } = kinkedThenSmoothSeries(200, 5, 0.1, 3);
  const s = seriesFromArrays(x, y);
  const mse = mseOf(truth);
  const cv = fitMixed(s, {});
  const width = (cv.model as MixedModel).width;
  for (const m of [fitMixed(s, { penalty: cv.penalty * 3, width }), fitMixed(s, { penalty: cv.penalty / 3, width })]) {
    expect(mse(m.fitted)).toBeLessThan(bestOther(s, m.df, mse));
  }
}, 600000);
