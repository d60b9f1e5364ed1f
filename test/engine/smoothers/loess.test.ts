/**
 * LOESS / LOWESS against R (fixture loess_r.json from gen_loess.R: stats::lowess and
 * stats::loess with surface = "direct", on datasets::cars and a seeded series with ties
 * and outliers), plus the exact smoother-matrix diagonal, the delta interpolation, span
 * selection and refusals.
 */
import { Matrix, solve } from 'ml-matrix';
import { loessFit } from '../../../src/engine/smoothers/loess/loessFit';
import { loessSelectSpan } from '../../../src/engine/smoothers/loess/loessSelectSpan';
import { loessPredict } from '../../../src/engine/smoothers/loess/loessPredict';
import { LOESS_SEARCH_POINTS } from '../../../src/engine/smoothers/loess/loessSelectSpan';
import { runAnalysis, runCandidates } from '../../../src/engine';
import { autoCandidates, AUTO_COARSE_FROM, AUTO_SEARCH_POINTS } from '../../../src/engine/smoothers/auto';
import { loadFixture, maxAbsDiff, range } from '../../helpers/fixtures';
import { mulberry32, normalStream } from '../../helpers/random';

interface Case {
  data: 'cars' | 'seeded'; fn: 'lowess' | 'loess'; f?: number; iter?: number; delta?: number;
  span?: number; degree?: 1 | 2; family?: string; iterations?: number; trace_hat?: number; fitted: number[];
}
const fx = loadFixture<{ data: Record<string, { x: number[]; y: number[] }>; cases: Case[] }>('loess_r');

describe('against R lowess (local linear, tricube, bisquare robustness, delta interpolation)', () => {
  // R: lowess(x, y, f, iter, delta). Our settings: span = f, degree 1, robustnessIterations = iter,
  // the same delta. Known differences, all below 1e-7 of the range of y here: R keeps weight 1
  // for points within 0.001 h of x_i and drops points beyond 0.999 h (tricube weights there are
  // within 3e-9 of 1 and below 3e-8), and R fits no slope when the window's weighted spread of x
  // is below 0.001 of the range (never on these data).
  const cases = fx.cases.filter((c) => c.fn === 'lowess');
  test.each(cases.map((c) => [c.data, c.f, c.iter, c.delta, c] as const))('%s: f = %d, iter = %d, delta = %d', (data, f, iter, delta, c) => {
    const d = fx.data[data];
    const r = loessFit(d.x, d.y, null, { span: f as number, degree: 1, robustnessIterations: iter, delta });
    expect(maxAbsDiff(r.fitted, c.fitted) / range(d.y)).toBeLessThan(1e-6);
  });
});

describe('against R loess(surface = "direct")', () => {
  // R: loess(y ~ x, span, degree, family, control = loess.control(surface = "direct",
  // statistics = "exact", trace.hat = "exact")). family "gaussian": robustnessIterations 0;
  // "symmetric": R's 4 fits = 3 reweightings. trace.hat is R's exact tr(L) of the first
  // (unweighted) fit, so it is compared for "gaussian" only.
  const cases = fx.cases.filter((c) => c.fn === 'loess');
  test.each(cases.map((c) => [c.data, c.span, c.degree, c.family, c] as const))('%s: span = %d, degree = %i, %s', (data, span, degree, family, c) => {
    const d = fx.data[data];
    const r = loessFit(d.x, d.y, null, { span: span as number, degree: degree as 1 | 2, robustnessIterations: family === 'symmetric' ? 3 : 0, delta: 0 });
    expect(maxAbsDiff(r.fitted, c.fitted) / range(d.y)).toBeLessThan(1e-6);
    if (family === 'gaussian') expect(Math.abs(r.df - (c.trace_hat as number)) / (c.trace_hat as number)).toBeLessThan(1e-8);
  });
});

describe('loessFit', () => {
  function series(n: number, seed: number, ties = false) {
    const u = mulberry32(seed), z = normalStream(seed + 1);
    const x = Float64Array.from({ length: n }, () => 10 * u()).sort();
    if (ties) for (let i = 0; i < n; i++) x[i] = Math.round(x[i] * 4) / 4;
    const y = Float64Array.from(x, (v) => Math.sin(v) + 0.2 * z());
    return { x, y };
  }

  test.each([0, 1, 2] as const)('fitted values and leverages equal a dense smoother matrix built point by point (degree %i, weights, ties)', (degree) => {
    const { x, y } = series(80, 3 + degree, true);
    const u = mulberry32(9);
    const w = Float64Array.from(x, () => 0.5 + u());
    const span = 0.3;
    const r = loessFit(x, y, w, { span, degree, delta: 0 });
    // dense check: at each x_i, q nearest points by distance, tricube, WLS by a dense solve
    const n = x.length, q = Math.floor(n * span + 1e-5);
    for (let i = 0; i < n; i++) {
      const dist = Array.from(x, (v) => Math.abs(v - x[i])).sort((a, b) => a - b);
      const h = dist[q - 1];
      const X = Matrix.zeros(degree + 1, degree + 1), b = Matrix.zeros(degree + 1, 1);
      const rows: number[][] = [];
      for (let j = 0; j < n; j++) {
        const t = Math.abs(x[j] - x[i]) / h;
        const k = t < 1 ? (1 - t ** 3) ** 3 : 0;
        const om = w[j] * k;
        const v = [1, (x[j] - x[i]) / h, ((x[j] - x[i]) / h) ** 2].slice(0, degree + 1);
        rows.push(v);
        for (let a = 0; a <= degree; a++) { b.set(a, 0, b.get(a, 0) + om * v[a] * y[j]); for (let c = 0; c <= degree; c++) X.set(a, c, X.get(a, c) + om * v[a] * v[c]); }
      }
      const beta = solve(X, b);
      expect(Math.abs(r.fitted[i] - beta.get(0, 0))).toBeLessThan(1e-10);
      // leverage: weight of y_i in the intercept
      const e = solve(X, Matrix.columnVector(rows[i])).get(0, 0);
      expect(Math.abs(r.leverage[i] - w[i] * (1 - 0) * e)).toBeLessThan(1e-10);
    }
  });

  test('local linear reproduces a straight line and local quadratic a parabola (any span, uneven x)', () => {
    const { x } = series(300, 12);
    const line = Float64Array.from(x, (v) => 2 - 0.5 * v);
    const par = Float64Array.from(x, (v) => 1 + v - 0.3 * v * v);
    for (const span of [0.05, 0.3, 1]) {
      expect(maxAbsDiff(loessFit(x, line, null, { span, degree: 1 }).fitted, line)).toBeLessThan(1e-10);
      expect(maxAbsDiff(loessFit(x, par, null, { span, degree: 2 }).fitted, par)).toBeLessThan(1e-9);
    }
  });

  test('delta: anchors are fitted exactly and the points between lie on the straight line between anchors; df stays the trace of the operator applied', () => {
    const { x, y } = series(2000, 21);
    const exact = loessFit(x, y, null, { span: 0.2, delta: 0 });
    const r = loessFit(x, y, null, { span: 0.2, delta: 0.05 });
    expect(r.anchors).toBeLessThan(300);
    expect(exact.anchors).toBe(2000);
    // close to the exact fit: linear interpolation over gaps up to delta = 0.05 errs by about
    // delta^2 / 8 * |f''| (3e-4 for sin) plus the wiggle of the noisy exact fit between anchors
    expect(maxAbsDiff(r.fitted, exact.fitted)).toBeLessThan(5e-3);
    expect(Math.abs(r.df - exact.df)).toBeLessThan(0.05 * exact.df);
    // the operator applied is linear in y: its trace equals sum_i d fitted_i / d y_i (finite differences on a few i)
    let fdTrace = 0;
    for (const i of [0, 7, 500, 1234, 1999]) {
      const y2 = y.slice(); y2[i] += 1;
      fdTrace += loessFit(x, y2, null, { span: 0.2, delta: 0.05 }).fitted[i] - r.fitted[i];
    }
    const part = [0, 7, 500, 1234, 1999].reduce((s, i) => s + r.leverage[i], 0);
    expect(Math.abs(fdTrace - part)).toBeLessThan(1e-10);
  });

  test('robustness iterations down-weight gross outliers', () => {
    const { x, y } = series(400, 5);
    const bad = y.slice();
    for (let i = 10; i < 400; i += 40) bad[i] += 8;
    const plain = loessFit(x, bad, null, { span: 0.3 });
    const robust = loessFit(x, bad, null, { span: 0.3, robustnessIterations: 3 });
    const clean = loessFit(x, y, null, { span: 0.3 });
    expect(maxAbsDiff(robust.fitted, clean.fitted)).toBeLessThan(0.25 * maxAbsDiff(plain.fitted, clean.fitted));
    for (let i = 10; i < 400; i += 40) expect(robust.robustnessWeights[i]).toBe(0);
  });

  test('refuses bad input with the offending value', () => {
    const x = [1, 2, 3, 4, 5, 6], y = [1, 2, 1, 2, 1, 2];
    expect(() => loessFit(x, y, null, { span: 1.5 })).toThrow(/span must be a number in \(0, 1\].*got 1.5/);
    expect(() => loessFit(x, y, null, { span: 0.2, degree: 2 })).toThrow(/gives 1 points per neighbourhood for 6 points; a local polynomial of degree 2 needs at least 3/);
    expect(() => loessFit([1, 3, 2, 4, 5, 6], y, null, { span: 1 })).toThrow(/sorted in increasing order; x at position 3 is 2 after 3/);
    expect(() => loessFit(x, y, [1, 1, 1, -2, 1, 1], { span: 1 })).toThrow(/weight at position 4 is negative: -2/);
    expect(() => loessFit([2, 2, 2], [1, 2, 3], null, { span: 1 })).toThrow(/all x are equal \(2\)/);
    expect(() => loessFit(x, y, null, { span: 1, degree: 3 as never })).toThrow(/degree must be 0, 1 or 2; got 3/);
    expect(() => loessFit(x, y, null, { span: 1, delta: -1 })).toThrow(/delta must be a finite number >= 0.*got -1/);
  });
});

describe('loessPredict', () => {
  test.each([[1, 0], [2, 0], [1, 3]] as const)('at the sample points it equals the exact fit (degree %i, %i robustness passes), in any order', (degree, passes) => {
    const u = mulberry32(70 + degree + passes), z = normalStream(71);
    const x = Float64Array.from({ length: 150 }, () => 5 * u()).sort();
    const y = Float64Array.from(x, (v) => Math.cos(v) + 0.2 * z() + (u() < 0.05 ? 3 : 0));
    const f = loessFit(x, y, null, { span: 0.35, degree, robustnessIterations: passes, delta: 0 });
    const idx = Array.from({ length: 150 }, (_, i) => (i * 37) % 150);
    const p = loessPredict(x, y, null, f.robustnessWeights, 0.35, degree, idx.map((i) => x[i]));
    for (let k = 0; k < idx.length; k++) expect(Math.abs(p[k] - f.fitted[idx[k]])).toBeLessThan(1e-12);
    // between points it reproduces a line (degree >= 1) and beyond the data it extrapolates it
    const line = Float64Array.from(x, (v) => 3 - 2 * v);
    const q = loessPredict(x, line, null, null, 0.35, degree, [-1, 2.2222, 7]);
    expect(maxAbsDiff(q, [5, 3 - 2 * 2.2222, -11])).toBeLessThan(1e-10);
  });
});

describe('loessSelectSpan', () => {
  test('AICc and GCV pick interior spans on a noisy sine; the table is the fits it reports', () => {
    const u = mulberry32(40), z = normalStream(41);
    const x = Float64Array.from({ length: 300 }, () => 10 * u()).sort();
    const y = Float64Array.from(x, (v) => Math.sin(v) + 0.3 * z());
    for (const criterion of ['aicc', 'gcv'] as const) {
      const s = loessSelectSpan(x, y, null, { degree: 2, criterion });
      expect(s.atEdge).toBe(false);
      const again = loessFit(x, y, null, { span: s.span, degree: 2 });
      expect(maxAbsDiff(again.fitted, s.fit.fitted)).toBe(0);
      const best = s.table.reduce((m, r) => Math.min(m, r.score), Infinity);
      expect(criterion === 'aicc' ? again.aicc : again.gcv).toBe(best);
      // a sine over 10 units: a handful of df, not an interpolation
      expect(again.df).toBeGreaterThan(4);
      expect(again.df).toBeLessThan(30);
    }
  });
});

describe('searchPoints: how many spans are tried when the span is chosen', () => {
  // A seeded wave with noise (invented), 400 points.
  const z = normalStream(77);
  const y = Array.from({ length: 400 }, (_, i) => Math.sin(i / 30) + 0.3 * z());

  test('cross-validation tries exactly that many spans, log-spaced from the default grid\'s smallest up to 1', () => {
    const full = runAnalysis({ analysis: 'loess', y, options: { rule: 'cv' } }).criterion!.curve!;
    const some = runAnalysis({ analysis: 'loess', y, options: { rule: 'cv', searchPoints: 12 } }).criterion!.curve!;
    expect(full).toHaveLength(LOESS_SEARCH_POINTS);
    expect(some).toHaveLength(12);
    expect(some[0].penalty).toBeCloseTo(full[0].penalty, 14);
    expect(some[11].penalty).toBeCloseTo(1, 14);
    const ratios = some.slice(1).map((p, i) => p.penalty / some[i].penalty);
    for (const r of ratios) expect(r).toBeCloseTo(ratios[0], 10);
  });

  test('AICc tries at most that many (spans with the same number of neighbours are one fit)', () => {
    const c = runAnalysis({ analysis: 'loess', y, options: { searchPoints: 8 } }).criterion!;
    expect(c.name).toBe('aicc');
    expect(c.curve!.length).toBeGreaterThan(4);
    expect(c.curve!.length).toBeLessThanOrEqual(8);
    expect(c.curve![c.curve!.length - 1].penalty).toBeCloseTo(1, 14);
  });

  test('the automatic choice tries 15 spans from 2,000 points, as its other candidates search 15 penalties', () => {
    const long = Array.from({ length: AUTO_COARSE_FROM }, (_, i) => Math.sin(i / 90) + 0.3 * z());
    const index = autoCandidates().findIndex((c) => c.def.name === 'loess');
    const [o] = runCandidates({ y: long }, [index]);
    expect(o.row.skipped).toBeUndefined();
    expect(o.core!.criterion!.curve).toHaveLength(AUTO_SEARCH_POINTS);
    expect(LOESS_SEARCH_POINTS).toBeGreaterThan(AUTO_SEARCH_POINTS);
  });

  test('a count outside 5 to 400 is refused with the value', () => {
    expect(() => runAnalysis({ analysis: 'loess', y, options: { searchPoints: 3 } })).toThrow('search-points (loess) must be a whole number from 5 to 400; got 3.');
  });
});
