import { smallSpdSolve } from '../../../src/engine/linalg/smallSpdSolve';
import { normalStream } from '../../helpers/random';

describe('smallSpdSolve', () => {
  test('solves M x = b for random positive definite M = A A^T + I (residual at rounding level)', () => {
    const z = normalStream(3);
    for (const m of [1, 2, 3, 5, 8]) {
      const A = Array.from({ length: m * m }, () => z());
      const M = new Float64Array(m * m);
      for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) { let v = i === j ? 1 : 0; for (let p = 0; p < m; p++) v += A[i * m + p] * A[j * m + p]; M[i * m + j] = v; }
      const b = Float64Array.from({ length: m }, () => z());
      const x = smallSpdSolve(M, b, m);
      for (let i = 0; i < m; i++) {
        let r = -b[i];
        for (let j = 0; j < m; j++) r += M[i * m + j] * x[j];
        expect(Math.abs(r)).toBeLessThan(1e-12 * (1 + Math.abs(b[i])) * m * 10);
      }
    }
  });
  test('a matrix that is not positive definite gives zeros, not NaN', () => {
    expect(Array.from(smallSpdSolve(Float64Array.of(1, 2, 2, 1), Float64Array.of(1, 1), 2))).toEqual([0, 0]);
  });
});
