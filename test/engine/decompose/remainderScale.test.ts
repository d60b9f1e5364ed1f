/**
 * remainderScale: 1.4826 times the median of sqrt(w) |y - t - s|, consistent for Gaussian noise
 * (1 / 1.4826 is the normal distribution's 75% point, 0.6745: common practice), unmoved by a few spikes.
 */
import { remainderScale } from '../../../src/engine/decompose/remainderScale';
import { normalStream } from '../../helpers/random';

describe('remainderScale', () => {
  const n = 20001;
  const z = normalStream(4242);
  const t = Float64Array.from({ length: n }, (_, i) => 100 + 0.01 * i);
  const s = Float64Array.from({ length: n }, (_, i) => 5 * Math.sin(i / 3));
  const e = Float64Array.from({ length: n }, () => z());
  test('Gaussian noise of sd 2 around trend + season: about 2 (the median of 20,001 draws is within 2% of its value)', () => {
    const y = Float64Array.from(e, (v, i) => t[i] + s[i] + 2 * v);
    const sigma = remainderScale(y, t, s, new Float64Array(n).fill(1));
    expect(Math.abs(sigma / 2 - 1)).toBeLessThan(0.02);
    // 1% of the points made huge spikes move it by little (the median moves by about 1% of a quantile step)
    const ys = Float64Array.from(y, (v, i) => (i % 100 === 0 ? v + 1e6 : v));
    expect(Math.abs(remainderScale(ys, t, s, new Float64Array(n).fill(1)) / sigma - 1)).toBeLessThan(0.03);
  });
  test('weights: noise of sd 2 / sqrt(w) gives 2 at unit weight', () => {
    const w = Float64Array.from({ length: n }, (_, i) => (i % 3 ? 4 : 1));
    const y = Float64Array.from(e, (v, i) => t[i] + s[i] + (2 * v) / Math.sqrt(w[i]));
    expect(Math.abs(remainderScale(y, t, s, w) / 2 - 1)).toBeLessThan(0.02);
    // without the weights the scale would be far off
    expect(Math.abs(remainderScale(y, t, s, new Float64Array(n).fill(1)) / 2 - 1)).toBeGreaterThan(0.2);
  });
  test('p parameters spent: the scale times sqrt(n / (n - p)); none left to estimate it: NaN', () => {
    const y = Float64Array.from(e, (v, i) => t[i] + s[i] + 2 * v);
    const one = new Float64Array(n).fill(1);
    expect(remainderScale(y, t, s, one, 1000) / remainderScale(y, t, s, one)).toBeCloseTo(Math.sqrt(n / (n - 1000)), 12);
    expect(remainderScale(y.subarray(0, 5), t, s, one, 4)).toBeNaN();
  });
});
