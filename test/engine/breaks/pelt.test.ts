/**
 * PELT must return exactly the optimal segmentation, which exhaustive optimal
 * partitioning (Jackson et al. 2005) finds by checking every last change: Killick,
 * Fearnhead & Eckley (2012, JASA) prove the two agree when the cost satisfies
 * C(a,b) + C(b,c) <= C(a,c) (K = 0), as every cost here does.
 */
import { pelt } from '../../../src/engine/breaks/pelt';
import { optimalPartitioning } from '../../../src/engine/breaks/optimalPartitioning';
import { meanCost } from '../../../src/engine/breaks/costMean';
import { meanVarCost } from '../../../src/engine/breaks/costMeanVar';
import { poissonCost } from '../../../src/engine/breaks/costPoisson';
import { distributionCost } from '../../../src/engine/breaks/costDistribution';
import { totalCost, type SegmentCost } from '../../../src/engine/breaks/segmentCost';
import { mulberry32, normalStream, poissonStream } from '../../helpers/random';

/** Piecewise-constant levels with random change positions. */
function steps(n: number, seed: number): Float64Array {
  const u = mulberry32(seed);
  const lv = new Float64Array(n);
  let level = 0;
  for (let i = 0; i < n; i++) {
    if (u() < 0.04) level = 3 * (u() - 0.5) * 2;
    lv[i] = level;
  }
  return lv;
}

function gaussian(n: number, seed: number, varying: boolean): Float64Array {
  const lv = steps(n, seed);
  const z = normalStream(seed + 1000);
  const u = mulberry32(seed + 2000);
  let sd = 1;
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (varying && u() < 0.03) sd = 0.3 + 2 * u();
    y[i] = lv[i] + sd * z();
  }
  return y;
}

const ones = (n: number): Float64Array => new Float64Array(n).fill(1);

function expectSame(cost: SegmentCost, beta: number, minSeg: number, allowed?: Uint8Array): number {
  const a = pelt(cost, beta, minSeg, allowed);
  const b = optimalPartitioning(cost, beta, minSeg, allowed);
  expect(a.changes).toEqual(b.changes);
  expect(Math.abs(a.penalisedCost - b.penalisedCost)).toBeLessThanOrEqual(1e-9 * (1 + Math.abs(b.penalisedCost)));
  // the reported cost is the sum of the segment costs
  expect(a.cost).toBeCloseTo(totalCost(cost, a.changes), 8);
  expect(a.penalisedCost).toBeCloseTo(a.cost + beta * a.changes.length, 8);
  for (let k = 0; k <= a.changes.length; k++) {
    const s = k === 0 ? 0 : a.changes[k - 1];
    const e = k === a.changes.length ? cost.n : a.changes[k];
    expect(e - s).toBeGreaterThanOrEqual(minSeg);
  }
  return a.evaluations / b.evaluations;
}

describe('pelt', () => {
  const seeds = Array.from({ length: 25 }, (_, i) => 11 + 7 * i);

  test('matches optimal partitioning for the change-in-mean cost on 25 seeded series, several penalties and minSegment', () => {
    for (const seed of seeds) {
      const y = gaussian(300, seed, false);
      const c = meanCost(y, ones(300), 1, 0);
      for (const beta of [0.5, 2 * Math.log(300), 30]) for (const m of [1, 3, 10]) expectSame(c, beta, m);
    }
  });

  test('matches optimal partitioning for the change-in-mean-and-variance cost', () => {
    for (const seed of seeds) {
      const y = gaussian(250, seed, true);
      const c = meanVarCost(y, ones(250), 0, 1);
      for (const beta of [3 * Math.log(250), 10]) for (const m of [2, 5]) expectSame(c, beta, m);
    }
  });

  test('matches optimal partitioning for the Poisson cost', () => {
    for (const seed of seeds) {
      const lv = steps(300, seed);
      const draw = poissonStream(seed + 5);
      const y = Float64Array.from(lv, (l) => draw(Math.exp(l / 2) * 3));
      const c = poissonCost(y, ones(300));
      for (const beta of [2 * Math.log(300), 5]) for (const m of [1, 4]) expectSame(c, beta, m);
    }
  });

  test('matches optimal partitioning for the empirical-distribution cost', () => {
    for (const seed of seeds) {
      const y = gaussian(200, seed, true);
      const c = distributionCost(y, 10);
      for (const beta of [2 * Math.log(200), 3 * Math.log(200)]) for (const m of [1, 5]) expectSame(c, beta, m);
    }
  });

  test('matches optimal partitioning with weights and with changes forbidden inside tied x', () => {
    for (const seed of seeds.slice(0, 10)) {
      const n = 200;
      const y = gaussian(n, seed, false);
      const u = mulberry32(seed + 9);
      const w = Float64Array.from({ length: n }, () => 0.5 + 2 * u());
      const allowed = new Uint8Array(n);
      for (let i = 1; i < n; i++) allowed[i] = u() < 0.7 ? 1 : 0;
      expectSame(meanCost(y, w, 1, 0), 2 * Math.log(n), 1, allowed);
      expectSame(meanVarCost(y, w, 0, 1), 3 * Math.log(n), 2, allowed);
      const seg = pelt(meanCost(y, w, 1, 0), 2 * Math.log(n), 1, allowed);
      for (const c of seg.changes) expect(allowed[c]).toBe(1);
    }
  });

  test('the inlined squared-error path returns what the generic loop returns', () => {
    for (const seed of seeds) {
      const y = gaussian(400, seed, false);
      const c = meanCost(y, ones(400), 1, 0);
      const generic: SegmentCost = { n: c.n, cost: (s, t) => c.cost(s, t) };
      expect(c.squaredErrorSums).toBeDefined();
      for (const beta of [1, 2 * Math.log(400), 25]) {
        const a = pelt(c, beta, 1);
        const b = pelt(generic, beta, 1);
        expect(a.changes).toEqual(b.changes);
        expect(a.penalisedCost).toBeCloseTo(b.penalisedCost, 9);
      }
    }
  });

  test('prunes: evaluates far fewer segment costs than optimal partitioning when changes are frequent', () => {
    const y = gaussian(3000, 5, false);
    const ratio = expectSame(meanCost(y, ones(3000), 1, 0), 2 * Math.log(3000), 1);
    expect(ratio).toBeLessThan(0.2);
  });
});
