import { Matrix, solve } from 'ml-matrix';
import { bandedCholesky, bandedCholeskySolve, bandedCholeskyRows, bandedCholeskySolveRows } from '../../../src/engine/linalg/bandedCholesky';

describe('bandedCholesky', () => {
  test.each([1, 2, 3, 4])('solves a random SPD band system like a dense solve (half-bandwidth %i)', (p) => {
    const n = 25;
    let s = 17 + p;
    const rnd = () => { s = (s * 48271) % 2147483647; return s / 2147483647 - 0.5; };
    const A = Matrix.zeros(n, n);
    for (let i = 0; i < n; i++) for (let j = Math.max(0, i - p); j < i; j++) { const v = rnd(); A.set(i, j, v); A.set(j, i, v); }
    for (let i = 0; i < n; i++) A.set(i, i, 2 * p + 1 + rnd());
    const band = new Float64Array(n * (p + 1));
    for (let i = 0; i < n; i++) for (let d = 0; d <= p && d <= i; d++) band[i * (p + 1) + d] = A.get(i, i - d);
    expect(bandedCholesky(band, n, p)).toBe(-1);
    const rhs = Float64Array.from({ length: n }, () => rnd());
    const want = solve(A, Matrix.columnVector(Array.from(rhs))).to1DArray();
    const got = bandedCholeskySolve(band, n, p, Float64Array.from(rhs));
    for (let i = 0; i < n; i++) expect(got[i]).toBeCloseTo(want[i], 12);
  });

  test('reports the row of a non-positive pivot', () => {
    const band = Float64Array.of(1, 0, 1, 2); // [[1, 2], [2, 1]] is indefinite
    expect(bandedCholesky(band, 2, 1)).toBe(1);
  });

  test.each([3, 4])('half-bandwidth %i: the unrolled factor and solve give bit for bit the general loops\' results, with and without the pivot floor', (p) => {
    const n = 400;
    let s = 91 + p;
    const rnd = () => { s = (s * 48271) % 2147483647; return s / 2147483647 - 0.5; };
    const band = new Float64Array(n * (p + 1));
    for (let i = 0; i < n; i++) {
      band[i * (p + 1)] = 2 * p + 1 + rnd();
      for (let d = 1; d <= p && d <= i; d++) band[i * (p + 1) + d] = rnd();
    }
    // a nearly singular stretch, where the floor raises pivots
    for (let i = 200; i < 210; i++) for (let d = 0; d <= p; d++) band[i * (p + 1) + d] = d === 0 ? 1e-20 : 0;
    for (const floor of [0, 1e-14]) {
      const a = Float64Array.from(band), g = Float64Array.from(band);
      const ra = bandedCholesky(a, n, p, floor), rg = bandedCholeskyRows(g, n, p, floor);
      expect(ra).toBe(rg);
      expect(Array.from(a)).toEqual(Array.from(g));
      if (ra >= 0) continue;
      const rhs = Float64Array.from({ length: n }, () => rnd());
      expect(Array.from(bandedCholeskySolve(a, n, p, Float64Array.from(rhs)))).toEqual(Array.from(bandedCholeskySolveRows(g, n, p, Float64Array.from(rhs))));
    }
  });

  test.each([3, 4])('half-bandwidth %i: a non-positive pivot past the first rows is reported at its row', (p) => {
    const n = 30;
    const band = new Float64Array(n * (p + 1));
    for (let i = 0; i < n; i++) { band[i * (p + 1)] = 4; if (i >= 1) band[i * (p + 1) + 1] = 1; }
    band[17 * (p + 1)] = -1;
    expect(bandedCholesky(band, n, p)).toBe(17);
  });
});
