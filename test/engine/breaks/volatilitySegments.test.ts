/**
 * The volatility model's default shortest segment (3 points). Data: the business
 * helper's invented daily price changes with steady volatility (cent-rounded
 * Gaussian noise, seeds 1-60). A variance read from two points has one degree of
 * freedom and the Gaussian likelihood of two near-equal values grows without bound,
 * so with segments of 2 allowed some of these no-change series report two-point
 * segments; the default must report none, and equal an explicit 3.
 */
import { findBreaks } from '../../../src/engine/breaks/findBreaks';
import { prepareSeries } from '../../../src/engine/series';
import { BUSINESS_SCENARIOS } from '../../helpers/businessSeries';

const steady = BUSINESS_SCENARIOS.find((s) => s.name === 'daily price changes, steady volatility')!;
const series = Array.from({ length: 60 }, (_, k) => { const s = steady.make(k + 1); return prepareSeries(s.y, s.x, null, { ties: 'keep' }); });
const short = (r: ReturnType<typeof findBreaks>) => r.segments.filter((g) => g.n < 3).length;

describe('findBreaks with the volatility model', () => {
  test('allowing two-point segments finds some on steady noise (the case the default is for)', () => {
    const two = series.reduce((a, s) => a + short(findBreaks(s, { model: 'meanvar', minSegment: 2 })), 0);
    expect(two).toBeGreaterThanOrEqual(3);
  });
  test('the default reports no segment shorter than 3 points and equals shortest segment 3', () => {
    for (const s of series) {
      const d = findBreaks(s, { model: 'meanvar' });
      expect(short(d)).toBe(0);
      expect(d.breaks.map((b) => b.index)).toEqual(findBreaks(s, { model: 'meanvar', minSegment: 3 }).breaks.map((b) => b.index));
    }
  });
  test('a series shorter than the default still gets a result (one segment)', () => {
    const r = findBreaks(prepareSeries([1.25, 1.5], null, null, { ties: 'keep' }), { model: 'meanvar' });
    expect(r.segments.length).toBe(1);
  });
});
