/** The selection median (copying, and in place) equals the middle of the sorted values (odd and even lengths, ties). */
import { median, medianInPlace } from '../../../src/engine/median';
import { mulberry32 } from '../../helpers/random';

test('median by selection equals the sorted middle', () => {
  const u = mulberry32(12);
  for (let rep = 0; rep < 300; rep++) {
    const n = 1 + Math.floor(u() * 60);
    const ties = u() < 0.5;
    const a = Array.from({ length: n }, () => (ties ? Math.floor(u() * 5) : u() * 100 - 50));
    const s = [...a].sort((p, q) => p - q);
    const want = n % 2 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
    expect(median(a)).toBe(want);
  }
  expect(median([])).toBeNaN();
});

test('medianInPlace equals the sorted middle on a subarray of a reused buffer, leaving the rest of the buffer alone', () => {
  const u = mulberry32(13);
  const buffer = new Float64Array(80);
  for (let rep = 0; rep < 200; rep++) {
    const n = 1 + Math.floor(u() * 60);
    const a = Array.from({ length: n }, () => (u() < 0.5 ? Math.floor(u() * 5) : u() * 100 - 50));
    buffer.fill(7);
    buffer.set(a);
    const s = [...a].sort((p, q) => p - q);
    const want = n % 2 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
    expect(medianInPlace(buffer.subarray(0, n))).toBe(want);
    for (let i = n; i < buffer.length; i++) expect(buffer[i]).toBe(7);
  }
});
