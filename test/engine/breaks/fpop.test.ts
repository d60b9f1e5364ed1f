/**
 * FPOP must return the optimal segmentation: for the Gaussian loss the same as PELT
 * and exhaustive optimal partitioning (Jackson et al. 2005) on the change-in-mean cost;
 * for the biweight loss the same as optimal partitioning with each segment's cost
 * minimised here by brute force (every stationary point and every kink of the
 * piecewise-quadratic segment cost is tried).
 */
import { fpop } from '../../../src/engine/breaks/fpop';
import { pelt } from '../../../src/engine/breaks/pelt';
import { optimalPartitioning } from '../../../src/engine/breaks/optimalPartitioning';
import { meanCost } from '../../../src/engine/breaks/costMean';
import type { SegmentCost } from '../../../src/engine/breaks/segmentCost';
import { PiecewiseQuadratic } from '../../../src/engine/breaks/piecewiseQuadratic';
import { mulberry32, normalStream } from '../../helpers/random';

function steps(n: number, seed: number, outliers = 0): Float64Array {
  const u = mulberry32(seed);
  const z = normalStream(seed + 500);
  const y = new Float64Array(n);
  let level = 0;
  for (let i = 0; i < n; i++) {
    if (u() < 0.05) level = 6 * (u() - 0.5);
    y[i] = level + z();
    if (u() < outliers) y[i] += (u() < 0.5 ? -1 : 1) * (5 + 10 * u());
  }
  return y;
}

const ones = (n: number): Float64Array => new Float64Array(n).fill(1);

/** Exact biweight segment cost by brute force: the minimum is at a stationary point of some piece (a mean of points sorted next to each other) or at a kink z_i +- K. */
function biweightCost(y: Float64Array, w: Float64Array, K: number): SegmentCost {
  const f = (s: number, t: number, mu: number): number => {
    let v = 0;
    for (let i = s; i < t; i++) { const d = y[i] - mu; v += w[i] * Math.min(d * d, K * K); }
    return v;
  };
  const memo = new Map<number, number>();
  return {
    n: y.length,
    cost(s: number, t: number): number {
      const key = s * 100000 + t;
      const hit = memo.get(key);
      if (hit !== undefined) return hit;
      const idx = Array.from({ length: t - s }, (_, i) => s + i).sort((a, b) => y[a] - y[b]);
      let best = Infinity;
      for (let i = 0; i < idx.length; i++) {
        let W = 0, S = 0;
        for (let j = i; j < idx.length; j++) {
          W += w[idx[j]]; S += w[idx[j]] * y[idx[j]];
          best = Math.min(best, f(s, t, S / W));
        }
        best = Math.min(best, f(s, t, y[idx[i]] - K), f(s, t, y[idx[i]] + K));
      }
      memo.set(key, best);
      return best;
    },
  };
}

describe('fpop with the Gaussian loss equals PELT and optimal partitioning', () => {
  test.each(Array.from({ length: 20 }, (_, i) => 3 + 11 * i))('seed %i', (seed) => {
    const n = 300;
    const y = steps(n, seed);
    const u = mulberry32(seed + 9);
    const w = Float64Array.from({ length: n }, () => 0.5 + u());
    const cost = meanCost(y, w, 1, 0);
    for (const beta of [2 * Math.log(n), 0.5, 40]) {
      const a = fpop(y, w, { kind: 'square' }, beta, 1);
      const b = pelt(cost, beta, 1);
      expect(a.changes).toEqual(b.changes);
      expect(Math.abs(a.penalisedCost - b.penalisedCost)).toBeLessThanOrEqual(1e-9 * (1 + Math.abs(b.penalisedCost)));
      // levels are the weighted segment means
      const bounds = [0, ...a.changes, n];
      for (let k = 0; k < a.levels.length; k++) {
        let W = 0, S = 0;
        for (let i = bounds[k]; i < bounds[k + 1]; i++) { W += w[i]; S += w[i] * y[i]; }
        expect(a.levels[k]).toBeCloseTo(S / W, 9);
      }
    }
  });

  test('with a minimum segment length and a mask of allowed starts, as optimal partitioning', () => {
    for (let seed = 1; seed <= 12; seed++) {
      const n = 150;
      const y = steps(n, seed * 7);
      const w = ones(n);
      const u = mulberry32(seed);
      const allowed = Uint8Array.from({ length: n }, (_, i) => (i === 0 || u() < 0.8 ? 1 : 0));
      const cost = meanCost(y, w, 1, 0);
      for (const m of [1, 2, 5]) {
        const a = fpop(y, w, { kind: 'square' }, 6, m, allowed);
        const b = optimalPartitioning(cost, 6, m, allowed);
        expect(a.changes).toEqual(b.changes);
        expect(a.penalisedCost).toBeCloseTo(b.penalisedCost, 8);
      }
    }
  });
});

describe('fpop with the biweight loss equals optimal partitioning of the biweight cost', () => {
  test.each(Array.from({ length: 8 }, (_, i) => 5 + 13 * i))('seed %i (outliers planted)', (seed) => {
    const n = 45;
    const y = steps(n, seed, 0.08);
    const u = mulberry32(seed + 1);
    const w = Float64Array.from({ length: n }, () => 0.5 + u());
    const cost = biweightCost(y, w, 3);
    for (const m of [1, 3]) {
      const a = fpop(y, w, { kind: 'biweight', K: 3 }, 2 * Math.log(n), m);
      const b = optimalPartitioning(cost, 2 * Math.log(n), m);
      expect(a.changes).toEqual(b.changes);
      expect(Math.abs(a.penalisedCost - b.penalisedCost)).toBeLessThanOrEqual(1e-9 * (1 + Math.abs(b.penalisedCost)));
    }
  });

  test('one value 1e155 noise scales away neither moves the levels nor makes a segment of its own', () => {
    const y = steps(200, 77);
    const clean = fpop(y, ones(200), { kind: 'biweight', K: 3 }, 2 * Math.log(200), 1);
    y[120] = 1e155;
    const r = fpop(y, ones(200), { kind: 'biweight', K: 3 }, 2 * Math.log(200), 1);
    expect(r.changes).toEqual(clean.changes);
    expect(Number.isFinite(r.penalisedCost)).toBe(true);
  });
});

describe('PiecewiseQuadratic operations against pointwise evaluation', () => {
  test('biweight sums, minima with constants and with another function', () => {
    const u = mulberry32(42);
    const A = new PiecewiseQuadratic(-10, 10, 0, 0);
    const pts: number[] = [];
    for (let i = 0; i < 30; i++) { const z = 8 * (u() - 0.5); pts.push(z); A.addBiweight(z, 1, 2); }
    const B = new PiecewiseQuadratic(-10, 10, 3, 1);
    for (let i = 0; i < 10; i++) B.addSquare(4 * (u() - 0.5), 0.3);
    const at = (mu: number): number => pts.reduce((s, z) => s + Math.min((z - mu) ** 2, 4), 0);
    for (let mu = -10; mu < 10; mu += 0.173) expect(A.valueAt(mu)).toBeCloseTo(at(mu), 9);
    const bAt = Array.from({ length: 116 }, (_, k) => B.valueAt(-10 + 0.173 * k));
    const C = A.clone();
    C.minWith(B);
    for (let k = 0; k < 116; k++) { const mu = -10 + 0.173 * k; expect(C.valueAt(mu)).toBeCloseTo(Math.min(at(mu), bAt[k]), 9); }
    A.minConstant(40, 2);
    for (let mu = -10; mu < 10; mu += 0.173) expect(A.valueAt(mu)).toBeCloseTo(Math.min(at(mu), 40), 9);
  });
});
