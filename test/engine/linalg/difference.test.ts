import { differenceOperator, differenceTranspose, firstDifferenceTranspose } from '../../../src/engine/linalg/difference';
import { differenceRows } from '../../../src/engine/linalg/differenceRows';
import { denseDifference } from '../smoothers/trendKkt';

function unevenX(n: number, seed: number): Float64Array {
  const x = new Float64Array(n);
  let s = seed, c = 3;
  for (let i = 0; i < n; i++) { s = (s * 48271) % 2147483647; c += 0.2 + (s / 2147483647) * 1.8; x[i] = c; }
  return x;
}

describe('differenceOperator', () => {
  test.each([1, 2, 3, 4])('matches the divided-difference formula on uneven x (order %i)', (q) => {
    const x = unevenX(17, 11 + q);
    const b = Float64Array.from(x, (v) => Math.sin(v) + 0.1 * v * v);
    const D = denseDifference(x, q);
    const got = differenceOperator(x, q, b);
    expect(got.length).toBe(17 - q);
    for (let r = 0; r < D.length; r++) {
      const want = D[r].reduce((s, d, j) => s + d * b[j], 0);
      expect(got[r]).toBeCloseTo(want, 10);
    }
  });

  test('is the ordinary q-th difference for unit spacing', () => {
    const x = Float64Array.from({ length: 8 }, (_, i) => i);
    const b = Float64Array.of(1, 4, 9, 16, 25, 36, 49, 64);
    expect(Array.from(differenceOperator(x, 2, b))).toEqual([2, 2, 2, 2, 2, 2]);
    expect(Array.from(differenceOperator(x, 3, b))).toEqual([0, 0, 0, 0, 0]);
  });

  test('annihilates polynomials of degree q - 1 on uneven x', () => {
    const x = unevenX(20, 5);
    const b = Float64Array.from(x, (v) => 2 - v + 0.5 * v * v - 0.01 * v * v * v);
    const d = differenceOperator(x, 4, b);
    for (const v of d) expect(Math.abs(v)).toBeLessThan(1e-9);
  });
});

describe('differenceTranspose', () => {
  test.each([1, 2, 3, 4])('is the adjoint of the operator (order %i)', (q) => {
    const x = unevenX(23, 7 * q);
    const b = Float64Array.from({ length: 23 }, (_, i) => Math.cos(3 * i));
    const u = Float64Array.from({ length: 23 - q }, (_, i) => Math.sin(i * 1.3));
    const db = differenceOperator(x, q, b);
    const dtu = differenceTranspose(x, q, u);
    let lhs = 0, rhs = 0;
    for (let r = 0; r < db.length; r++) lhs += db[r] * u[r];
    for (let i = 0; i < 23; i++) rhs += b[i] * dtu[i];
    expect(lhs).toBeCloseTo(rhs, 10);
  });
});

describe('differenceRows', () => {
  test('holds the same entries as the dense divided-difference matrix', () => {
    const x = unevenX(12, 99);
    for (const q of [1, 2, 3, 4]) {
      const rows = differenceRows(x, q);
      const D = denseDifference(x, q);
      for (let r = 0; r < D.length; r++) for (let c = 0; c <= q; c++) expect(rows[r * (q + 1) + c]).toBeCloseTo(D[r][r + c], 10);
    }
  });
});

describe('firstDifferenceTranspose', () => {
  test('firstDifferenceTranspose gives bit for bit differenceTranspose of order 1 (plain differences, whatever the spacing) on 1 to 40 rows', () => {
    for (let m = 1; m <= 40; m++) {
      const v = Float64Array.from({ length: m }, (_, i) => Math.sin(3.7 * i + 1) * (i + 0.5));
      const x = Float64Array.from({ length: m + 1 }, (_, i) => i * i + 0.3 * i);
      const d = new Float64Array(m + 1);
      firstDifferenceTranspose(v, d, m);
      expect(Array.from(d)).toEqual(Array.from(differenceTranspose(x, 1, v)));
    }
  });
});
