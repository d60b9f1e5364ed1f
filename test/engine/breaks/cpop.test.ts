/**
 * CPOP must return the exact minimiser of RSS + beta * kinks over continuous
 * piecewise-linear fits with kinks at data points (Fearnhead, Maidstone & Letchford
 * 2019, JCGS). Checked against brute force over every kink set on small n, and
 * against an independent least-squares fit for the kinks it returns.
 */
import { cpop } from '../../../src/engine/breaks/cpop';
import { findBreaks } from '../../../src/engine/breaks/findBreaks';
import { prepareSeries } from '../../../src/engine/series';
import { mulberry32, normalStream } from '../../helpers/random';

/** Solves the small dense system A v = b by Gaussian elimination with partial pivoting (test-only). */
function solveDense(A: number[][], b: number[]): number[] {
  const n = b.length;
  const M = A.map((r, i) => [...r, b[i]]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(M[r][c]) > Math.abs(M[p][c])) p = r;
    [M[c], M[p]] = [M[p], M[c]];
    for (let r = c + 1; r < n; r++) {
      const f = M[r][c] / M[c][c];
      for (let k = c; k <= n; k++) M[r][k] -= f * M[c][k];
    }
  }
  const v = new Array(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = M[r][n];
    for (let k = r + 1; k < n; k++) s -= M[r][k] * v[k];
    v[r] = s / M[r][r];
  }
  return v;
}

/** Least-squares broken line with knots at the given indices (ends included): values at the knots and the RSS. */
function brokenLineFit(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number>, knots: number[]): { values: number[]; rss: number } {
  const k = knots.length;
  const A = Array.from({ length: k }, () => new Array(k).fill(0));
  const b = new Array(k).fill(0);
  const basis = (i: number): [number, number, number] => {
    let j = 0;
    while (j < k - 2 && x[i] > x[knots[j + 1]]) j++;
    const u = (x[i] - x[knots[j]]) / (x[knots[j + 1]] - x[knots[j]]);
    return [j, 1 - u, u];
  };
  for (let i = 0; i < x.length; i++) {
    const [j, a0, a1] = basis(i);
    A[j][j] += w[i] * a0 * a0; A[j][j + 1] += w[i] * a0 * a1; A[j + 1][j] += w[i] * a0 * a1; A[j + 1][j + 1] += w[i] * a1 * a1;
    b[j] += w[i] * a0 * y[i]; b[j + 1] += w[i] * a1 * y[i];
  }
  const values = solveDense(A, b);
  let rss = 0;
  for (let i = 0; i < x.length; i++) {
    const [j, a0, a1] = basis(i);
    const r = y[i] - a0 * values[j] - a1 * values[j + 1];
    rss += w[i] * r * r;
  }
  return { values, rss };
}

/** Brute force: every kink set among interior points with gaps >= minSeg. */
function bruteForce(x: Float64Array, y: Float64Array, w: Float64Array, beta: number, minSeg: number): { changes: number[]; value: number } {
  const n = x.length;
  let best = { changes: [] as number[], value: Infinity };
  const interior = n - 2;
  for (let mask = 0; mask < 1 << interior; mask++) {
    const ch: number[] = [];
    for (let i = 0; i < interior; i++) if (mask & (1 << i)) ch.push(i + 1);
    const knots = [0, ...ch, n - 1];
    let ok = true;
    for (let k = 1; k < knots.length; k++) if (knots[k] - knots[k - 1] < minSeg) ok = false;
    if (!ok) continue;
    const v = brokenLineFit(x, y, w, knots).rss + beta * ch.length;
    if (v < best.value - 1e-12) best = { changes: ch, value: v };
  }
  return best;
}

function kinked(n: number, seed: number, noise: number): { x: Float64Array; y: Float64Array } {
  const u = mulberry32(seed);
  const z = normalStream(seed + 1);
  const x = new Float64Array(n);
  let xi = 0;
  for (let i = 0; i < n; i++) { xi += 0.5 + u(); x[i] = xi; }
  const y = new Float64Array(n);
  let slope = 2 * (u() - 0.5), level = 0;
  for (let i = 0; i < n; i++) {
    if (i > 0) level += slope * (x[i] - x[i - 1]);
    if (u() < 0.2) slope = 4 * (u() - 0.5);
    y[i] = level + noise * z();
  }
  return { x, y };
}

describe('cpop', () => {
  test('matches brute force over every kink set on 60 small seeded series (n = 11)', () => {
    let withKinks = 0;
    for (let seed = 1; seed <= 60; seed++) {
      const { x, y } = kinked(11, seed, 0.3);
      const u = mulberry32(seed + 77);
      const w = Float64Array.from({ length: 11 }, () => (seed % 2 ? 1 : 0.5 + u()));
      const wyy = Float64Array.from(y, (v, i) => w[i] * v * v);
      const span = x[10] - x[0];
      const xs = Float64Array.from(x, (v) => (v - x[0]) / span);
      for (const beta of [0.2, 1, 4]) {
        for (const m of [1, 2]) {
          const r = cpop(xs, y, w, wyy, beta, m);
          const bf = bruteForce(xs, y, w, beta, m);
          expect(r.penalisedCost).toBeCloseTo(bf.value, 8);
          expect(r.changes).toEqual(bf.changes);
          if (r.changes.length) withKinks++;
        }
      }
    }
    expect(withKinks).toBeGreaterThan(100);
  });

  test('gives the same result with and without the bound-based discarding (300 points, 30 series)', () => {
    for (let seed = 100; seed < 130; seed++) {
      const { x, y } = kinked(300, seed, 0.2 + (seed % 5) * 0.3);
      const w = Float64Array.from({ length: 300 }, (_, i) => 1 + (i % 3) * 0.5);
      const wyy = Float64Array.from(y, (v, i) => w[i] * v * v);
      const xs = Float64Array.from(x, (v) => (v - x[0]) / (x[299] - x[0]));
      for (const beta of [1, 2 * Math.log(300), 40]) {
        const m = seed % 3 === 0 ? 5 : 1;
        const a = cpop(xs, y, w, wyy, beta, m, true);
        const b = cpop(xs, y, w, wyy, beta, m, false);
        expect(a.changes).toEqual(b.changes);
        expect(a.penalisedCost).toBeCloseTo(b.penalisedCost, 7);
      }
    }
  });

  test('matches brute force without the bound too (n = 10, 30 series)', () => {
    for (let seed = 200; seed < 230; seed++) {
      const { x, y } = kinked(10, seed, 0.3);
      const w = new Float64Array(10).fill(1);
      const wyy = Float64Array.from(y, (v) => v * v);
      const xs = Float64Array.from(x, (v) => (v - x[0]) / (x[9] - x[0]));
      for (const beta of [0.3, 2]) {
        const r = cpop(xs, y, w, wyy, beta, 1, false);
        const bf = bruteForce(xs, y, w, beta, 1);
        expect(r.changes).toEqual(bf.changes);
        expect(r.penalisedCost).toBeCloseTo(bf.value, 8);
      }
    }
  });

  test('with a spent work budget returns a feasible continuous line flagged not exact', () => {
    const { x, y } = kinked(2000, 9, 0.5);
    const w = new Float64Array(2000).fill(1);
    const wyy = Float64Array.from(y, (v) => v * v);
    const xs = Float64Array.from(x, (v) => (v - x[0]) / (x[1999] - x[0]));
    const beta = 2 * Math.log(2000);
    const exact = cpop(xs, y, w, wyy, beta, 1);
    expect(exact.exact).toBe(true);
    const cut = cpop(xs, y, w, wyy, beta, 1, true, 1000);
    expect(cut.exact).toBe(false);
    expect(cut.penalisedCost).toBeGreaterThanOrEqual(exact.penalisedCost - 1e-8);
    // its cost is the least-squares cost of its own kinks: a real, feasible line
    const ls = brokenLineFit(xs, y, w, [0, ...cut.changes, 1999]);
    expect(cut.cost).toBeCloseTo(ls.rss, 6);
  });

  test('returns knot values that are the least-squares broken line for its kinks (normal equations), n = 600', () => {
    const { x, y } = kinked(600, 3, 0.5);
    const w = new Float64Array(600).fill(1);
    const wyy = Float64Array.from(y, (v) => v * v);
    const xs = Float64Array.from(x, (v) => (v - x[0]) / (x[599] - x[0]));
    const r = cpop(xs, y, w, wyy, 2 * Math.log(600) * 0.25, 1);
    expect(r.changes.length).toBeGreaterThan(3);
    const ls = brokenLineFit(xs, y, w, [0, ...r.changes, 599]);
    for (let k = 0; k < ls.values.length; k++) expect(r.knotValues[k]).toBeCloseTo(ls.values[k], 6);
    expect(r.cost).toBeCloseTo(ls.rss, 6);
    // no single kink removed or moved by one point does better
    const base = r.penalisedCost;
    const beta = 2 * Math.log(600) * 0.25;
    for (let k = 0; k < r.changes.length; k++) {
      const without = r.changes.filter((_, j) => j !== k);
      expect(brokenLineFit(xs, y, w, [0, ...without, 599]).rss + beta * without.length).toBeGreaterThanOrEqual(base - 1e-8);
      for (const d of [-1, 1]) {
        const moved = r.changes.map((c, j) => (j === k ? c + d : c));
        if (new Set(moved).size < moved.length || moved[k] <= 0 || moved[k] >= 599) continue;
        const sorted = [...moved].sort((a, b) => a - b);
        expect(brokenLineFit(xs, y, w, [0, ...sorted, 599]).rss + beta * sorted.length).toBeGreaterThanOrEqual(base - 1e-8);
      }
    }
  });
});

describe('findBreaks slope model', () => {
  test('recovers two kinks of a continuous trend and returns a continuous broken line', () => {
    const n = 400;
    const z = normalStream(42);
    const truth = [130, 270];
    const y: number[] = [];
    for (let i = 0; i < n; i++) {
      const f = i < 130 ? 0.05 * i : i < 270 ? 6.5 - 0.04 * (i - 130) : 0.9 + 0.08 * (i - 270);
      y.push(f + 0.5 * z());
    }
    const r = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model: 'slope', penalty: 'bic' });
    expect(r.breaks.length).toBe(2);
    r.breaks.forEach((b, k) => expect(Math.abs(b.index - truth[k])).toBeLessThanOrEqual(10));
    // continuity: the lines either side meet at each kink
    for (const b of r.breaks) {
      const left = b.before.slope * b.x + b.before.intercept;
      const right = b.after.slope * b.x + b.after.intercept;
      expect(Math.abs(left - right)).toBeLessThan(1e-8 * (1 + Math.abs(left)));
      expect(r.fitted[b.index]).toBeCloseTo(left, 8);
    }
    // within a segment the fitted values are on one line (second differences vanish)
    for (const s of r.segments) {
      for (let i = s.start + 1; i < s.end; i++) expect(Math.abs(r.fitted[i + 1] - 2 * r.fitted[i] + r.fitted[i - 1])).toBeLessThan(1e-9);
    }
    // no jump anywhere: neighbouring fitted values differ by no more than the steepest slope
    const maxSlope = Math.max(...r.segments.map((s) => Math.abs(s.slope)));
    for (let i = 1; i < n; i++) expect(Math.abs(r.fitted[i] - r.fitted[i - 1])).toBeLessThanOrEqual(maxSlope + 1e-9);
    // cost is RSS / sigma^2 of the fitted line
    let rss = 0;
    for (let i = 0; i < n; i++) rss += (y[i] - r.fitted[i]) ** 2;
    expect(r.cost).toBeCloseTo(rss / r.sigma!.value ** 2, 6);
    expect(r.warnings.some((w) => w.code === 'break-cause')).toBe(true);
    expect(r.solver.algorithm).toBe('cpop');
  });

  test('merges tied x into one position and still fits every row', () => {
    const x = [1, 2, 2, 3, 4, 5, 5, 6, 7, 8, 9, 10];
    const y = x.map((v, i) => (v < 6 ? v : 6 - 2 * (v - 6)) + (i % 2 ? 0.01 : -0.01));
    const r = findBreaks(prepareSeries(y, x, null, { ties: 'keep' }), { model: 'slope', penalty: 1, sigma: 0.05 });
    expect(r.fitted.length).toBe(12);
    expect(r.fitted[1]).toBe(r.fitted[2]);
    expect(r.breaks.map((b) => b.x)).toEqual([6]);
  });
});
