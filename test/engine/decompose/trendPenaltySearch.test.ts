/**
 * The decomposition's trend penalty search scores the same cross-validation as the trend's own path
 * (fitTrend with the same grid), only penalty by penalty, and stops after two rises past the minimum:
 * on invented daily, weekly and monthly series (seeded, as in the benchmark) without stopping its curve
 * equals the path's, and with stopping it picks the same penalty and fit.
 */
import { seriesFromArrays, Series } from '../../../src/engine/series';
import { fitTrend } from '../../../src/engine/smoothers/trend';
import { trendPenaltySearch, SEARCH_RISES } from '../../../src/engine/decompose/trendPenaltySearch';
import { penaltySearchGrid } from '../../../src/engine/decompose/decompose';
import { defaultGridRatio } from '../../../src/engine/smoothers/trend/trendPath';
import { dailySales, weeklyOrders, monthlyCosts } from '../../bench/decompose.bench';

/** The series without its seasonal pattern, as the decomposition searches it (here: the known pattern removed by a per-phase mean). */
function deseasonalised(d: { x: Float64Array; y: Float64Array }, period: number): Series {
  const n = d.y.length;
  const sum = new Float64Array(period), cnt = new Float64Array(period);
  for (let i = 0; i < n; i++) { sum[i % period] += d.y[i]; cnt[i % period]++; }
  let mean = 0;
  for (let p = 0; p < period; p++) mean += sum[p] / cnt[p] / period;
  return seriesFromArrays(d.x, Float64Array.from(d.y, (v, i) => v - sum[i % period] / cnt[i % period] + mean));
}

const cases = [
  { name: 'daily, 600 days', s: deseasonalised(dailySales(11, 600), 7) },
  { name: 'weekly, 261 weeks', s: deseasonalised(weeklyOrders(2015, 261), 52) },
  { name: 'monthly, 96 months', s: deseasonalised(monthlyCosts(2015, 96), 12) },
];

describe('trendPenaltySearch', () => {
  for (const c of cases) {
    test(`${c.name}: the full grid's scores equal the trend path's; stopping early picks the same penalty and fit`, () => {
      for (const oneSE of [false, true]) {
        const G = penaltySearchGrid(1);
        const ref = fitTrend(c.s, { order: 1, gridSize: G, oneSE });
        const set = { order: 1, gridSize: G, ratio: defaultGridRatio(1), folds: 5, oneSE, tolerance: 1e-8, maxIterations: 200 };
        const full = trendPenaltySearch(c.s, { ...set, stopEarly: false });
        const curve = ref.criterion.curve!;
        expect(full.curve.length).toBe(curve.length);
        curve.forEach((p, j) => {
          expect(Math.abs(full.curve[j].penalty / p.penalty - 1)).toBeLessThan(1e-12);
          expect(Math.abs(full.curve[j].score / p.score - 1)).toBeLessThan(1e-9);
          expect(full.curve[j].df).toBe(p.df);
        });
        const early = trendPenaltySearch(c.s, set);
        expect(Math.abs(early.penalty / ref.penalty - 1)).toBeLessThan(1e-12);
        let d = 0;
        for (let i = 0; i < c.s.n; i++) d = Math.max(d, Math.abs(early.fitted[i] - ref.fitted[i]));
        expect(d).toBeLessThan(1e-8);
        // it stopped only after the rises, or ran the whole grid
        if (early.scored < G) {
          const sc = early.curve.map((p) => p.score);
          expect(sc[0]).toBeGreaterThan(sc[1]);
          expect(early.chosen).toBeGreaterThanOrEqual(SEARCH_RISES);
        }
      }
    });
  }
});
