/**
 * The series a periodic wavelet transform works on: the data first, a half-sample mirror
 * padding, and for 'reflect' the mirror image of the whole (the boundary rule stated in
 * waveletShrink), checked as properties on every length from 1 to 40 and 1 to 4 levels.
 */
import { extendSeries } from '../../../src/engine/smoothers/wavelet/extendSeries';

describe('extendSeries', () => {
  test('extendSeries starts with the data, pads by mirror reflection to whole blocks, and reflect is symmetric end to end', () => {
    for (let n = 1; n <= 40; n++) {
      const y = Float64Array.from({ length: n }, (_, i) => (i * 7919) % 97);
      for (let levels = 1; levels <= 4; levels++) {
        for (const boundary of ['reflect', 'periodic'] as const) {
          const e = extendSeries(y, levels, boundary);
          const M = e.length;
          expect(M % (1 << levels)).toBe(0);
          const padded = boundary === 'reflect' ? M / 2 : M;
          expect(padded).toBeGreaterThanOrEqual(n);
          expect(padded - n).toBeLessThan(boundary === 'reflect' ? 1 << (levels - 1) : 1 << levels);
          for (let i = 0; i < n; i++) expect(e[i]).toBe(y[i]);
          // the padding mirrors the end: y[n-1], y[n-2], ... (the stated rule, for paddings shorter than the data)
          for (let i = n; i < Math.min(padded, 2 * n); i++) expect(e[i]).toBe(y[2 * n - 1 - i]);
          if (boundary === 'reflect') for (let i = 0; i < M; i++) expect(e[i]).toBe(e[M - 1 - i]);
        }
      }
    }
  });

  test('extendSeries of 1, 2, 3 at one level, reflected, is 1, 2, 3, 3, 2, 1', () => {
    expect(Array.from(extendSeries(Float64Array.of(1, 2, 3), 1, 'reflect'))).toEqual([1, 2, 3, 3, 2, 1]);
  });
});
