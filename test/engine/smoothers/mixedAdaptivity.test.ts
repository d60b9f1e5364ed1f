/**
 * The acceptance check of the mixed trend: on the invented, seeded kinked-then-smooth series
 * (mixedSeries.ts: three kinks, then two smooth humps; uneven x; noise sd 0.1, slope changes
 * tripled), the mixed fit should have a lower mean squared error against the truth than every
 * single-order trend filter (orders 0 to 3) and the smoothing spline at the same df. The mixed
 * fits are the cross-validated one and two at 3 times and 1/3 of its kink penalty (same width);
 * the others are fitted at each mixed fit's df (trend filtering meets it in whole steps, the
 * spline exactly).
 *
 * Not met yet, so it runs as an expected failure (it starts failing once the mixed fit wins, and
 * the mark is then removed). Measured (n = 200): at df 39 / 27 / 50 the mixed fit's MSE is
 * 2.05e-3 / 2.20e-3 / 2.22e-3 against the spline's 1.89e-3 / 1.85e-3 / 2.22e-3 and order 1's
 * 1.91e-3 / 1.82e-3 / 2.28e-3: it beats orders 0, 2 and 3 but not the spline or order 1. Its
 * df (kinks + bend knots + 4) counts the runs of neighbouring knots order 3 places at each bend,
 * so at equal df it has fewer effective parameters than the others; whether a fairer df (or a
 * different width grid) closes the gap is open.
 */
import { fitMixed, MixedModel } from '../../../src/engine/smoothers/mixed/mixedAnalysis';
import { fitTrend } from '../../../src/engine/smoothers/trend';
import { fitSpline } from '../../../src/engine/smoothers/spline';
import { seriesFromArrays } from '../../../src/engine/series';
import { kinkedThenSmoothSeries } from './mixedSeries';

test.failing('mixed beats every single-order trend filter and the spline at matched df on a kinked-then-smooth series', () => {
  const { x, y, truth } = kinkedThenSmoothSeries(200, 5, 0.1, 3);
  const s = seriesFromArrays(x, y);
  const mse = (f: Float64Array) => f.reduce((a, v, i) => a + (v - truth[i]) ** 2, 0) / truth.length;
  const cv = fitMixed(s, {});
  const width = (cv.model as MixedModel).width;
  for (const m of [cv, fitMixed(s, { penalty: cv.penalty * 3, width }), fitMixed(s, { penalty: cv.penalty / 3, width })]) {
    const e = mse(m.fitted);
    for (const k of [0, 1, 2, 3]) expect(e).toBeLessThan(mse(fitTrend(s, { order: k, df: m.df }).fitted));
    expect(e).toBeLessThan(mse(fitSpline(s, { df: m.df }).fitted));
  }
}, 600000);
