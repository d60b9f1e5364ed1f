import { restrictedSplineFit, restrictedSplineStart } from '../../../src/engine/basis/restrictedSplineFit';
import { withoutKnot, solveRestrictedSystem, RestrictedSystem } from '../../../src/engine/basis/restrictedSystem';
import { seededNormal } from '../smoothers/trendTestFunctions';

// uneven x in [0, 1] (the refinement's coordinates), unequal weights, a kinked wave with noise
function data(n: number, seed: number) {
  const rn = seededNormal(seed);
  const x = new Float64Array(n), y = new Float64Array(n), w = new Float64Array(n);
  let c = 0;
  for (let i = 0; i < n; i++) { c += 0.5 + Math.abs(rn()); x[i] = c; }
  for (let i = 0; i < n; i++) {
    x[i] = (x[i] - x[0]) / (c - x[0]);
    y[i] = Math.sin(9 * x[i] * x[i]) + (x[i] > 0.6 ? 2 * (x[i] - 0.6) : 0) + 0.1 * rn();
    w[i] = 1 + (i % 3);
  }
  return { x, y, w };
}

const maxAbs = (v: ArrayLike<number>) => Array.from(v).reduce((m, t) => Math.max(m, Math.abs(t)), 0);

// Tolerances: the kept system is solved without the refinement from the data, so it agrees with a
// solve from the data to the rounding of the assembled Gram matrix times its condition. Measured on
// these designs: at most 3e-14 (order 2) and 2.5e-12 (order 3) of the largest |D b| after a removal,
// 1e-14 with none. The bounds below leave a factor of about 40 to 100.

describe('withoutKnot and solveRestrictedSystem', () => {
  test.each([2, 3])('order %i: removing any one knot from the kept system gives the (D b) on the knots of a solve from the data without it', (k) => {
    const { x, y, w } = data(400, 11 + k);
    const rows = [20, 21, 60, 95, 150, 151, 152, 230, 300, 370];
    const signs = [1, 1, -1, 1, -1, -1, 1, 1, -1, 1];
    const lambda = 1e-7;
    const keep: { system?: RestrictedSystem } = {};
    expect(restrictedSplineFit(x, y, w, k, lambda, rows, signs, undefined, undefined, keep)).not.toBeNull();
    const sys = keep.system!;
    expect(sys.p).toBe(rows.length + k + 1);
    for (let j = 0; j < rows.length; j++) {
      const r2 = rows.filter((_, i) => i !== j), s2 = signs.filter((_, i) => i !== j);
      const direct = restrictedSplineFit(x, y, w, k, lambda, r2, s2)!;
      const reduced = withoutKnot(sys, j)!;
      const dA = solveRestrictedSystem(reduced, lambda, s2)!;
      const scale = maxAbs(direct.dA);
      for (let i = 0; i < r2.length; i++) expect(Math.abs(dA[i] - direct.dA[i])).toBeLessThan(1e-10 * scale);
    }
  });

  test.each([2, 3])('order %i: knots removed one after another (the last first, then the first) agree with the data too', (k) => {
    const { x, y, w } = data(300, 31 + k);
    const rows = [10, 40, 41, 90, 160, 161, 250];
    const signs = [-1, 1, 1, -1, 1, 1, -1];
    const lambda = 3e-7;
    const keep: { system?: RestrictedSystem } = {};
    restrictedSplineFit(x, y, w, k, lambda, rows, signs, undefined, undefined, keep);
    const twice = withoutKnot(withoutKnot(keep.system!, 6)!, 0)!;
    const r2 = rows.slice(1, 6), s2 = signs.slice(1, 6);
    const dA = solveRestrictedSystem(twice, lambda, s2)!;
    const direct = restrictedSplineFit(x, y, w, k, lambda, r2, s2)!;
    const scale = maxAbs(direct.dA);
    for (let i = 0; i < r2.length; i++) expect(Math.abs(dA[i] - direct.dA[i])).toBeLessThan(1e-10 * scale);
  });

  test('the kept system solved as it is gives the solve\'s own (D b) on the knots', () => {
    const { x, y, w } = data(250, 51);
    const rows = [30, 100, 101, 180], signs = [1, -1, -1, 1];
    const keep: { system?: RestrictedSystem } = {};
    const sol = restrictedSplineFit(x, y, w, 3, 2e-7, rows, signs, undefined, undefined, keep)!;
    const dA = solveRestrictedSystem(keep.system!, 2e-7, signs)!;
    const scale = maxAbs(sol.dA);
    for (let i = 0; i < rows.length; i++) expect(Math.abs(dA[i] - sol.dA[i])).toBeLessThan(1e-12 * scale);
  });
});

describe('restrictedSplineStart', () => {
  test.each([1, 2, 3])('order %i: finishing gives bit for bit the solve of restrictedSplineFit, and the unfinished (D b) on the knots is within 1e-12 of the largest of it', (k) => {
    const { x, y, w } = data(400, 41 + k);
    const rows = [20, 21, 60, 95, 150, 230, 300, 370];
    const signs = [1, 1, -1, 1, -1, 1, -1, 1];
    const lambda = 1e-4;
    const ref = restrictedSplineFit(x, y, w, k, lambda, rows, signs)!;
    const st = restrictedSplineStart(x, y, w, k, lambda, rows, signs)!;
    // before the refinement steps: the first solve of the normal equations, as accurate as their assembly
    // (measured on this design: 1.7e-14 of the largest |D b| for order 2, 4e-16 for order 3; order 1 is
    // solved at once, so exact; the bound leaves a factor of about 60)
    const scale = maxAbs(ref.dA);
    for (let j = 0; j < rows.length; j++) expect(Math.abs(st.dA[j] - ref.dA[j])).toBeLessThanOrEqual(1e-12 * scale);
    const done = st.finish();
    expect(Array.from(done.b)).toEqual(Array.from(ref.b));
    expect(Array.from(done.dA)).toEqual(Array.from(ref.dA));
  });
});
