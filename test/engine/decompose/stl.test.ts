import { stl, stlParameters, stlUnchecked } from '../../../src/engine/decompose/stl';
import { KnotwiseError } from '../../../src/engine/errors';
import { loadFixture, maxAbsDiff } from '../../helpers/fixtures';
import { rPartialSortMedian } from './rPartialSort';

describe("stl against R's stats::stl (R datasets co2 and nottem; Debian r-base-core 4.2.2)", () => {
  const fx = loadFixture('stl_r');
  for (const c of fx.cases) {
    test(`${c.name}: seasonal, trend, remainder and weights agree to 1e-10`, () => {
      const robust = c.options.outerLoops > 0;
      // R's robustness weights take the median of |R| from a partial sort that, on an even
      // number of points (co2: 468, nottem: 240), is called with its two order statistics in
      // decreasing order and may return a neighbouring value (see rPartialSort.ts). Both of these
      // series are even, so robust cases run with R's partial sort ported; the exact median is
      // checked against statsmodels below. The parameters are R's, under our option names.
      const r = robust ? stlUnchecked(Float64Array.from(c.y), stlParameters(c.y.length, c.options), rPartialSortMedian) : stl(c.y, c.options);
      expect(maxAbsDiff(r.seasonal, c.seasonal)).toBeLessThan(1e-10);
      expect(maxAbsDiff(r.trend, c.trend)).toBeLessThan(1e-10);
      expect(maxAbsDiff(r.remainder, c.remainder)).toBeLessThan(1e-10);
      expect(maxAbsDiff(r.weights, c.weights)).toBeLessThan(1e-10);
    });
  }
  test('the partial sort matters: with the exact median the robust nottem case differs from R', () => {
    const c = fx.cases.find((k: any) => k.name === 'nottem-s7-robust-t21-jump1');
    const r = stl(c.y, c.options);
    expect(maxAbsDiff(r.seasonal, c.seasonal)).toBeGreaterThan(1e-4);
  });
});

describe("stl against statsmodels' STL (Debian python3-statsmodels 0.13; R datasets co2 and nottem)", () => {
  const fx = loadFixture('stl_statsmodels');
  for (const c of fx.cases) {
    // statsmodels' robustness weights use the exact median, as we do: robust cases compare directly.
    test(`${c.name}: components agree to 1e-10`, () => {
      const r = stl(c.y, c.options);
      expect(maxAbsDiff(r.seasonal, c.seasonal)).toBeLessThan(1e-10);
      expect(maxAbsDiff(r.trend, c.trend)).toBeLessThan(1e-10);
      expect(maxAbsDiff(r.remainder, c.remainder)).toBeLessThan(1e-10);
    });
  }
});

describe('stl: input checks', () => {
  test('a gap is refused with its position', () => {
    const y = Array.from({ length: 40 }, (_, i) => Math.sin(i));
    y[5] = NaN;
    expect(() => stl(y, { period: 4 })).toThrow(/point 6 is NaN/);
  });
  test('two cycles or fewer are refused', () => {
    expect(() => stl(new Float64Array(24), { period: 12 })).toThrow(KnotwiseError);
    expect(() => stl(new Float64Array(24), { period: 12 })).toThrow(/more than 24 points/);
  });
  test('bad windows and degrees name the value', () => {
    const y = new Float64Array(60).map((_, i) => i % 5);
    expect(() => stl(y, { period: 5, seasonalWindow: 1 })).toThrow(/seasonalWindow must be a number of points >= 3; got 1/);
    expect(() => stl(y, { period: 5, trendDegree: 2 })).toThrow(/trendDegree must be a whole number from 0 to 1; got 2/);
    expect(() => stl(y, { period: 2.5 })).toThrow(/period must be a whole number/);
  });
  test('an even window is raised to the next odd one, as in R', () => {
    expect(stlParameters(100, { period: 12, seasonalWindow: 8 }).seasonalWindow).toBe(9);
  });
});
