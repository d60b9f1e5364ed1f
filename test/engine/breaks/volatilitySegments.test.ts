/**
 * The volatility model's default shortest segment (5 points) and its variance floor
 * (a tenth of the noise sd read from differences). Data: the business
 * helper's invented daily price changes with steady volatility (cent-rounded
 * Gaussian noise, seeds 1-60). A variance read from two points has one degree of
 * freedom and the Gaussian likelihood of two near-equal values grows without bound,
 * so with segments of 2 allowed some of these no-change series report two-point
 * segments; the default must report none shorter than 5, and equal an explicit 5.
 */
import { findBreaks } from '../../../src/engine/breaks/findBreaks';
import { prepareSeries } from '../../../src/engine/series';
import { BUSINESS_SCENARIOS } from '../../helpers/businessSeries';
import { weeklyOrders } from '../../../src/demo/weeklyOrders';

const steady = BUSINESS_SCENARIOS.find((s) => s.name === 'daily price changes, steady volatility')!;
const series = Array.from({ length: 60 }, (_, k) => { const s = steady.make(k + 1); return prepareSeries(s.y, s.x, null, { ties: 'keep' }); });
const shorter = (r: ReturnType<typeof findBreaks>, m: number) => r.segments.filter((g) => g.n < m).length;

describe('findBreaks with the volatility model', () => {
  test('with two-point segments allowed, the variance floor still keeps them out of steady noise', () => {
    // before the floor (a tenth of the noise sd), 4 of these 60 series reported a two-point segment at shortest segment 2
    const two = series.reduce((a, s) => a + shorter(findBreaks(s, { model: 'meanvar', minSegment: 2 }), 3), 0);
    expect(two).toBe(0);
  });
  test('on the demo weekly orders (a trend with noise sd about 13), shortest segment 2 reports a three-point segment that the default does not', () => {
    const rows = weeklyOrders();
    const s = prepareSeries(rows.map((r) => r.orders), rows.map((r) => r.weekStart), null, { ties: 'keep' });
    expect(shorter(findBreaks(s, { model: 'meanvar', minSegment: 2 }), 5)).toBeGreaterThan(0);
    expect(shorter(findBreaks(s, { model: 'meanvar' }), 5)).toBe(0);
  });
  test('the default reports no segment shorter than 5 points and equals shortest segment 5', () => {
    for (const s of series) {
      const d = findBreaks(s, { model: 'meanvar' });
      expect(shorter(d, 5)).toBe(0);
      expect(d.breaks.map((b) => b.index)).toEqual(findBreaks(s, { model: 'meanvar', minSegment: 5 }).breaks.map((b) => b.index));
    }
  });
  test('a series shorter than the default still gets a result (one segment)', () => {
    const r = findBreaks(prepareSeries([1.25, 1.5], null, null, { ties: 'keep' }), { model: 'meanvar' });
    expect(r.segments.length).toBe(1);
  });
});
