import { derivativeJumps, knotBends } from '../../../src/engine/diagnostics/knotBends';
import { regressionSplineRefit } from '../../../src/engine/smoothers/trend/regressionSplineRefit';
import { fitTrend, prepareSeries } from '../../../src/engine';
import { normalStream } from '../../helpers/random';

describe('derivativeJumps', () => {
  test.each([1, 2, 3])('derivativeJumps of an exact degree-%i refit recovers the planted jump c k!', (k) => {
    // y = 1 + x + 0.7 (x - 4.5)_+^k - 0.3 (x - 7.25)_+^k: jumps of the k-th derivative 0.7 k! and -0.3 k!
    const x = Float64Array.from({ length: 60 }, (_, i) => i * 0.2);
    const y = x.map((t) => 1 + t + 0.7 * Math.max(0, t - 4.5) ** k - 0.3 * Math.max(0, t - 7.25) ** k);
    const w = new Float64Array(60).fill(1);
    const { spline, fitted } = regressionSplineRefit(x, y, w, k, [4.5, 7.25]);
    fitted.forEach((f, i) => expect(f).toBeCloseTo(y[i], 9));
    const fact = [1, 1, 2, 6][k];
    const j = derivativeJumps(spline);
    expect(j[0]).toBeCloseTo(0.7 * fact, 8);
    expect(j[1]).toBeCloseTo(-0.3 * fact, 8);
  });
});

describe('knotBends', () => {
  const z = normalStream(21);
  const x = Array.from({ length: 200 }, (_, i) => i + 1);
  // a planted slope change of +0.5 at x = 100, and a smooth turn around x = 150
  const truth = x.map((t) => 0.1 * t + 0.5 * Math.max(0, t - 100) - 0.5 * 10 * Math.log(1 + Math.exp((t - 150) / 10)));
  const y = truth.map((v) => v + 0.5 * z());
  const series = prepareSeries(y, x);
  const fit = fitTrend(series, { order: 1 });

  test('knotBends merges runs of neighbouring knots of one sign into one bend each', () => {
    const bends = fit.bends!;
    expect(bends.length).toBeLessThan(fit.knots.length);
    expect(bends.reduce((a, b) => a + b.knots, 0)).toBe(fit.knots.length);
    for (let i = 1; i < bends.length; i++) expect(bends[i].xFrom).toBeGreaterThan(bends[i - 1].xTo);
  });

  test('knotBends sizes the planted kink on the unshrunk refit, larger than the L1 total', () => {
    const kink = fit.bends!.reduce((a, b) => (Math.abs(b.x - 100) < Math.abs(a.x - 100) ? b : a));
    expect(Math.abs(kink.x - 100)).toBeLessThanOrEqual(4);
    expect(Math.abs(kink.change - 0.5)).toBeLessThan(0.15);
    expect(Math.abs(kink.change)).toBeGreaterThan(Math.abs(kink.shrunkChange));
    expect(kink.rank).toBeLessThanOrEqual(2);
  });

  test('knotBends gives nothing for a fit without knots', () => {
    expect(knotBends(series, 1, [])).toEqual([]);
  });
});
