import { decompose, DecomposeResult } from '../../../src/engine/decompose/decompose';
import { seasonalAdjustment } from '../../../src/engine/decompose/seasonalAdjustment';
import { seriesFromArrays, prepareSeries } from '../../../src/engine/series';
import { KnotwiseError } from '../../../src/engine/errors';
import { differenceOperator } from '../../../src/engine/linalg/difference';
import { dualFromResidual } from '../../../src/engine/linalg/dualFromResidual';
import { loadFixture, maxAbsDiff } from '../../helpers/fixtures';
import { normalStream } from '../../helpers/random';

/** Month (0-11) of an Excel serial date; computed here independently of the engine. */
const monthOf = (serial: number) => new Date(Date.UTC(1899, 11, 30) + serial * 86400000).getUTCMonth();
const weekdayOf = (serial: number) => new Date(Date.UTC(1899, 11, 30) + serial * 86400000).getUTCDay();

/** Excel serial of the first of a month, months counted from January 2015. */
const firstOfMonth = (m: number) => Math.round(Date.UTC(2015, m, 1) / 86400000) + 25569;

/**
 * The optimality (KKT) conditions of
 *   1/2 sum w (y - t - s - o)^2 + lambda ||D(x, k+1) t||_1 + rho ||o||_1,  s in the season's span,
 * checked from the result alone, with v = W (y - t - s - o):
 *   trend:  v = D^T u for some u with |u| <= lambda, u = lambda sign(D t) where D t != 0;
 *   season: every seasonal column is orthogonal to v (columns given by the caller);
 *   spikes: |v_i| <= rho, v_i = rho sign(o_i) where o_i != 0.
 * Returns the worst violations, relative to lambda, rho and the size of v.
 */
function kkt(r: DecomposeResult, w: Float64Array, k: number, columns: Float64Array[]) {
  const n = r.x.length;
  const v = new Float64Array(n);
  let vmax = 0;
  for (let i = 0; i < n; i++) { v[i] = w[i] * (r.y[i] - r.trend[i] - r.season[i] - r.spikes[i]); vmax = Math.max(vmax, Math.abs(v[i])); }
  const lam = r.penalty, rho = r.spikePenalty;
  const { u, inconsistency } = dualFromResidual(r.x, k + 1, v);
  const dt = differenceOperator(r.x, k + 1, r.trend);
  let dmax = 0;
  for (let j = 0; j < dt.length; j++) dmax = Math.max(dmax, Math.abs(dt[j]));
  let dualExcess = 0, knotMismatch = 0;
  for (let j = 0; j < u.length; j++) {
    dualExcess = Math.max(dualExcess, Math.abs(u[j]) / lam - 1);
    if (Math.abs(dt[j]) > 1e-7 * dmax) knotMismatch = Math.max(knotMismatch, Math.abs(u[j] - lam * Math.sign(dt[j])) / lam);
  }
  let spikeExcess = 0, spikeMismatch = 0;
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(rho)) spikeExcess = Math.max(spikeExcess, Math.abs(v[i]) / rho - 1);
    if (r.spikes[i] !== 0) spikeMismatch = Math.max(spikeMismatch, Math.abs(v[i] - rho * Math.sign(r.spikes[i])) / rho);
  }
  let seasonGradient = 0;
  for (const c of columns) {
    let g = 0, norm = 0;
    for (let i = 0; i < n; i++) { g += c[i] * v[i]; norm += Math.abs(c[i]); }
    seasonGradient = Math.max(seasonGradient, Math.abs(g) / (norm * vmax));
  }
  return { inconsistency, dualExcess, knotMismatch, spikeExcess, spikeMismatch, seasonGradient };
}

/**
 * The solver returns its last exact trend step together with the season and spikes that step was
 * taken for: the trend's conditions then hold to the trend solver's precision, and those of the
 * season and spikes within the last step's change of the trend, `achieved` (in sd(y)), which moves
 * v = W r by at most max(w) * achieved * sd(y).
 */
function expectOptimal(r: DecomposeResult, w: Float64Array, k: number, columns: Float64Array[]) {
  const c = kkt(r, w, k, columns);
  if (process.env.KKT_DEBUG) console.log(c, r.solver, r.knots.length, r.penalty);
  expect(r.solver.converged).toBe(true);
  expect(c.inconsistency).toBeLessThan(1e-9);
  expect(c.dualExcess).toBeLessThan(1e-7);
  expect(c.knotMismatch).toBeLessThan(1e-7);
  const n = r.y.length;
  const mean = r.y.reduce((a, v) => a + v, 0) / n;
  const sd = Math.sqrt(r.y.reduce((a, v) => a + (v - mean) ** 2, 0) / n);
  const dv = Math.max(...Array.from(w)) * r.solver.achieved * sd * 1.0001 + 1e-12;
  let vmax = 0;
  for (let i = 0; i < n; i++) vmax = Math.max(vmax, Math.abs(w[i] * (r.y[i] - r.trend[i] - r.season[i] - r.spikes[i])));
  expect(c.spikeExcess).toBeLessThan(dv / r.spikePenalty + 1e-12);
  expect(c.spikeMismatch).toBeLessThan(dv / r.spikePenalty + 1e-12);
  expect(c.seasonGradient).toBeLessThan(dv / vmax + 1e-12);
  // and the step itself is small: the answer is within the tolerance of the fixed point
  expect(r.solver.achieved).toBeLessThanOrEqual(r.solver.tolerance);
}

/** Per-phase indicator columns, with the cycle's zero-sum constraint: differences of indicators (a phase minus phase 0). */
function cycleColumns(phase: Int32Array, P: number): Float64Array[] {
  const cols: Float64Array[] = [];
  const present = new Set(Array.from(phase));
  const ref = Math.min(...present);
  for (const p of present) if (p !== ref) cols.push(Float64Array.from(phase, (q) => (q === p ? 1 : 0) - (q === ref ? 1 : 0)));
  void P;
  return cols;
}

function fourierColumns(x: Float64Array, length: number, K: number): Float64Array[] {
  const cols: Float64Array[] = [];
  for (let j = 1; j <= K; j++) {
    cols.push(Float64Array.from(x, (v) => Math.cos((2 * Math.PI * j * v) / length)));
    cols.push(Float64Array.from(x, (v) => Math.sin((2 * Math.PI * j * v) / length)));
  }
  return cols;
}

/** Invented monthly costs: 8 years from January 2015, a slope change, a yearly pattern, one outlier. */
function monthlyCosts(seed: number, seasonSize = 1, drop: number[] = []) {
  const z = normalStream(seed);
  const pattern = [3, 2, 1, 0, -1, -2, -4, -3, -1, 0, 2, 3];
  const x: number[] = [], y: number[] = [];
  for (let m = 0; m < 96; m++) {
    if (drop.includes(m)) continue;
    const s = firstOfMonth(m);
    x.push(s);
    y.push(50 + 0.1 * m + (m > 60 ? 0.4 * (m - 60) : 0) + seasonSize * pattern[monthOf(s)] + 0.8 * z() + (m === 30 ? 15 : 0));
  }
  return { x, y };
}

describe('decompose (adaptive) against cvxopt (Debian python3-cvxopt QP solver), invented seeded series', () => {
  const fx = loadFixture('decompose_cvxopt');
  for (const c of fx.cases) {
    test(`${c.name}: same optimum (objective to 1e-9 relative, fit to 1e-6 of sd y)`, () => {
      const s = c.weighted ? seriesFromArrays(c.x, c.y, c.w) : seriesFromArrays(c.x, c.y);
      const r = decompose(s, { period: c.period, season: 'on', order: c.order, penalty: c.penalty, spikePenalty: c.spikePenalty, dates: false, tolerance: 1e-10 });
      expect(r.solver.converged).toBe(true);
      const w = Float64Array.from(c.w as number[]);
      const d = differenceOperator(r.x, c.order + 1, r.trend);
      let obj = 0;
      for (let i = 0; i < r.x.length; i++) obj += 0.5 * w[i] * (r.y[i] - r.trend[i] - r.season[i] - r.spikes[i]) ** 2 + c.spikePenalty * Math.abs(r.spikes[i]);
      for (let j = 0; j < d.length; j++) obj += c.penalty * Math.abs(d[j]);
      // cvxopt stops at a relative gap of about 1e-12; our solution is exact up to the solver tolerance
      expect(Math.abs(obj - c.objective) / c.objective).toBeLessThan(1e-9);
      // the fit t + s + o is unique (the loss is strictly convex in it)
      const fit = Float64Array.from(r.x, (_, i) => r.trend[i] + r.season[i] + r.spikes[i]);
      const ref = Float64Array.from(r.x, (_, i) => c.trend[i] + c.season[i] + c.spikes[i]);
      const sd = Math.sqrt(c.y.reduce((a: number, v: number) => a + (v - c.y.reduce((p: number, q: number) => p + q, 0) / c.y.length) ** 2, 0) / c.y.length);
      expect(maxAbsDiff(fit, ref) / sd).toBeLessThan(1e-6);
      expect(maxAbsDiff(r.season, c.season) / sd).toBeLessThan(1e-5);
    });
  }
});

describe('decompose (adaptive): optimality conditions of the joint problem on invented data', () => {
  test('monthly costs with an outlier and blank months: KKT holds; the outlier is a spike; the season is the calendar month', () => {
    const { x, y } = monthlyCosts(31, 1, [10, 11, 47]);
    const s = seriesFromArrays(x, y);
    const r = decompose(s);
    expect(r.spacing).toBe('monthly');
    expect(r.seasonal).toBe(true);
    const phase = Int32Array.from(x, monthOf);
    expectOptimal(r, s.w, 1, cycleColumns(phase, 12));
    // the outlier (month 30 = July 2017) is a spike, and the spike is most of it
    const at = x.indexOf(firstOfMonth(30));
    expect(r.spikeIndex).toContain(at);
    expect(r.spikes[at]).toBeGreaterThan(8);
    // blank months keep their phase: the season depends on the calendar month only
    for (let i = 0; i < x.length; i++) for (let j = 0; j < x.length; j++) if (phase[i] === phase[j]) expect(Math.abs(r.season[i] - r.season[j])).toBeLessThan(1e-12);
    // components add up
    for (let i = 0; i < x.length; i++) expect(Math.abs(r.trend[i] + r.season[i] + r.spikes[i] + r.remainder[i] - y[i])).toBeLessThan(1e-9);
  });

  test('weekly orders over four years: a yearly Fourier season of 52.18 weeks; KKT holds (weights)', () => {
    const z = normalStream(41);
    const x: number[] = [], y: number[] = [], w: number[] = [];
    for (let i = 0; i < 208; i++) {
      const d = 42006 + 7 * i; // Mondays from 2015-01-05
      x.push(d);
      y.push(100 + 0.05 * i + (i > 120 ? -10 : 0) + 8 * Math.sin((2 * Math.PI * d) / 365.2425) + 3 * Math.cos((4 * Math.PI * d) / 365.2425) + 1.5 * z());
      w.push(1 + (i % 3));
    }
    const s = seriesFromArrays(x, y, w);
    const r = decompose(s);
    expect(r.spacing).toBe('weekly');
    expect(r.seasons.map((q) => q.label)).toEqual(['yearly']);
    expect(r.seasons[0].length).toBeCloseTo(52.18, 2);
    expect(r.seasonal).toBe(true);
    expectOptimal(r, s.w, 1, fourierColumns(s.x, 365.2425, 10));
  });

  test('daily tickets over two years with weekends left blank: weekday and yearly terms, phases from the dates; KKT holds', () => {
    const z = normalStream(51);
    const effect = [0, -6, -3, 0, 2, 7, 0];
    const x: number[] = [], y: number[] = [];
    for (let d = 0; d < 760; d++) {
      const serial = 42370 + d; // from 2016-01-01
      const wd = weekdayOf(serial);
      if (wd === 0 || wd === 6) continue; // no data at weekends
      x.push(serial);
      y.push(40 + 0.01 * d + (d > 400 ? 5 : 0) + effect[wd] + 4 * Math.sin((2 * Math.PI * serial) / 365.2425) + z());
    }
    const s = seriesFromArrays(x, y);
    const r = decompose(s);
    expect(r.spacing).toBe('daily');
    expect(r.seasons.map((q) => q.label)).toEqual(['weekday', 'yearly']);
    const phase = Int32Array.from(x, weekdayOf);
    const cols = [...cycleColumns(phase, 7), ...(r.seasons[1].kept ? fourierColumns(s.x, 365.2425, 10) : [])];
    expect(r.seasons[0].kept).toBe(true);
    expectOptimal(r, s.w, 1, cols);
    // the weekday effects are recovered up to noise (Friday minus Monday is 13)
    const fri = x.findIndex((v) => weekdayOf(v) === 5), mon = x.findIndex((v) => weekdayOf(v) === 1);
    expect(Math.abs(r.seasons[0].values[fri] - r.seasons[0].values[mon] - 13)).toBeLessThan(0.5);
    // the solver finished by its active-set method: an exact solve on the knots and spikes was taken as a
    // point and confirmed by a plain step, in a few steps (block coordinate descent alone took tens here)
    expect(r.solver.stoppingRule).toMatch(/exact solves on the knots and spikes of a step \([1-9]\d* taken/);
    expect(r.solver.iterations).toBeLessThanOrEqual(6);
  });
});

describe('decompose: whether there is a season (seasonal strength, threshold 0.64)', () => {
  test('a monthly trend with noise and no season: strength low, no season removed, and the result says so', () => {
    const { x, y } = monthlyCosts(61, 0);
    const r = decompose(seriesFromArrays(x, y));
    expect(r.seasons).toHaveLength(1);
    expect(r.seasons[0].strength).toBeLessThan(0.64);
    expect(r.seasonal).toBe(false);
    expect(maxAbsDiff(r.season, new Float64Array(x.length))).toBe(0);
    expect(r.warnings.some((w) => /strength 0\.\d\d < 0\.64/.test(w.message))).toBe(true);
  });
  test('the same series with its yearly pattern: strength high, season kept', () => {
    const { x, y } = monthlyCosts(61, 1);
    const r = decompose(seriesFromArrays(x, y));
    expect(r.seasons[0].strength).toBeGreaterThan(0.64);
    expect(r.seasonal).toBe(true);
  });
  test("season: 'off' and plain x without a period give no season", () => {
    const { x, y } = monthlyCosts(61, 1);
    expect(decompose(seriesFromArrays(x, y), { season: 'off' }).seasons).toHaveLength(0);
    const r = decompose(seriesFromArrays(x.map((_, i) => i + 1), y));
    expect(r.seasons).toHaveLength(0);
    expect(r.warnings.some((w) => /no period was given/.test(w.message))).toBe(true);
  });
});

describe('decompose: spikes by the universal threshold', () => {
  test('pure noise around a line marks at most one point a spike (n = 300)', () => {
    const z = normalStream(71);
    const x = Array.from({ length: 300 }, (_, i) => i + 1);
    const y = x.map((v) => 5 + 0.02 * v + z());
    const r = decompose(seriesFromArrays(x, y));
    expect(r.spikeIndex.length).toBeLessThanOrEqual(1);
    expect(r.spikePenalty).toBeCloseTo(r.noiseScale * Math.sqrt(2 * Math.log(300)), 10);
  });
});

describe("decompose (method 'stl') is STL: R's stats::stl on co2", () => {
  test('co2 with R settings through decompose equals R', () => {
    const c = loadFixture('stl_r').cases.find((k: any) => k.name === 'co2-s7');
    const x = c.y.map((_: number, i: number) => i + 1);
    const { period, ...stlOptions } = c.options;
    const r = decompose(seriesFromArrays(x, c.y), { method: 'stl', period, stl: stlOptions });
    expect(maxAbsDiff(r.trend, c.trend)).toBeLessThan(1e-10);
    expect(maxAbsDiff(r.season, c.seasonal)).toBeLessThan(1e-10);
    expect(r.seasons[0].strength).toBeGreaterThan(0.64);
  });
});

describe('seasonalAdjustment', () => {
  test('returns the series without its season and the spike positions, with a note', () => {
    const { x, y } = monthlyCosts(31);
    const s = seriesFromArrays(x, y);
    const a = seasonalAdjustment(s);
    const r = decompose(s);
    expect(a.seasonal).toBe(true);
    expect(a.period).toEqual([12]);
    expect(maxAbsDiff(a.adjusted, Float64Array.from(y, (v, i) => v - r.season[i]))).toBe(0);
    expect(a.spikes).toEqual(r.spikeIndex);
    expect(a.note).toMatch(/without its month of year season \(strength 0\.\d\d\) and without \d+ spike/);
    // adjusted has no yearly pattern left: its month means differ by much less than the planted 7
    const sums = new Array(12).fill(0), counts = new Array(12).fill(0);
    a.despiked.forEach((v, i) => { sums[monthOf(x[i])] += v - r.trend[i]; counts[monthOf(x[i])]++; });
    const means = sums.map((v, i) => v / counts[i]);
    expect(Math.max(...means) - Math.min(...means)).toBeLessThan(1.5);
  });
});

describe('decompose: input checks', () => {
  test('bad options name the value', () => {
    const { x, y } = monthlyCosts(31);
    const s = seriesFromArrays(x, y);
    expect(() => decompose(s, { method: 'x13' as any })).toThrow(/method must be one of "adaptive", "stl"; got "x13"/);
    expect(() => decompose(s, { period: 1 })).toThrow(/period must be a number of steps >= 2; got 1/);
    expect(() => decompose(s, { spikePenalty: -1 })).toThrow(KnotwiseError);
    expect(() => decompose(s, { season: 'maybe' as any })).toThrow(/season must be one of/);
  });
  test('a period on x off any grid is refused with the offending x', () => {
    const x = [1, 2, 3.25, 4, 5, 6, 7, 8, 9, 10, 11, 12];
    expect(() => decompose(seriesFromArrays(x, x), { period: 4 })).toThrow(/x = 2 is not a whole number of steps of 0.75/);
  });
  test('blank rows from cells keep their phase (prepareSeries drops them; the phase comes from x)', () => {
    const { x, y } = monthlyCosts(31);
    const yc: (number | null)[] = y.slice();
    yc[5] = null;
    yc[17] = null;
    const s = prepareSeries(yc, x);
    const r = decompose(s);
    const full = decompose(seriesFromArrays(x, y));
    expect(r.x.length).toBe(x.length - 2);
    // each month's season stays that month's season
    const byMonth = (res: DecomposeResult) => { const m = new Map<number, number>(); res.x.forEach((v, i) => m.set(monthOf(v), res.season[i])); return m; };
    const a = byMonth(r), b = byMonth(full);
    for (let m = 0; m < 12; m++) expect(Math.abs(a.get(m)! - b.get(m)!)).toBeLessThan(0.5);
  });
});

describe('decompose (adaptive): the trend knots merged into bends, as the knots table of a trend fit', () => {
  // invented monthly costs (monthlyCosts above): the slope rises by 0.4 per month after month 60, noise sd 0.8
  test('the largest bend is the planted kink on most seeds, with its size measured on the unpenalised refit', () => {
    const perDay = 0.4 / ((firstOfMonth(72) - firstOfMonth(60)) / 12);
    let found = 0;
    for (let seed = 1; seed <= 8; seed++) {
      const { x, y } = monthlyCosts(seed);
      const r = decompose(seriesFromArrays(x, y));
      expect(r.bends.length).toBeGreaterThan(0);
      expect(r.bends.length).toBeLessThanOrEqual(r.knots.length);
      expect(r.bends.reduce((a, b) => a + b.knots, 0)).toBe(r.knots.length);
      const top = r.bends.find((b) => b.rank === 1)!;
      if (Math.abs(top.x - firstOfMonth(60)) > 95) continue; // not within 3 months
      found++;
      expect(Math.abs(top.change / perDay - 1)).toBeLessThan(0.35); // honest size within 35% of the planted change
    }
    // measured: 6 of 8 (on seeds 4 and 8 cross-validation chose a wiggly trend of 14 and 10 knots)
    expect(found).toBeGreaterThanOrEqual(6);
  });
});
