import * as fs from 'fs';
import * as path from 'path';
import { fitTrend, evaluateTrend, trendCriterionPath, trendPenaltyMax } from '../../../src/engine/smoothers/trend';
import { seriesFromArrays, prepareSeries } from '../../../src/engine/series';
import { KnotwiseError } from '../../../src/engine/errors';
import { runAnalysis } from '../../../src/engine/analysis/runAnalysis';
import { trendAnalysis } from '../../../src/engine/smoothers/trend';
import { checkTrendKkt } from './trendKkt';
import { totalVariationDenoise } from '../../../src/engine/smoothers/trend/totalVariationDenoise';

interface DualCase {
  n: number; order: number; weighted: boolean; lambda: number; lambdaMax: number; lambdaFraction: number;
  x: number[]; y: number[]; w: number[]; fitted: number[]; knotRows: number[]; objective: number; dualityGap: number;
}
const fixture = JSON.parse(fs.readFileSync(path.join(__dirname, '../../reference/fixtures/trend_dual_scipy.json'), 'utf8')) as { scipy: string; cases: DualCase[] };

const label = (c: DualCase) => `n=${c.n} k=${c.order} ${c.weighted ? 'weighted' : 'unweighted'} lambda=${c.lambdaFraction} lambda_max`;

describe('fitTrend against SciPy (bvls on the dual, test/reference/gen_trend.py)', () => {
  test.each(fixture.cases.map((c) => [label(c), c] as const))('%s: fitted values and knots agree', (_l, c) => {
    const s = seriesFromArrays(c.x, c.y, c.w);
    const r = fitTrend(s, { order: c.order, penalty: c.lambda });
    // Tolerance: both solutions are optimal to rounding (ours: exact refinement
    // verified by the optimality conditions, or relative duality gap 1e-8; SciPy:
    // an exact active-set method, duality gap recorded in the fixture). The
    // primal is 1-strongly convex in the W-norm, so ||b - b*||_W <= sqrt(2 gap);
    // with gaps of at most ~3e-7 on objectives of order 10-1000 this gives about
    // 1e-3 in y units (y ~ 100 +- 20). We ask 1e-6 relative to the y range, far
    // inside that bound, because both sides are in fact exact up to rounding.
    const yr = Math.max(...c.y) - Math.min(...c.y);
    let worst = 0;
    for (let i = 0; i < c.n; i++) worst = Math.max(worst, Math.abs(r.fitted[i] - c.fitted[i]));
    expect(worst / yr).toBeLessThan(1e-6);
    expect(r.knots.map((k) => k.index - (c.order === 0 ? 1 : c.order))).toEqual(c.knotRows);
    expect(r.df).toBe(c.knotRows.length + c.order + 1);
    expect(r.solver.converged).toBe(true);
  });

  test.each(fixture.cases.map((c) => [label(c), c] as const))('%s: lambda_max agrees with the dense solve in the fixture', (_l, c) => {
    // gen_trend.py: lambda_max = max |u| with (D W^-1 D') u = D y, solved densely by NumPy,
    // independently of the engine's running sums. That matrix's condition number grows fast
    // with the order (measured 4.8e9 for these order-4 differences at n = 40), so the fixture itself is
    // good to about 1e-8 relative for k = 3 (measured: 2.3e-8 apart); we ask 5e-7.
    const s = seriesFromArrays(c.x, c.y, c.w);
    expect(trendPenaltyMax(s, { order: c.order }) / c.lambdaMax).toBeCloseTo(1, 6);
  });

  test.each(fixture.cases.map((c) => [label(c), c] as const))('%s: the optimality conditions hold', (_l, c) => {
    const s = seriesFromArrays(c.x, c.y, c.w);
    const r = fitTrend(s, { order: c.order, penalty: c.lambda });
    const kkt = checkTrendKkt(c.x, c.y, c.w, r.fitted, c.order, c.lambda);
    // dual feasibility and the sign condition to 1e-6 of lambda; stationarity to 1e-8
    expect(kkt.boxExcess).toBeLessThan(1e-6);
    expect(kkt.signError).toBeLessThan(1e-6);
    expect(kkt.stationarity).toBeLessThan(1e-8);
    expect(kkt.knotRows).toEqual(r.knots.map((k) => k.index - (c.order === 0 ? 1 : c.order)));
  });
});

describe('totalVariationDenoise', () => {
  test('solves the hand example: two levels pulled together by lambda / 2 each', () => {
    // 1/2 sum (y - b)^2 + 1 * |jump|: each side of a single jump moves by lambda / (points on that side)
    expect(Array.from(totalVariationDenoise(Float64Array.of(0, 0, 4, 4), Float64Array.of(1, 1, 1, 1), 1))).toEqual([0.5, 0.5, 3.5, 3.5]);
  });

  test('gives the weighted mean at a large penalty', () => {
    const y = Float64Array.of(1, 5, 2, 8), w = Float64Array.of(1, 3, 2, 2);
    const b = totalVariationDenoise(y, w, 1e6);
    for (const v of b) expect(v).toBeCloseTo((1 + 15 + 4 + 16) / 8, 12);
  });
});

describe('fitTrend recovery', () => {
  const kinked = (x: Float64Array) => {
    const k1 = x[20], k2 = x[40];
    return Float64Array.from(x, (t) => (t <= k1 ? t : t <= k2 ? k1 - 0.5 * (t - k1) : k1 - 0.5 * (k2 - k1) + 2 * (t - k2)));
  };

  test('finds the kinks of noiseless piecewise-linear data at a small penalty, up to negligible neighbours', () => {
    // At lambda > 0 the exact solution may carry extra knots right beside a true one:
    // the dual is a smooth (piecewise cubic) function of the rows and need not peak exactly
    // at the kink row. They are of order lambda; the optimality conditions certify them.
    const n = 60;
    const x = Float64Array.from({ length: n }, (_, i) => 2 * i);
    const y = kinked(x);
    const r = fitTrend(seriesFromArrays(x, y), { order: 1, penalty: 1e-4 });
    const big = r.knots.filter((k) => Math.abs(k.change) > 1e-4);
    expect(big.map((k) => k.x)).toEqual([40, 80]);
    for (const k of r.knots) if (Math.abs(k.change) <= 1e-4) { expect([19, 21, 39, 41]).toContain(k.index); expect(Math.abs(k.change)).toBeLessThan(1e-5); }
    // slope changes -1.5 and +2.5, shrunk by the penalty by less than 1e-3
    expect(Math.abs(big[0].change + 1.5)).toBeLessThan(1e-3);
    expect(Math.abs(big[1].change - 2.5)).toBeLessThan(1e-3);
    const kkt = checkTrendKkt(x, y, new Float64Array(n).fill(1), r.fitted, 1, 1e-4, 1e-9);
    expect(kkt.boxExcess).toBeLessThan(1e-7);
    expect(kkt.signError).toBeLessThan(1e-7);
  });

  test('on uneven x the kinks carry the slope changes; any extra knots sit beside them and are negligible', () => {
    // Trend filtering may add knots next to a true one (the solution, verified by the
    // optimality conditions, is not always knot-exact on uneven spacing); they must be tiny.
    const n = 60;
    const x = Float64Array.from({ length: n }, (_, i) => i + 0.3 * Math.sin(i));
    const y = kinked(x);
    const r = fitTrend(seriesFromArrays(x, y), { order: 1, penalty: 1e-4 });
    const big = r.knots.filter((k) => Math.abs(k.change) > 1e-3);
    expect(big.map((k) => k.index)).toEqual([20, 40]);
    for (const k of r.knots) if (Math.abs(k.change) <= 1e-3) expect([19, 21, 39, 41]).toContain(k.index);
    const kkt = checkTrendKkt(x, y, new Float64Array(n).fill(1), r.fitted, 1, 1e-4);
    expect(kkt.boxExcess).toBeLessThan(1e-6);
  });

  test.each([0, 1, 2, 3])('a noiseless polynomial of degree %i has no knots at any penalty', (k) => {
    const n = 40;
    const x = Float64Array.from({ length: n }, (_, i) => 5 + i * 0.7 + 0.2 * Math.cos(i));
    const y = Float64Array.from(x, (t) => 3 + (k >= 1 ? 0.5 * t : 0) + (k >= 2 ? -0.02 * t * t : 0) + (k >= 3 ? 0.001 * t * t * t : 0));
    for (const pen of [1e-6, 1e-2, 1, 100]) {
      const r = fitTrend(seriesFromArrays(x, y), { order: k, penalty: pen });
      expect(r.knots).toEqual([]);
      expect(r.df).toBe(k + 1);
      for (let i = 0; i < n; i++) expect(r.fitted[i]).toBeCloseTo(y[i], 8);
    }
  });

  test('the penalty is in the units of the data: rescaling x and y rescales lambda by c * h^k', () => {
    const c = fixture.cases.find((d) => d.order === 2)!;
    const r1 = fitTrend(seriesFromArrays(c.x, c.y, c.w), { order: 2, penalty: c.lambda });
    const sx = 7, sy = 0.01;
    const r2 = fitTrend(seriesFromArrays(c.x.map((v) => v * sx), c.y.map((v) => v * sy), c.w), { order: 2, penalty: c.lambda * sy * sx * sx });
    for (let i = 0; i < c.n; i++) expect(r2.fitted[i]).toBeCloseTo(r1.fitted[i] * sy, 8);
    expect(r2.knots.map((k) => k.index)).toEqual(r1.knots.map((k) => k.index));
  });
});

describe('fitTrend penalty choice', () => {
  const n = 200;
  let s = 4242;
  const rnd = () => { s = (s * 48271) % 2147483647; return s / 2147483647; };
  const gauss = () => Math.sqrt(-2 * Math.log(rnd())) * Math.cos(2 * Math.PI * rnd());
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const truth = (t: number) => (t < 70 ? 0.05 * t : t < 140 ? 3.5 - 0.03 * (t - 70) : 1.4 + 0.08 * (t - 140));
  const y = Float64Array.from(x, (t) => truth(t) + 0.3 * gauss());
  const series = seriesFromArrays(x, y);

  test('cross-validation returns a curve over the grid with standard errors and picks its minimum', () => {
    const r = fitTrend(series, { order: 1 });
    expect(r.criterion.name).toBe('cv');
    const curve = r.criterion.curve!;
    expect(curve.length).toBe(30);
    for (let j = 1; j < curve.length; j++) expect(curve[j].penalty).toBeGreaterThan(curve[j - 1].penalty);
    const min = Math.min(...curve.map((p) => p.score));
    expect(r.criterion.value).toBe(min);
    expect(curve.every((p) => (p.se ?? -1) >= 0)).toBe(true);
    expect(r.criterion.atEdge).toBe(false);
    // the chosen fit is close to the truth (noise sd 0.3)
    let mse = 0;
    for (let i = 0; i < n; i++) mse += (r.fitted[i] - truth(x[i])) ** 2;
    expect(Math.sqrt(mse / n)).toBeLessThan(0.12);
    expect(r.warnings.map((w) => w.code)).toContain('boundary');
  });

  test.each([1, 3])('order %i: the returned fit is the curve point it was chosen from (same penalty, same knot count)', (k) => {
    const r = fitTrend(series, { order: k, select: 'sure' });
    const point = r.criterion.curve!.find((p) => p.penalty === r.penalty)!;
    expect(point).toBeDefined();
    expect(r.knots.length).toBe(point.knots);
    expect(r.solver.converged).toBe(true);
  });

  test('the one-standard-error rule picks a penalty at least as large', () => {
    const a = fitTrend(series, { order: 1 });
    const b = fitTrend(series, { order: 1, oneSE: true });
    expect(b.penalty).toBeGreaterThanOrEqual(a.penalty);
    const curve = a.criterion.curve!;
    const best = curve.find((p) => p.score === a.criterion.value)!;
    const chosen = curve.find((p) => Math.abs(p.penalty - b.penalty) <= 1e-9 * b.penalty)!;
    expect(chosen.score).toBeLessThanOrEqual(best.score + best.se!);
  });

  test.each(['sure', 'bic'] as const)('%s picks the minimum of its own curve', (rule) => {
    const r = fitTrend(series, { order: 1, select: rule });
    expect(r.criterion.name).toBe(rule);
    expect(r.criterion.value).toBe(Math.min(...r.criterion.curve!.map((p) => p.score)));
  });

  test('a df target is met exactly when attainable', () => {
    const r = fitTrend(series, { order: 1, df: 6 });
    expect(r.df).toBe(6);
    expect(r.knots.length).toBe(4);
  });

  test('an unattainable df target is clamped with a warning', () => {
    const r = fitTrend(series, { order: 1, df: 1 });
    expect(r.df).toBe(2);
    expect(r.warnings.map((w) => w.code)).toContain('target-clamped');
  });

  test('trendCriterionPath returns the table used for the choice', () => {
    const p = trendCriterionPath(series, { order: 1 });
    expect(p.points.length).toBe(30);
    expect(p.points[29].penalty).toBeCloseTo(p.lambdaMax, 6);
    expect(trendPenaltyMax(series, { order: 1 })).toBeCloseTo(p.lambdaMax, 6);
    // just below lambda_max a knot appears, at and above it none
    expect(fitTrend(series, { order: 1, penalty: p.lambdaMax * 1.0001 }).knots.length).toBe(0);
    expect(fitTrend(series, { order: 1, penalty: p.lambdaMax * 0.99 }).knots.length).toBeGreaterThan(0);
    expect(p.points[29].df).toBe(2);
    expect(p.points.every((q) => Number.isFinite(q.cv))).toBe(true);
  });

  test('pure noise puts the choice at lambda_max with a penalty-at-edge warning', () => {
    const yn = Float64Array.from(x, () => gauss());
    const r = fitTrend(seriesFromArrays(x, yn), { order: 1, select: 'bic' });
    expect(r.criterion.atEdge).toBe(true);
    expect(r.warnings.map((w) => w.code)).toContain('penalty-at-edge');
  });
});

describe('fitTrend relaxed fit', () => {
  test('relaxed = 1 is the unpenalised least-squares fit on the knots (normal equations)', () => {
    const c = fixture.cases.find((d) => d.order === 1 && d.weighted)!;
    const r = fitTrend(seriesFromArrays(c.x, c.y, c.w), { order: 1, penalty: c.lambda, relaxed: 1 });
    // the residual is W-orthogonal to every hinge at a knot and to 1 and x
    const basis: ((t: number) => number)[] = [() => 1, (t) => t, ...r.knots.map((k) => (t: number) => Math.max(0, t - k.x))];
    for (const f of basis) {
      let dot = 0, scale = 0;
      for (let i = 0; i < c.n; i++) { dot += c.w[i] * (c.y[i] - r.fitted[i]) * f(c.x[i]); scale += Math.abs(c.w[i] * c.y[i] * f(c.x[i])); }
      expect(Math.abs(dot) / scale).toBeLessThan(1e-10);
    }
  });

  test('relaxed = 1 at order 0 gives the weighted mean of each segment between knots', () => {
    const c = fixture.cases.find((d) => d.order === 0 && d.weighted)!;
    const r = fitTrend(seriesFromArrays(c.x, c.y, c.w), { order: 0, penalty: c.lambda, relaxed: 1 });
    const starts = [0, ...r.knots.map((k) => k.index), c.n];
    for (let s = 0; s + 1 < starts.length; s++) {
      let sw = 0, sy = 0;
      for (let i = starts[s]; i < starts[s + 1]; i++) { sw += c.w[i]; sy += c.w[i] * c.y[i]; }
      for (let i = starts[s]; i < starts[s + 1]; i++) expect(r.fitted[i]).toBeCloseTo(sy / sw, 10);
    }
  });

  test('relaxed = 0.5 is the average of the L1 fit and the refit', () => {
    const c = fixture.cases.find((d) => d.order === 2)!;
    const s = seriesFromArrays(c.x, c.y, c.w);
    const a = fitTrend(s, { order: 2, penalty: c.lambda });
    const b = fitTrend(s, { order: 2, penalty: c.lambda, relaxed: 1 });
    const h = fitTrend(s, { order: 2, penalty: c.lambda, relaxed: 0.5 });
    for (let i = 0; i < c.n; i++) expect(h.fitted[i]).toBeCloseTo(0.5 * (a.fitted[i] + b.fitted[i]), 10);
    const e = evaluateTrend(h, Float64Array.of(c.x[3], (c.x[3] + c.x[4]) / 2));
    expect(e.value[0]).toBeCloseTo(h.fitted[3], 10);
  });
});

describe('evaluateTrend', () => {
  test('reproduces the fit at the data and follows the degree-k pieces between them', () => {
    const c = fixture.cases.find((d) => d.order === 1)!;
    const r = fitTrend(seriesFromArrays(c.x, c.y, c.w), { order: 1, penalty: c.lambda });
    const e = evaluateTrend(r, Float64Array.from(c.x));
    for (let i = 0; i < c.n; i++) expect(e.value[i]).toBeCloseTo(r.fitted[i], 10);
    const mid = (c.x[5] + c.x[6]) / 2;
    expect(evaluateTrend(r, Float64Array.of(mid)).value[0]).toBeCloseTo((r.fitted[5] + r.fitted[6]) / 2, 10);
  });

  test('continues the end pieces as polynomials beyond the data and flags them', () => {
    const x = Float64Array.from({ length: 30 }, (_, i) => i);
    const y = Float64Array.from(x, (t) => (t < 15 ? t : 15 + 3 * (t - 15)));
    const r = fitTrend(seriesFromArrays(x, y), { order: 1, penalty: 1e-6 });
    const e = evaluateTrend(r, Float64Array.of(-2, 10, 31));
    expect(Array.from(e.extrapolated)).toEqual([1, 0, 0 + 1]);
    expect(e.value[0]).toBeCloseTo(-2, 4);
    expect(e.value[2]).toBeCloseTo(15 + 3 * 16, 4);
  });

  test('is a step function for order 0', () => {
    const x = Float64Array.of(0, 1, 2, 3);
    const r = fitTrend(seriesFromArrays(x, Float64Array.of(0, 0, 4, 4)), { order: 0, penalty: 1 });
    expect(Array.from(evaluateTrend(r, Float64Array.of(0.5, 1.5, 2.5)).value)).toEqual([0.5, 3.5, 3.5]);
    expect(r.knots.map((k) => [k.index, k.change])).toEqual([[2, 3]]);
  });
});

describe('trend method definition', () => {
  test('is registered as "trend" and fits through runAnalysis', () => {
    const r = runAnalysis({ analysis: 'trend', y: [1, 1, 1, 10, 10, 10, 10, 20], x: [1, 2, 3, 4, 5, 6, 7, 8], options: { order: 0, penalty: 0.5 } }).smooth!;
    expect(r.method).toBe('trend');
    expect(r.knots.map((k) => k.row)).toEqual([3, 7]);
    expect(trendAnalysis.minPoints({ order: 3 })).toBe(5);
  });

  test.each([
    [{ order: 4 }, /order must be a whole number from 0 to 3; got 4/],
    [{ order: 1.5 }, /got 1.5/],
    [{ relaxed: 2 }, /relaxed must be a number from 0 to 1; got 2/],
    [{ penalty: -1 }, /penalty must be a finite number >= 0; got -1/],
    [{ select: 'gcv' }, /select must be one of "cv", "sure", "bic"; got "gcv"/],
    [{ folds: 1 }, /folds must be a whole number from 2 to 50; got 1/],
    [{ tolerance: 2 }, /tolerance must be below 1/],
  ])('rejects bad options %j with a message naming the value', (opts, msg) => {
    const s = seriesFromArrays([1, 2, 3, 4, 5, 6], [1, 2, 1, 2, 1, 2]);
    expect(() => fitTrend(s, opts as never)).toThrow(KnotwiseError);
    expect(() => fitTrend(s, opts as never)).toThrow(msg);
  });

  test('refuses too few points for the order', () => {
    expect(() => fitTrend(seriesFromArrays([1, 2, 3], [1, 2, 3]), { order: 2, penalty: 1 })).toThrow(/at least 4 distinct x values; got 3/);
  });

  test('carries the intake warnings first and a boundary note', () => {
    const s = prepareSeries([1, '', 3, 4, 6, 5, 7, 9, 8, 10], null);
    const r = fitTrend(s, { order: 1, penalty: 1 });
    expect(r.warnings[0].code).toBe('dropped-cells');
    expect(r.warnings.map((w) => w.code)).toContain('boundary');
    expect(r.solver.stoppingRule.length).toBeGreaterThan(10);
  });
});
