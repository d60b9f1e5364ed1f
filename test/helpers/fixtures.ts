/** Loads a committed reference fixture (test/reference/fixtures/NAME.json). */
import * as fs from 'fs';
import * as path from 'path';

export function loadFixture<T = any>(name: string): T {
  return JSON.parse(fs.readFileSync(path.join(__dirname, '..', 'reference', 'fixtures', `${name}.json`), 'utf8')) as T;
}

/** max_i |a_i - b_i| */
export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) throw new Error(`length ${a.length} vs ${b.length}`);
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

export function range(a: ArrayLike<number>): number {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < a.length; i++) { lo = Math.min(lo, a[i]); hi = Math.max(hi, a[i]); }
  return hi - lo;
}
