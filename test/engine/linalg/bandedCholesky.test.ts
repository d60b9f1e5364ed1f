import { Matrix, solve } from 'ml-matrix';
import { bandedCholesky, bandedCholeskySolve } from '../../../src/engine/linalg/bandedCholesky';

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
});
