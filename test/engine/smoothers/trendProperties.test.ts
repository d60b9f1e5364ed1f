/**
 * Property tests (fast-check): on random unevenly spaced, weighted data of
 * every order, each fit meets the optimality conditions checked independently
 * by trendKkt.ts, df counts the knots, and lambda_max gives the polynomial fit.
 */
import fc from 'fast-check';
import { fitTrend, trendPenaltyMax } from '../../../src/engine/smoothers/trend';
import { seriesFromArrays } from '../../../src/engine/series';
import { checkTrendKkt } from './trendKkt';

const dataArb = fc.record({
  n: fc.integer({ min: 8, max: 150 }),
  order: fc.integer({ min: 0, max: 3 }),
  seed: fc.integer({ min: 1, max: 1e9 }),
  frac: fc.double({ min: 1e-4, max: 0.9, noNaN: true }),
});

function make(n: number, seed: number) {
  let s = seed;
  const u = () => { s = (s * 48271) % 2147483647; return s / 2147483647; };
  const x: number[] = [], y: number[] = [], w: number[] = [];
  let c = 0;
  for (let i = 0; i < n; i++) { c += 0.2 + 1.5 * u(); x.push(c); }
  for (let i = 0; i < n; i++) { y.push(Math.sin(x[i]) * 3 + (u() - 0.5) * 2); w.push(0.3 + 2 * u()); }
  return { x, y, w };
}

describe('fitTrend properties', () => {
  test('every fit satisfies the optimality conditions to 1e-6 of lambda', () => {
    fc.assert(fc.property(dataArb, ({ n, order, seed, frac }) => {
      const { x, y, w } = make(n, seed);
      const s = seriesFromArrays(x, y, w);
      const lam = frac * trendPenaltyMax(s, { order });
      const r = fitTrend(s, { order, penalty: lam });
      const kkt = checkTrendKkt(x, y, w, r.fitted, order, lam);
      return r.solver.converged && kkt.boxExcess < 1e-6 && kkt.signError < 1e-6 && kkt.stationarity < 1e-7 && r.df === r.knots.length + order + 1;
    }), { numRuns: 100, seed: 20261201 });
  });

  test('at lambda_max the fit has no knots and equals the weighted polynomial fit', () => {
    fc.assert(fc.property(dataArb, ({ n, order, seed }) => {
      const { x, y, w } = make(n, seed);
      const s = seriesFromArrays(x, y, w);
      const r = fitTrend(s, { order, penalty: trendPenaltyMax(s, { order }) * (1 + 1e-9) });
      // the residual of a weighted LS polynomial is W-orthogonal to 1, x, .., x^order
      const xm = x.reduce((a, b) => a + b, 0) / n;
      for (let d = 0; d <= order; d++) {
        let dot = 0, sc = 0;
        for (let i = 0; i < n; i++) { const t = (x[i] - xm) ** d; dot += w[i] * (y[i] - r.fitted[i]) * t; sc += Math.abs(w[i] * y[i] * t); }
        if (Math.abs(dot) > 1e-9 * sc) return false;
      }
      return r.knots.length === 0;
    }), { numRuns: 40, seed: 7 });
  });
});
