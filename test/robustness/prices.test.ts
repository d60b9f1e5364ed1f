/**
 * Prices near 1e9 with cents: the same series shifted by 1e9 must give the
 * same breaks, and the same smooth shifted by 1e9 (offset equivariance; the
 * cents survive in doubles, whose spacing at 1e9 is 1.2e-7).
 */
import { breaks } from '../../src/functions/breaks';
import { smooth } from '../../src/functions/smoothing';
import { clearComputeCache } from '../../src/functions/compute';
import { BASE_Y } from './catalogue';

const cents = BASE_Y.map((v, i) => v + ((i * 37) % 100) / 100);
const col = (a: number[]) => a.map((v) => [v]);

describe('prices near 1e9 with cents', () => {
  test.each(['level', 'volatility', 'distribution', 'slope'])('%s: the same break rows as the unshifted series', async (model) => {
    clearComputeCache();
    // independent noise, so the comparison has breaks to compare (see the known weakness below)
    const settings = model === 'distribution' ? undefined : 'noise=independent';
    const a = await breaks(col(cents), undefined, model, settings);
    const b = await breaks(col(cents.map((v) => v + 1e9)), undefined, model, settings);
    expect(a.length).toBeGreaterThan(1); // the step at row 21 is found
    expect(b.slice(1).map((r) => r[1])).toEqual(a.slice(1).map((r) => r[1]));
  });

  // Known weakness, kept visible: at default settings the smooth swing 3 sin(i / 3) of this series raises the
  // estimated noise correlation (the ratio of lag-2 to lag-1 difference spreads) and with it the penalty, so the
  // step of 10 at row 21 is missed. These tests fail while that is so, and will flag when it is mended.
  test.failing.each(['level', 'volatility', 'slope'])('%s at default settings finds the step at row 21 despite the swing', async (model) => {
    clearComputeCache();
    const a = await breaks(col(cents), undefined, model);
    expect(a.length).toBeGreaterThan(1);
  });

  test.each(['spline', 'trend'])('%s: the smooth shifted by 1e9', async (method) => {
    clearComputeCache();
    const a = (await smooth(col(cents), undefined, method)).map((r) => r[0] as number);
    const b = (await smooth(col(cents.map((v) => v + 1e9)), undefined, method)).map((r) => (r[0] as number) - 1e9);
    // 1e9 carries about 1.2e-7 of absolute rounding per value; allow a thousand such steps
    b.forEach((v, i) => expect(Math.abs(v - a[i])).toBeLessThan(1e-4));
  });
});
