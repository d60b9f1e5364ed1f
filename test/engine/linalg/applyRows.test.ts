import { applyRows } from '../../../src/engine/linalg/applyRows';
import { applyRowsTransposed } from '../../../src/engine/linalg/applyRowsTransposed';
import { differenceRows } from '../../../src/engine/linalg/differenceRows';
import { denseDifference } from '../smoothers/trendKkt';
import { normalStream } from '../../helpers/random';

/** Seeded uneven x (gaps 0.2 to 2). */
function unevenX(n: number, seed: number): Float64Array {
  const rn = normalStream(seed);
  const x = new Float64Array(n);
  for (let i = 1; i < n; i++) x[i] = x[i - 1] + 0.2 + Math.min(1.8, Math.abs(rn()));
  return x;
}

describe('applyRows', () => {
  test.each([1, 2, 3, 4])('applyRows of the rows of D(x, %i) is the dense divided-difference matrix times v, to rounding', (q) => {
    const n = 25;
    const x = unevenX(n, 30 + q);
    const rn = normalStream(40 + q);
    const v = Float64Array.from({ length: n }, () => rn());
    const D = denseDifference(x, q);
    const got = applyRows(differenceRows(x, q), q + 1, v, new Float64Array(n - q));
    for (let r = 0; r < n - q; r++) {
      const want = D[r].reduce((s, d, j) => s + d * v[j], 0);
      const scale = D[r].reduce((s, d, j) => s + Math.abs(d * v[j]), 0);
      expect(Math.abs(got[r] - want)).toBeLessThanOrEqual(1e-13 * scale);
    }
  });
});

describe('applyRowsTransposed', () => {
  test.each([1, 2, 3, 4])('applyRowsTransposed of the rows of D(x, %i) is the dense transpose times z, to rounding, and clears what it does not reach', (q) => {
    const n = 25;
    const x = unevenX(n, 50 + q);
    const rn = normalStream(60 + q);
    const z = Float64Array.from({ length: n - q }, () => rn());
    const D = denseDifference(x, q);
    const out = new Float64Array(n).fill(7);
    applyRowsTransposed(differenceRows(x, q), q + 1, z, n - q, out);
    for (let i = 0; i < n; i++) {
      let want = 0, scale = 0;
      for (let r = 0; r < n - q; r++) { want += D[r][i] * z[r]; scale += Math.abs(D[r][i] * z[r]); }
      expect(Math.abs(out[i] - want)).toBeLessThanOrEqual(1e-13 * scale);
    }
    // only the first m rows: with none, out is all zeros
    applyRowsTransposed(differenceRows(x, q), q + 1, z, 0, out);
    expect(Array.from(out).every((v) => v === 0)).toBe(true);
  });
});
